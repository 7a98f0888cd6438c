// Accounts people look after themselves (issue 16): "forgot your password?" by e-mail, the account
// page (name, password, sessions), and the owner's changes to people (role, access, sign-in reset),
// against the real database and the local mail catcher.
// Sources: OWASP Forgot Password Cheat Sheet (same answer for known and unknown accounts, single-use
// expiring token stored hashed, sessions ended after a reset, throttling); OWASP ASVS 5.0 §6–7
// (credential recovery, session termination after a password change, list of sessions);
// "the shop always keeps an owner" is the rule.
import { and, eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { passwordResets, sessions } from "../../db/schema";
import { stableId } from "../../db/seed";
import { getUser, sessionCookie, signInWithPassword } from "../../app/lib/auth.server";
import type { Ctx } from "../../app/lib/context";
import { closeDb, db } from "../../app/lib/db.server";
import { LAST_SEEN_MINUTES, loadSession, RESET_REQUEST_LIMITS, SIGN_IN_LIMITS, signIn } from "../../app/lib/sign-in.server";
import { tokenHash } from "../../app/lib/tokens.server";
import { changePassword, endMySessions, getAccount } from "../../app/models/account.server";
import { listAudit } from "../../app/models/audit.server";
import { resetMemberSignIn, setMemberActive, setMemberRole } from "../../app/models/members.server";
import { completePasswordReset, findPasswordReset, RESET_MINUTES, requestPasswordReset } from "../../app/models/password-reset.server";
import { acceptInvitation, findInvitation, invite, listMembers } from "../../app/models/people.server";
import { action as accountAction } from "../../app/routes/account";
import { action as forgotAction } from "../../app/routes/forgot-password";
import { action as inviteAction } from "../../app/routes/invite.$token";
import { action as loginAction } from "../../app/routes/login";
import { action as resetAction, loader as resetLoader } from "../../app/routes/reset-password.$token";
import { address, cookieFrom, mailTo, newPerson, newShop, resetTokenFor, sessionVersionOf, tag } from "../support/accounts";
import { cookieFor, requestWith, routeArgs } from "../support/session";

afterAll(async () => {
  // Reset links are made and mailed after the answer: let the last ones finish before the pool closes.
  await new Promise((r) => setTimeout(r, 500));
  await closeDb();
});

const demoShop = stableId("shop:tinderbox");
const demoOwner: Ctx = { shopId: demoShop, userId: stableId("user:owner@tinderbox.example"), role: "owner" };
const PHONE_UA = "Mozilla/5.0 (Linux; Android 14; Pixel 8) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/126.0.0.0 Mobile Safari/537.36";
const link = (token: string) => `http://localhost/reset-password/${token}`;

/** What a route action answered: a thrown or returned Response (redirect), data() with a status, or plain data (200). */
async function answer(run: () => unknown) {
  const res = await Promise.resolve()
    .then(run)
    .catch((e: unknown) => e);
  if (res instanceof Response) return { status: res.status, body: null as Record<string, unknown> | null, headers: res.headers };
  if (res && typeof res === "object" && "init" in res && "data" in res) {
    const d = res as { data: Record<string, unknown>; init: { status?: number } | null };
    return { status: d.init?.status ?? 200, body: d.data, headers: null };
  }
  if (res instanceof Error) throw res;
  return { status: 200, body: res as Record<string, unknown>, headers: null };
}

const post = (path: string, fields: Record<string, string>, headers: Record<string, string> = {}) =>
  new Request(`http://localhost${path}`, { method: "POST", body: new URLSearchParams(fields), headers });

const forgot = (email: string, addr: string) =>
  answer(() => forgotAction(routeArgs(post("/forgot-password", { email }), {}, { clientAddress: addr })));

describe("forgot your password? (no enumeration)", () => {
  it("a known and an unknown e-mail get the same answer; only the known one gets a link", async () => {
    const p = await newPerson(demoShop, "technician");
    const unknown = `nobody-${tag()}@accounts.example`;
    const known = await forgot(p.email, address());
    const ghost = await forgot(unknown, address());
    expect(known.status).toBe(200);
    expect(ghost.status).toBe(known.status);
    // The same body, word for word, apart from the address the person typed.
    expect({ ...ghost.body, email: "x" }).toEqual({ ...known.body, email: "x" });
    expect(known.body).toMatchObject({ ok: true, minutes: 30 });

    const [mail] = await mailTo(demoShop, p.email);
    expect(mail?.subject).toBe("Set a new password for Cluepath");
    expect(mail?.text).toMatch(/within 30 minutes/);
    expect(mail?.text).toMatch(/\/reset-password\/[A-Za-z0-9_-]{43}/);
    // Only a hash of the token is stored: the token itself appears nowhere in the table.
    const token = await resetTokenFor(demoShop, p.email);
    const rows = await db().select().from(passwordResets).where(eq(passwordResets.userId, p.ctx.userId));
    expect(rows).toHaveLength(1);
    expect(rows[0]!.tokenHash).toBe(tokenHash(token));
    expect(JSON.stringify(rows)).not.toContain(token);
    expect((await mailTo(demoShop, unknown, 1, 300)).length).toBe(0);
  });

  it("the link works once, and not after 30 minutes", async () => {
    const p = await newPerson(demoShop, "technician");
    await requestPasswordReset(p.email, { address: address() }, link);
    const token = await resetTokenFor(demoShop, p.email);

    const now = Date.now();
    expect(RESET_MINUTES).toBe(30);
    expect(await findPasswordReset(token, new Date(now + 29 * 60_000))).toMatchObject({ email: p.email });
    expect(await findPasswordReset(token, new Date(now + 31 * 60_000))).toBeNull();

    const done = await completePasswordReset(token, "a brand new pass phrase", { address: address() });
    expect(done.role).toBe("technician");
    expect((await signIn(p.email, "a brand new pass phrase", address())).kind).toBe("ok");
    expect((await signIn(p.email, p.password, address())).kind).toBe("bad-credentials");

    // Used once: the page says so, and a second try changes nothing.
    expect(await resetLoader(routeArgs(new Request(link(token)), { token }))).toEqual({ email: null });
    await expect(completePasswordReset(token, "another new pass phrase", {})).rejects.toMatchObject({ kind: "gone", code: "link-gone" });
    expect((await signIn(p.email, "a brand new pass phrase", address())).kind).toBe("ok");

    // A fresh link that has passed its 30 minutes is refused the same way.
    await requestPasswordReset(p.email, { address: address() }, link);
    const late = await resetTokenFor(demoShop, p.email, 2);
    expect(late).not.toBe(token);
    await db()
      .update(passwordResets)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(passwordResets.tokenHash, tokenHash(late)));
    await expect(completePasswordReset(late, "yet another pass phrase", {})).rejects.toMatchObject({ kind: "gone" });
  });

  it("a newer link voids the older one", async () => {
    const p = await newPerson(demoShop, "lead");
    await requestPasswordReset(p.email, { address: address() }, link);
    const first = await resetTokenFor(demoShop, p.email, 1);
    await requestPasswordReset(p.email, { address: address() }, link);
    const second = await resetTokenFor(demoShop, p.email, 2);
    expect(await findPasswordReset(first)).toBeNull();
    expect(await findPasswordReset(second)).not.toBeNull();
  });

  it("the new password follows the sign-up rules; what was typed is not sent back", async () => {
    const p = await newPerson(demoShop, "trainer");
    await requestPasswordReset(p.email, { address: address() }, link);
    const token = await resetTokenFor(demoShop, p.email);
    // ASVS 5.0 §6.2: at least 8 characters; commonly used passwords refused.
    for (const [pw, message] of [
      ["short", /at least 8 characters/],
      ["password123", /commonly used/],
      [p.email, /e-mail address/],
    ] as const) {
      const r = await answer(() =>
        resetAction(routeArgs(post(`/reset-password/${token}`, { password: pw }), { token }, { clientAddress: address() })),
      );
      expect(r.status).toBe(400);
      expect(r.body?.errors).toMatchObject({ password: expect.stringMatching(message) });
      expect(r.body?.values).toEqual({});
    }
    expect(await findPasswordReset(token)).not.toBeNull(); // a refused password does not use the link up
  });

  it("a reset ends every other session and signs the person in with a new one", async () => {
    const p = await newPerson(demoShop, "technician");
    const a = await cookieFor(p.email);
    const b = await cookieFor(p.email);
    expect((await getUser(requestWith(a.cookie)))?.email).toBe(p.email);
    await requestPasswordReset(p.email, { address: address() }, link);
    const token = await resetTokenFor(demoShop, p.email);

    const r = await answer(() =>
      resetAction(
        routeArgs(
          post(`/reset-password/${token}`, { password: "quiet harbour lantern" }, { "user-agent": PHONE_UA }),
          { token },
          { clientAddress: "198.51.100.7" },
        ),
      ),
    );
    expect(r.status).toBe(302);
    expect(r.headers?.get("location")).toBe("/calls");
    const fresh = cookieFrom(r.headers!);
    expect(await getUser(requestWith(a.cookie))).toBeNull();
    expect(await getUser(requestWith(b.cookie))).toBeNull();
    const me = await getUser(requestWith(fresh));
    expect(me?.email).toBe(p.email);
    const [row] = await db().select().from(sessions).where(eq(sessions.id, me!.sessionId));
    expect(row).toMatchObject({ address: "198.51.100.7", userAgent: PHONE_UA });
    // Both old rows are marked ended, not only outdated.
    const ended = await db()
      .select()
      .from(sessions)
      .where(and(eq(sessions.userId, p.ctx.userId)));
    expect(
      ended
        .filter((s) => s.revokedAt !== null)
        .map((s) => s.id)
        .sort(),
    ).toEqual([a.sessionId, b.sessionId].sort());
  });

  it(`rate limits trip: ${RESET_REQUEST_LIMITS.perPair} per e-mail from one address, ${RESET_REQUEST_LIMITS.perAccount} per e-mail from other addresses, ${RESET_REQUEST_LIMITS.perAddress} per address`, async () => {
    const p = await newPerson(demoShop, "technician");
    const here = address();
    for (let i = 0; i < RESET_REQUEST_LIMITS.perPair; i++) expect((await forgot(p.email, here)).status).toBe(200);
    const limited = await forgot(p.email, here);
    expect(limited.status).toBe(429);
    expect(limited.body?.message).toMatch(/Too many requests/);
    // Mail went out for the allowed requests only.
    expect((await mailTo(demoShop, p.email, RESET_REQUEST_LIMITS.perPair)).length).toBe(RESET_REQUEST_LIMITS.perPair);
    await new Promise((r) => setTimeout(r, 300));
    expect((await mailTo(demoShop, p.email, 99, 0)).length).toBe(RESET_REQUEST_LIMITS.perPair);

    // Per account: requests spread over many addresses stop too.
    const q = await newPerson(demoShop, "technician");
    for (let i = 0; i < RESET_REQUEST_LIMITS.perAccount; i++)
      expect((await requestPasswordReset(q.email, { address: address() }, link)).kind).toBe("accepted");
    expect((await requestPasswordReset(q.email, { address: address() }, link)).kind).toBe("rate-limited");

    // Per address: one address asking for many e-mails, known or not (the limit tells nobody who has an account).
    const sprayer = address();
    for (let i = 0; i < RESET_REQUEST_LIMITS.perAddress; i++)
      expect((await requestPasswordReset(`ghost-${i}-${tag()}@accounts.example`, { address: sprayer }, link)).kind).toBe("accepted");
    expect((await requestPasswordReset(`ghost-last-${tag()}@accounts.example`, { address: sprayer }, link)).kind).toBe("rate-limited");
  });

  it("failed sign-ins do not stop someone asking for a link, and asking does not count as a failed sign-in", async () => {
    const p = await newPerson(demoShop, "technician");
    const here = address();
    for (let i = 0; i < SIGN_IN_LIMITS.perPair; i++) await signIn(p.email, `guess ${i}`, here);
    expect((await signIn(p.email, p.password, here)).kind).toBe("rate-limited");
    expect((await requestPasswordReset(p.email, { address: here }, link)).kind).toBe("accepted");

    const q = await newPerson(demoShop, "technician");
    const there = address();
    for (let i = 0; i < RESET_REQUEST_LIMITS.perPair; i++) await requestPasswordReset(q.email, { address: there }, link);
    expect((await signIn(q.email, q.password, there)).kind).toBe("ok");
  });
});

describe("the account page", () => {
  it("shows who they are and where they are signed in, with the device, address and last seen", async () => {
    const p = await newPerson(demoShop, "technician");
    const phone = await signIn(p.email, p.password, "198.51.100.20", PHONE_UA);
    const laptop = await signIn(
      p.email,
      p.password,
      "198.51.100.21",
      "Mozilla/5.0 (Windows NT 10.0; Win64; x64; rv:128.0) Gecko/20100101 Firefox/128.0",
    );
    if (phone.kind !== "ok" || laptop.kind !== "ok") throw new Error("sign-in failed");
    const a = await getAccount(p.ctx, { sessionId: phone.sessionId });
    expect(a).toMatchObject({ email: p.email, name: p.name, role: "technician", shopName: "Tinderbox Kitchen Repair" });
    expect(a.sessions.map((s) => [s.device, s.address, s.current])).toEqual([
      ["Chrome on Android phone", "198.51.100.20", true],
      ["Firefox on Windows", "198.51.100.21", false],
    ]);
    // Session ids never reach the page: each is named by a hash.
    expect(JSON.stringify(a)).not.toContain(phone.sessionId);
    expect(JSON.stringify(a)).not.toContain(laptop.sessionId);
  });

  it(`last seen is written at most every ${LAST_SEEN_MINUTES} minutes`, async () => {
    const p = await newPerson(demoShop, "technician");
    const { sessionId } = await cookieFor(p.email);
    const seen = async () => (await db().select({ at: sessions.lastSeenAt }).from(sessions).where(eq(sessions.id, sessionId)))[0]!.at!;
    const opened = await seen();
    await loadSession(sessionId, new Date(opened.getTime() + (LAST_SEEN_MINUTES - 1) * 60_000));
    expect(await seen()).toEqual(opened);
    const later = new Date(opened.getTime() + (LAST_SEEN_MINUTES + 1) * 60_000);
    await loadSession(sessionId, later);
    expect(await seen()).toEqual(later);
  });

  it("sign out of one session, then everywhere else; each ends at once and goes to the audit trail", async () => {
    const p = await newPerson(demoShop, "lead");
    const here = await cookieFor(p.email);
    const [x, y, z] = [await cookieFor(p.email), await cookieFor(p.email), await cookieFor(p.email)];
    const list = (await getAccount(p.ctx, here)).sessions;
    expect(list).toHaveLength(4);
    const ref = list.find((s) => !s.current)!.ref;

    const one = await answer(() =>
      accountAction(
        routeArgs(
          requestWith(here.cookie, "/account", { method: "POST", body: new URLSearchParams({ intent: "end", ref }) }),
          {},
          { clientAddress: address() },
        ),
      ),
    );
    expect(one.body).toMatchObject({ ok: true });
    const stillIn = await Promise.all([x, y, z].map(async (c) => (await getUser(requestWith(c.cookie))) !== null));
    expect(stillIn.filter(Boolean)).toHaveLength(2);
    // The same session again: already ended.
    await expect(endMySessions(p.ctx, { ...here, address: address() }, { ref })).rejects.toMatchObject({ kind: "gone" });

    const rest = await endMySessions(p.ctx, { ...here, address: address() }, { allButThis: true });
    expect(rest).toEqual({ ended: 2, endedThisOne: false });
    for (const c of [x, y, z]) expect(await getUser(requestWith(c.cookie))).toBeNull();
    expect((await getUser(requestWith(here.cookie)))?.email).toBe(p.email);
    expect((await getAccount(p.ctx, here)).sessions).toHaveLength(1);

    // Signing out of this one signs out here: redirect to sign-in with the cookie cleared.
    const self = (await getAccount(p.ctx, here)).sessions[0]!.ref;
    const out = await answer(() =>
      accountAction(
        routeArgs(
          requestWith(here.cookie, "/account", { method: "POST", body: new URLSearchParams({ intent: "end", ref: self }) }),
          {},
          { clientAddress: address() },
        ),
      ),
    );
    expect(out.status).toBe(302);
    expect(out.headers?.get("location")).toBe("/login?signedOut=1");
    expect(await getUser(requestWith(here.cookie))).toBeNull();

    const trail = (await listAudit(demoOwner, { action: "sessions.ended", actorId: p.ctx.userId })).entries;
    expect(trail.map((e) => e.details)).toEqual([
      { ended: 1, everywhereElse: false },
      { ended: 2, everywhereElse: true },
      { ended: 1, everywhereElse: false },
    ]);
  });

  it("changing the password needs the current one, follows the sign-up rules, and ends every other session", async () => {
    const p = await newPerson(demoShop, "trainer");
    const here = await cookieFor(p.email);
    const other = await cookieFor(p.email);
    const caller = { sessionId: here.sessionId, address: address() };
    await expect(
      changePassword(p.ctx, caller, { currentPassword: "not it at all", newPassword: "river stone kettle" }),
    ).rejects.toMatchObject({
      fields: { currentPassword: "That is not your current password." },
    });
    await expect(changePassword(p.ctx, caller, { currentPassword: p.password, newPassword: "1234567" })).rejects.toMatchObject({
      fields: { newPassword: expect.stringMatching(/at least 8/) },
    });
    await expect(changePassword(p.ctx, caller, { currentPassword: p.password, newPassword: p.password })).rejects.toMatchObject({
      fields: { newPassword: expect.stringMatching(/different/) },
    });
    const before = await sessionVersionOf(p.ctx.userId);

    expect(await changePassword(p.ctx, caller, { currentPassword: p.password, newPassword: "river stone kettle" })).toEqual({
      otherSessionsEnded: 1,
    });
    expect(await sessionVersionOf(p.ctx.userId)).toBe(before + 1);
    expect((await getUser(requestWith(here.cookie)))?.email).toBe(p.email);
    expect(await getUser(requestWith(other.cookie))).toBeNull();
    expect((await signIn(p.email, "river stone kettle", address())).kind).toBe("ok");
    expect((await signIn(p.email, p.password, address())).kind).toBe("bad-credentials");
    const [entry] = (await listAudit(demoOwner, { action: "password.changed", actorId: p.ctx.userId })).entries;
    expect(entry).toMatchObject({ subjectId: p.ctx.userId, details: { otherSessionsEnded: 1 } });
  });

  it(`wrong current passwords count against the sign-in limit (${SIGN_IN_LIMITS.perPair} from one address)`, async () => {
    const p = await newPerson(demoShop, "technician");
    const here = await cookieFor(p.email);
    const caller = { sessionId: here.sessionId, address: address() };
    for (let i = 0; i < SIGN_IN_LIMITS.perPair; i++)
      await changePassword(p.ctx, caller, { currentPassword: `guess ${i}`, newPassword: "river stone kettle" }).catch(() => {});
    await expect(changePassword(p.ctx, caller, { currentPassword: p.password, newPassword: "river stone kettle" })).rejects.toMatchObject({
      fields: { currentPassword: expect.stringMatching(/Too many/) },
    });
  });
});

describe("an owner and the shop's people", () => {
  it("turning someone's access off signs them out at once and stops sign-in; their work stays; back on lets them in", async () => {
    const p = await newPerson(demoShop, "technician");
    const c = await cookieFor(p.email);
    expect(await getUser(requestWith(c.cookie))).not.toBeNull();

    expect(await setMemberActive(demoOwner, p.ctx.userId, false, "198.51.100.1")).toEqual({
      changed: true,
      sessionsEnded: 1,
      name: p.name,
    });
    expect(await getUser(requestWith(c.cookie))).toBeNull();
    expect((await signIn(p.email, p.password, address())).kind).toBe("access-off");
    const viaForm = await answer(() =>
      loginAction(routeArgs(post("/login", { email: p.email, password: p.password }), {}, { clientAddress: address() })),
    );
    expect(viaForm.status).toBe(403);
    expect(viaForm.body?.formError).toMatch(/turned off your access/);
    // A wrong password still reads as a wrong password: nothing is told to someone without it.
    expect((await signIn(p.email, "wrong password here", address())).kind).toBe("bad-credentials");
    // Nobody can get back in through a reset link either.
    await requestPasswordReset(p.email, { address: address() }, link);
    expect((await mailTo(demoShop, p.email, 1, 500)).length).toBe(0);
    expect((await listMembers(demoOwner)).find((m) => m.userId === p.ctx.userId)?.deactivatedAt).toBeInstanceOf(Date);

    expect(await setMemberActive(demoOwner, p.ctx.userId, true)).toEqual({ changed: true, sessionsEnded: 0, name: p.name });
    expect(await getUser(requestWith(c.cookie))).toBeNull(); // the old session stays ended
    expect((await signIn(p.email, p.password, address())).kind).toBe("ok");

    const [off] = (await listAudit(demoOwner, { action: "member.deactivated" })).entries;
    expect(off).toMatchObject({
      actorId: demoOwner.userId,
      subjectId: p.ctx.userId,
      address: "198.51.100.1",
      details: { sessionsEnded: 1 },
    });
    const [on] = (await listAudit(demoOwner, { action: "member.reactivated" })).entries;
    expect(on).toMatchObject({ subjectId: p.ctx.userId });
  });

  it("the last owner can be neither demoted nor turned off; with two owners, one can step down", async () => {
    const { shopId, owner } = await newShop();
    const tech = await newPerson(shopId, "technician");
    await expect(setMemberRole(owner.ctx, owner.ctx.userId, "lead")).rejects.toMatchObject({
      kind: "conflict",
      code: "last-owner",
      message: expect.stringMatching(/only owner/),
    });
    await expect(setMemberActive(owner.ctx, owner.ctx.userId, false)).rejects.toMatchObject({ kind: "conflict" });

    expect(await setMemberRole(owner.ctx, tech.ctx.userId, "owner")).toMatchObject({ changed: true });
    const second: Ctx = { ...tech.ctx, role: "owner" };
    // The second owner may turn the first one off, which leaves them the last: they cannot step down.
    await setMemberActive(second, owner.ctx.userId, false);
    await expect(setMemberRole(second, second.userId, "technician")).rejects.toMatchObject({ code: "last-owner" });
    await setMemberActive(second, owner.ctx.userId, true);
    expect(await setMemberRole(second, second.userId, "lead")).toMatchObject({ changed: true });
    await expect(setMemberRole(owner.ctx, owner.ctx.userId, "lead")).rejects.toMatchObject({ code: "last-owner" });

    const [changed] = (await listAudit(owner.ctx, { action: "member.role-changed" })).entries;
    expect(changed).toMatchObject({ actorId: second.userId, subjectId: second.userId, details: { from: "owner", to: "lead" } });
  });

  it("two owners demoting each other at the same moment: one wins, the shop keeps an owner", async () => {
    const { shopId, owner: a } = await newShop();
    const b = await newPerson(shopId, "owner");
    const results = await Promise.allSettled([setMemberRole(a.ctx, b.ctx.userId, "lead"), setMemberRole(b.ctx, a.ctx.userId, "lead")]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    expect(results.find((r) => r.status === "rejected")).toMatchObject({ reason: { code: "last-owner" } });
    const owners = (await listMembers(a.ctx)).filter((m) => m.role === "owner");
    expect(owners).toHaveLength(1);
  });

  it("another shop's person is not found; nobody turns off their own access", async () => {
    const { owner } = await newShop();
    const p = await newPerson(demoShop, "technician");
    await expect(setMemberActive(owner.ctx, p.ctx.userId, false)).rejects.toMatchObject({ kind: "not-found" });
    await expect(setMemberRole(owner.ctx, p.ctx.userId, "lead")).rejects.toMatchObject({ kind: "not-found" });
    await expect(resetMemberSignIn(owner.ctx, p.ctx.userId, link)).rejects.toMatchObject({ kind: "not-found" });
    await expect(setMemberActive(demoOwner, demoOwner.userId, false)).rejects.toMatchObject({ kind: "conflict", code: "self" });
  });

  it("resetting someone's sign-in ends their sessions and e-mails them a link the owner never sees", async () => {
    const p = await newPerson(demoShop, "technician");
    const c = await cookieFor(p.email);
    const r = await resetMemberSignIn(demoOwner, p.ctx.userId, link, "198.51.100.2");
    expect(r).toEqual({ name: p.name, email: p.email, mailed: true, sessionsEnded: 1 });
    expect(await getUser(requestWith(c.cookie))).toBeNull();
    const [mail] = await mailTo(demoShop, p.email);
    expect(mail?.text).toMatch(/has sent you a link to set a new password/);
    const token = await resetTokenFor(demoShop, p.email);
    expect(JSON.stringify(r)).not.toContain(token);
    expect((await completePasswordReset(token, "meadow copper lantern", {})).role).toBe("technician");

    const trail = (await listAudit(demoOwner, { actorId: demoOwner.userId })).entries;
    expect(trail.find((e) => e.action === "password.reset-requested" && e.subjectId === p.ctx.userId)).toMatchObject({
      details: { by: "owner" },
      address: "198.51.100.2",
    });
    expect(trail.find((e) => e.action === "sessions.ended" && e.subjectId === p.ctx.userId)).toMatchObject({ details: { ended: 1 } });
    const [done] = (await listAudit(demoOwner, { action: "password.reset", actorId: p.ctx.userId })).entries;
    expect(done).toMatchObject({ details: { linkSentByOwner: true, sessionsEnded: 0 } });

    await setMemberActive(demoOwner, p.ctx.userId, false);
    await expect(resetMemberSignIn(demoOwner, p.ctx.userId, link)).rejects.toMatchObject({ code: "inactive" });
  });

  it("a self-service request and its use are in the audit trail, with no actor for the request", async () => {
    const p = await newPerson(demoShop, "lead");
    await requestPasswordReset(p.email, { address: "198.51.100.3" }, link);
    const token = await resetTokenFor(demoShop, p.email);
    await completePasswordReset(token, "orchard wire bell", { address: "198.51.100.4" });
    const trail = (await listAudit(demoOwner, {})).entries;
    expect(trail.find((e) => e.action === "password.reset-requested" && e.subjectId === p.ctx.userId)).toMatchObject({
      actorId: null,
      actorEmail: p.email,
      address: "198.51.100.3",
      details: { by: "self" },
    });
    expect(trail.find((e) => e.action === "password.reset" && e.subjectId === p.ctx.userId)).toMatchObject({
      actorId: p.ctx.userId,
      address: "198.51.100.4",
    });
  });
});

describe("invitations sign the new member in (issue 17, item 18)", () => {
  it("accepting signs them in to the shop and lands on their home; a used link leads to sign-in", async () => {
    const email = `joiner-${tag()}@accounts.example`;
    const { token } = await invite(demoOwner, email, "lead");
    const r = await answer(() =>
      inviteAction(
        routeArgs(
          post(
            `/invite/${token}`,
            { username: email, name: "Joiner Person", password: "seven bright lanterns" },
            { "user-agent": PHONE_UA },
          ),
          { token },
          { clientAddress: address() },
        ),
      ),
    );
    expect(r.status).toBe(302);
    expect(r.headers?.get("location")).toBe("/authoring");
    const me = await getUser(requestWith(cookieFrom(r.headers!)));
    expect(me).toMatchObject({ email, role: "lead", shopId: demoShop });
    expect(await findInvitation(token)).toBeNull();
  });

  it("an empty form gets an error for each field at once, and the password is not sent back", async () => {
    const { token } = await invite(demoOwner, `empty-${tag()}@accounts.example`, "technician");
    const r = await answer(() =>
      inviteAction(routeArgs(post(`/invite/${token}`, { name: "", password: "" }), { token }, { clientAddress: address() })),
    );
    expect(r.status).toBe(400);
    expect(Object.keys(r.body?.errors as object).sort()).toEqual(["name", "password"]);
    const typed = await answer(() =>
      inviteAction(routeArgs(post(`/invite/${token}`, { name: "A", password: "abc" }), { token }, { clientAddress: address() })),
    );
    expect(typed.body?.values).toEqual({ name: "A" });
  });

  it("an invitation never demotes the shop's last owner", async () => {
    const { shopId, owner } = await newShop();
    const { token } = await invite(owner.ctx, owner.email, "technician");
    await expect(acceptInvitation(token, { password: owner.password })).rejects.toMatchObject({ code: "last-owner" });
    expect((await listMembers(owner.ctx)).find((m) => m.userId === owner.ctx.userId)?.role).toBe("owner");
    expect(shopId).toBe(owner.ctx.shopId);
  });

  it("a deactivated member re-invited by the owner is back on", async () => {
    const p = await newPerson(demoShop, "technician");
    await setMemberActive(demoOwner, p.ctx.userId, false);
    const { token } = await invite(demoOwner, p.email, "lead");
    const joined = await acceptInvitation(token, { password: p.password });
    expect(joined.role).toBe("lead");
    expect((await signIn(p.email, p.password, address())).kind).toBe("ok");
  });
});

describe("the session cookie made without the password form", () => {
  it("is the same Auth.js cookie the sign-in form sets (HttpOnly, SameSite=Lax, 12 hours)", async () => {
    const p = await newPerson(demoShop, "technician");
    const viaForm = await signInWithPassword(new Request("http://localhost/login", { method: "POST" }), address(), p.email, p.password);
    if (!viaForm.ok) throw new Error("sign-in failed");
    const { sessionId } = await cookieFor(p.email);
    const made = (await sessionCookie(sessionId, p.ctx.userId)).getSetCookie()[0]!;
    expect(made).toMatch(/^authjs\.session-token=[^;]+; Path=\/; HttpOnly; SameSite=Lax; Max-Age=43200$/);
    const formCookie = viaForm.headers.getSetCookie().find((c) => c.startsWith("authjs.session-token="))!;
    for (const attr of ["Path=/", "HttpOnly", "SameSite=Lax"]) expect(formCookie).toContain(attr);
    expect((await getUser(requestWith(made.split(";")[0]!)))?.sessionId).toBe(sessionId);
  });
});
