// Sign-out on a shared phone: what was kept here for the user is deleted with the session. If some
// of it never reached the server, the technician is told how much and asked first.
import type { FormEvent } from "react";
import { forgetPhoneUser, phoneUser } from "./who";

/** The sign-out form's submit handler: forget the phone's user, then sign out. */
export function signOutOfPhone(event: FormEvent<HTMLFormElement>): void {
  const user = phoneUser();
  if (!user) return; // nothing kept here: the form goes as it is
  event.preventDefault();
  const form = event.currentTarget;
  void (async () => {
    const { openPhoneDb } = await import("./db");
    const { describeItems } = await import("./fold");
    let unsent = "";
    try {
      const db = await openPhoneDb(user.id);
      const items = await db.getAll("outbox");
      db.close();
      if (items.length) unsent = describeItems(items);
    } catch {
      /* nothing readable: nothing to lose */
    }
    if (
      unsent &&
      !window.confirm(
        `${unsent} on this phone never reached the server. Signing out deletes them. Sign out anyway? (Cancel, find signal, and they will be sent.)`,
      )
    )
      return;
    await forgetPhoneUser(user.id);
    form.submit();
  })();
}
