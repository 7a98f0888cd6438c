// React's view of the phone's storage for the signed-in user (useSyncExternalStore): the server
// render and the first client render see nothing stored, so hydration matches.
import { useMemo, useSyncExternalStore } from "react";
import { phoneFor, type Phone, type PhoneSnapshot } from "./phone";

const EMPTY: PhoneSnapshot = {
  ready: false,
  items: [],
  runs: {},
  calls: [],
  kit: null,
  online: true,
  sending: false,
  needsSignIn: false,
  serverAway: false,
  storageError: null,
};
const nothing = () => () => {};
const empty = () => EMPTY;

export function usePhone(userId: string | null): { phone: Phone | null; snap: PhoneSnapshot } {
  const phone = useMemo(() => (userId && typeof window !== "undefined" ? phoneFor(userId) : null), [userId]);
  const snap = useSyncExternalStore(phone?.subscribe ?? nothing, phone?.getSnapshot ?? empty, empty);
  return { phone, snap };
}

function onOffline(fn: () => void) {
  window.addEventListener("online", fn);
  window.addEventListener("offline", fn);
  return () => {
    window.removeEventListener("online", fn);
    window.removeEventListener("offline", fn);
  };
}

/** The browser's own word on the network (true on the server and until hydrated). */
export function useBrowserOnline(): boolean {
  return useSyncExternalStore(
    onOffline,
    () => navigator.onLine,
    () => true,
  );
}
