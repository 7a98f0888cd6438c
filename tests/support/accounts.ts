// Test helpers for accounts: fresh people (so no demo password changes), a shop of their own when a
// test needs to play with its owners, and the reset links the local mail catcher received.
import { eq } from "drizzle-orm";
import { memberships, shops, users } from "../../db/schema";
import { sessionCookieName } from "../../app/lib/auth.server";
import type { Ctx } from "../../app/lib/context";
import { db } from "../../app/lib/db.server";
import { capturedMail, type CapturedMail } from "../../app/lib/mail.server";
import { hashPassword } from "../../app/lib/password.server";
import type { Role } from "../../app/lib/roles";

export const tag = () => crypto.randomUUID().slice(0, 8);

/** A fresh address label per call (documentation range, only a key for the rate limits). */
export const address = () => `198.51.100.${tag()}`;

export type Person = { ctx: Ctx; email: string; password: string; name: string };

/** A new person with a password, as a member of the shop with the role. */
export async function newPerson(shopId: string, role: Role, password = `fresh pass phrase ${tag()}`): Promise<Person> {
  const userId = crypto.randomUUID();
  const email = `p-${tag()}@accounts.example`;
  const name = `Person ${tag()}`;
  await db()
    .insert(users)
    .values({ id: userId, email, name, passwordHash: await hashPassword(password) });
  await db().insert(memberships).values({ shopId, userId, role });
  return { ctx: { shopId, userId, role }, email, password, name };
}

/** A shop of its own with one owner, for tests that change who owns it. */
export async function newShop(): Promise<{ shopId: string; owner: Person }> {
  const shopId = crypto.randomUUID();
  await db()
    .insert(shops)
    .values({ id: shopId, name: `Test shop ${tag()}`, town: "Ostley Ford", settings: { timeZone: "UTC" } });
  return { shopId, owner: await newPerson(shopId, "owner") };
}

export async function sessionVersionOf(userId: string): Promise<number> {
  const [u] = await db().select({ v: users.sessionVersion }).from(users).where(eq(users.id, userId));
  return u!.v;
}

/** The mail to `to` the catcher received, newest first; waits up to `ms` until `count` are there. */
export async function mailTo(shopId: string, to: string, count = 1, ms = 8000): Promise<CapturedMail[]> {
  const until = Date.now() + ms;
  for (;;) {
    const got = (await capturedMail(shopId)).filter((m) => m.to.includes(to));
    if (got.length >= count || Date.now() > until) return got;
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** The token of the newest reset link mailed to `to`. */
export async function resetTokenFor(shopId: string, to: string, count = 1): Promise<string> {
  const [mail] = await mailTo(shopId, to, count);
  const match = mail?.text.match(/\/reset-password\/([A-Za-z0-9_-]+)/);
  if (!match) throw new Error(`no reset link mailed to ${to}`);
  return match[1]!;
}

/** The session cookie a Set-Cookie header bag carries, as a browser would send it back. */
export function cookieFrom(headers: Headers): string {
  const c = headers.getSetCookie().find((h) => h.startsWith(`${sessionCookieName()}=`));
  if (!c) throw new Error("no session cookie set");
  return c.split(";")[0]!;
}
