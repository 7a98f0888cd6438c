import { afterAll, describe, expect, it } from "vitest";
import { stableId } from "../../db/seed";
import { closeDb } from "../../app/lib/db.server";
import type { Ctx } from "../../app/lib/context";
import { capturedMail } from "../../app/lib/mail.server";
import {
  acceptInvitation,
  findInvitation,
  invite,
  listMembers,
  listOpenInvitations,
  revokeInvitation,
  sendInvitationMail,
} from "../../app/models/people.server";
import { loadSession, signIn } from "../../app/lib/sign-in.server";

afterAll(() => closeDb());

const owner: Ctx = { shopId: stableId("shop:tinderbox"), userId: stableId("user:owner@tinderbox.example"), role: "owner" };
const otherOwner: Ctx = { shopId: stableId("shop:pellham"), userId: stableId("user:owner@pellham.example"), role: "owner" };

describe("invitations", () => {
  it("an owner invites by e-mail; the link's token opens it; accepting makes a member who can sign in", async () => {
    const email = `new-${crypto.randomUUID().slice(0, 8)}@tinderbox.example`;
    const { token } = await invite(owner, email, "technician");
    const found = await findInvitation(token);
    expect(found).toMatchObject({ email, role: "technician", hasAccount: false });
    expect((await listOpenInvitations(owner)).some((i) => i.email === email)).toBe(true);
    expect((await listOpenInvitations(otherOwner)).some((i) => i.email === email)).toBe(false);

    // Accepting signs the new member in: a session of the shop, in their role.
    const joined = await acceptInvitation(token, { name: "New Person", password: "three short words" });
    expect(joined).toMatchObject({ shopName: "Tinderbox Kitchen Repair", role: "technician" });
    expect(await loadSession(joined.sessionId)).toMatchObject({ email, role: "technician", shopId: owner.shopId });
    expect((await listMembers(owner)).find((m) => m.email === email)?.role).toBe("technician");
    expect(await findInvitation(token)).toBeNull(); // used once only
    expect((await signIn(email, "three short words", "test-invite")).kind).toBe("ok");
  });

  it("the invitation is e-mailed through SMTP (the local catcher receives it, scoped to the shop)", async () => {
    const email = `mail-${crypto.randomUUID().slice(0, 8)}@tinderbox.example`;
    const { token } = await invite(owner, email, "trainer");
    const link = `http://localhost/invite/${token}`;
    expect(await sendInvitationMail(owner, email, "trainer", link)).toBe(true);
    const got = (await capturedMail(owner.shopId)).find((m) => m.to.includes(email));
    expect(got?.subject).toBe("Join Tinderbox Kitchen Repair on Cluepath");
    expect(got?.text).toContain(link);
    expect(got?.text).toContain("as Trainer");
    expect((await capturedMail(otherOwner.shopId)).some((m) => m.to.includes(email))).toBe(false);
  });

  it("a withdrawn invitation cannot be used, and another shop cannot withdraw it", async () => {
    const { id, token } = await invite(owner, `w-${crypto.randomUUID().slice(0, 8)}@tinderbox.example`, "lead");
    await expect(revokeInvitation(otherOwner, id)).rejects.toMatchObject({ kind: "not-found" });
    expect(await findInvitation(token)).not.toBeNull();
    await revokeInvitation(owner, id);
    expect(await findInvitation(token)).toBeNull();
  });

  it("someone with an account confirms with their own password", async () => {
    const { token } = await invite(otherOwner, "tech@tinderbox.example", "technician");
    await expect(acceptInvitation(token, { password: "wrong password here" })).rejects.toMatchObject({
      kind: "invalid",
      fields: { password: "That password doesn't match your existing account." },
    });
    expect(await findInvitation(token)).not.toBeNull();
  });
});
