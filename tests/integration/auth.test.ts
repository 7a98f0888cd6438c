import { eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { users } from "../../db/schema";
import { DEMO_PASSWORD } from "../../db/demo";
import { getUser, signInWithPassword, signOut } from "../../app/lib/auth.server";
import { closeDb, db } from "../../app/lib/db.server";
import { hashPassword } from "../../app/lib/password.server";
import { SIGN_IN_LIMITS, signIn } from "../../app/lib/sign-in.server";
import { action as loginAction } from "../../app/routes/login";
import { routeArgs } from "../support/session";

afterAll(() => closeDb());

const TECH = "tech@tinderbox.example";
let n = 0;
/** A fresh address per test (documentation range, used only as a label for the rate limit). */
const address = () => `203.0.113.${(process.pid % 200) + n++}-${crypto.randomUUID().slice(0, 6)}`;

function loginRequest(email: string, password: string) {
  return new Request("http://localhost/login", { method: "POST", body: new URLSearchParams({ email, password }) });
}

async function postLogin(email: string, password: string, addr: string) {
  const res = await Promise.resolve(loginAction(routeArgs(loginRequest(email, password), {}, { clientAddress: addr }))).catch(
    (e: unknown) => e,
  );
  // data() results carry { data, init }; a redirect is a thrown Response.
  if (res instanceof Response) return { status: res.status, body: null, headers: res.headers };
  const d = res as { data: { formError?: string }; init: { status: number } };
  return { status: d.init.status, body: d.data, headers: null };
}

/** The parameters written into a PHC-format argon2 hash string. */
function argonParams(hash: string) {
  const [, type, , params] = hash.split("$");
  const kv = Object.fromEntries(params!.split(",").map((p) => p.split("=") as [string, string]));
  return { type, m: Number(kv.m), t: Number(kv.t), p: Number(kv.p) };
}

describe("password hashing (OWASP Password Storage Cheat Sheet: argon2id, m ≥ 19 MiB, t ≥ 2, p = 1)", () => {
  it("new hashes are argon2id with m=19456 KiB, t=2, p=1", async () => {
    const h = await hashPassword("a long test pass phrase");
    expect(argonParams(h)).toEqual({ type: "argon2id", m: 19456, t: 2, p: 1 });
  });
  it("the seeded demo users are stored that way too, never in clear", async () => {
    const [u] = await db().select().from(users).where(eq(users.email, TECH));
    expect(argonParams(u!.passwordHash)).toEqual({ type: "argon2id", m: 19456, t: 2, p: 1 });
    expect(u!.passwordHash).not.toContain(DEMO_PASSWORD);
  });
});

describe("sign-in answers", () => {
  it("a wrong password and an unknown e-mail get the same status and the same message", async () => {
    const wrong = await postLogin(TECH, "not the password at all", address());
    const unknown = await postLogin("nobody-here@tinderbox.example", "not the password at all", address());
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(wrong.status);
    expect(unknown.body?.formError).toBe(wrong.body?.formError);
    expect(unknown.body).toMatchObject({ fieldErrors: {} });
    expect(wrong.body).toMatchObject({ fieldErrors: {} });
    expect(wrong.body?.formError).toMatch(/don't match an account/);
  });

  it("the right password signs in through Auth.js and sets the session cookie", async () => {
    const ok = await postLogin(TECH, DEMO_PASSWORD, address());
    expect(ok.status).toBe(302);
    expect(ok.headers!.get("location")).toBe("/calls");
    expect(
      ok.headers!.getSetCookie().some((c) => c.startsWith("authjs.session-token=") && /HttpOnly/i.test(c) && /SameSite=Lax/i.test(c)),
    ).toBe(true);
  });

  it("every sign-in opens a new session (a fresh session id, never a reused one)", async () => {
    const addr = address();
    const a = await signIn(TECH, DEMO_PASSWORD, addr);
    const b = await signIn(TECH, DEMO_PASSWORD, addr);
    expect(a.kind).toBe("ok");
    expect(b.kind).toBe("ok");
    if (a.kind === "ok" && b.kind === "ok") expect(a.sessionId).not.toBe(b.sessionId);
  });
});

describe("rate limit (ASVS 5.0: throttle, do not lock the account out)", () => {
  it(`trips after ${SIGN_IN_LIMITS.perPair} failures from one address for one account — even the right password is then refused there`, async () => {
    const addr = address();
    for (let i = 0; i < SIGN_IN_LIMITS.perPair; i++) expect((await signIn(TECH, `guess ${i}`, addr)).kind).toBe("bad-credentials");
    expect((await signIn(TECH, DEMO_PASSWORD, addr)).kind).toBe("rate-limited");
    const viaForm = await postLogin(TECH, DEMO_PASSWORD, addr);
    expect(viaForm.status).toBe(429);
    expect(viaForm.body?.formError).toMatch(/Too many sign-in attempts/);
  });

  it("unknown e-mails are throttled the same way, so the limit reveals nothing about who has an account", async () => {
    const addr = address();
    for (let i = 0; i < SIGN_IN_LIMITS.perPair; i++) await signIn("ghost@tinderbox.example", `guess ${i}`, addr);
    expect((await signIn("ghost@tinderbox.example", "anything", addr)).kind).toBe("rate-limited");
  });

  it("the real user still gets in from another address while one address is blocked", async () => {
    const attacker = address();
    for (let i = 0; i < SIGN_IN_LIMITS.perPair; i++) await signIn(TECH, `guess ${i}`, attacker);
    expect((await signIn(TECH, DEMO_PASSWORD, attacker)).kind).toBe("rate-limited");
    expect((await signIn(TECH, DEMO_PASSWORD, address())).kind).toBe("ok");
  });

  it("a spread-out attack on one account blocks new addresses but not an address that signed in before", async () => {
    const email = "lead@tinderbox.example";
    const usual = address();
    expect((await signIn(email, DEMO_PASSWORD, usual)).kind).toBe("ok");
    for (let i = 0; i < SIGN_IN_LIMITS.perAccount; i++) await signIn(email, "wrong guess", address());
    expect((await signIn(email, DEMO_PASSWORD, address())).kind).toBe("rate-limited");
    expect((await signIn(email, DEMO_PASSWORD, usual)).kind).toBe("ok");
  });
});

describe("sign-out", () => {
  it("ends the session for real: the old cookie stops working afterwards", async () => {
    const result = await signInWithPassword(new Request("http://localhost/login", { method: "POST" }), address(), TECH, DEMO_PASSWORD);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const cookie = result.headers
      .getSetCookie()
      .map((c) => c.split(";")[0])
      .find((c) => c!.startsWith("authjs.session-token="))!;
    const req = () => new Request("http://localhost/calls", { headers: { cookie } });
    expect((await getUser(req()))?.email).toBe(TECH);
    const cleared = await signOut(req());
    expect(cleared.getSetCookie()[0]).toMatch(/Max-Age=0/);
    // Someone who copied the cookie before sign-out gets nothing with it.
    expect(await getUser(req())).toBeNull();
  });

  it("a cookie signed with another secret is not accepted", async () => {
    expect(
      await getUser(new Request("http://localhost/", { headers: { cookie: "authjs.session-token=eyJhbGciOiJkaXIi.forged" } })),
    ).toBeNull();
  });
});
