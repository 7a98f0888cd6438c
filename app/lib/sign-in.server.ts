// Sign-in: password check, the rate limit, and the session rows the cookie points at.
import { and, count, desc, eq, gt, isNull, max, ne, sql } from "drizzle-orm";
import { memberships, sessions, shops, signInAttempts, users } from "../../db/schema";
import { db, prepared } from "./db.server";
import { burnVerify, verifyPassword } from "./password.server";
import type { Role } from "./roles";

export const SESSION_HOURS = 12;

/**
 * Rate limit, without locking the real user out (ASVS 5.0 §6.3 asks for throttling, not lockout):
 * - one address guessing one account: 5 failures in 15 minutes;
 * - one address spraying many accounts: 30 failures in 15 minutes;
 * - one account attacked from many addresses: 20 failures in 15 minutes from addresses that have
 *   never signed in to it — an address that has signed in to the account before is not held back by
 *   this one, so the owner of the account can still get in from their usual device.
 * Windows slide: nobody stays blocked once the failures age out.
 */
export const SIGN_IN_LIMITS = { windowMinutes: 15, perPair: 5, perAddress: 30, perAccount: 20, knownAddressDays: 90 };

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

async function failuresSince(where: ReturnType<typeof and>, since: Date): Promise<number> {
  const [row] = await db()
    .select({ n: count() })
    .from(signInAttempts)
    .where(and(where, eq(signInAttempts.succeeded, false), gt(signInAttempts.at, since)));
  return row?.n ?? 0;
}

export async function signInAllowed(emailRaw: string, address: string, now = new Date()): Promise<boolean> {
  const email = normaliseEmail(emailRaw);
  const windowStart = new Date(now.getTime() - SIGN_IN_LIMITS.windowMinutes * 60_000);
  const [lastPairSuccess] = await db()
    .select({ at: max(signInAttempts.at) })
    .from(signInAttempts)
    .where(and(eq(signInAttempts.email, email), eq(signInAttempts.address, address), eq(signInAttempts.succeeded, true)));
  const pairSince = lastPairSuccess?.at && lastPairSuccess.at > windowStart ? lastPairSuccess.at : windowStart;
  if ((await failuresSince(and(eq(signInAttempts.email, email), eq(signInAttempts.address, address)), pairSince)) >= SIGN_IN_LIMITS.perPair)
    return false;
  if ((await failuresSince(and(eq(signInAttempts.address, address)), windowStart)) >= SIGN_IN_LIMITS.perAddress) return false;
  const knownSince = new Date(now.getTime() - SIGN_IN_LIMITS.knownAddressDays * 86_400_000);
  const known = lastPairSuccess?.at !== null && lastPairSuccess?.at !== undefined && lastPairSuccess.at > knownSince;
  if (!known) {
    const fromOthers = await failuresSince(and(eq(signInAttempts.email, email), ne(signInAttempts.address, address)), windowStart);
    if (fromOthers >= SIGN_IN_LIMITS.perAccount) return false;
  }
  return true;
}

export async function recordSignInAttempt(emailRaw: string, address: string, succeeded: boolean, at = new Date()) {
  await db().insert(signInAttempts).values({ email: normaliseEmail(emailRaw).slice(0, 254), address: address.slice(0, 64), succeeded, at });
}

export type SignInResult =
  | { kind: "ok"; sessionId: string; userId: string; name: string; email: string }
  | { kind: "bad-credentials" }
  | { kind: "rate-limited" };

/**
 * Checks the password and, on success, opens a new session row (a new session id at every
 * sign-in). Unknown e-mail and wrong password give the same answer and take about as long.
 */
export async function signIn(emailRaw: string, password: string, address: string): Promise<SignInResult> {
  const email = normaliseEmail(emailRaw);
  if (!(await signInAllowed(email, address))) {
    await burnVerify(password);
    return { kind: "rate-limited" };
  }
  const [user] = await db().select().from(users).where(eq(users.email, email)).limit(1);
  const ok = user ? await verifyPassword(user.passwordHash, password) : (await burnVerify(password), false);
  const [membership] = user && ok
    ? await db().select().from(memberships).where(eq(memberships.userId, user.id)).orderBy(memberships.createdAt).limit(1)
    : [];
  if (!user || !ok || !membership) {
    await recordSignInAttempt(email, address, false);
    return { kind: "bad-credentials" };
  }
  await recordSignInAttempt(email, address, true);
  const sessionId = await openSession(user.id, membership.shopId, user.sessionVersion);
  return { kind: "ok", sessionId, userId: user.id, name: user.name, email: user.email };
}

export async function openSession(userId: string, shopId: string, sessionVersion: number): Promise<string> {
  const id = Buffer.from(crypto.getRandomValues(new Uint8Array(32))).toString("base64url");
  const now = new Date();
  await db().insert(sessions).values({
    id,
    userId,
    shopId,
    sessionVersion,
    createdAt: now,
    expiresAt: new Date(now.getTime() + SESSION_HOURS * 3_600_000),
  });
  return id;
}

export type SessionUser = {
  sessionId: string;
  userId: string;
  name: string;
  email: string;
  shopId: string;
  shopName: string;
  shopTown: string;
  role: Role;
};

/** The session row with its user, membership and shop: asked on every signed-in request, so built once. */
const sessionQuery = prepared((db) =>
  db
    .select({
      sessionId: sessions.id,
      userId: users.id,
      name: users.name,
      email: users.email,
      shopId: shops.id,
      shopName: shops.name,
      shopTown: shops.town,
      role: memberships.role,
      expiresAt: sessions.expiresAt,
      sessionVersion: sessions.sessionVersion,
      userVersion: users.sessionVersion,
    })
    .from(sessions)
    .innerJoin(users, eq(users.id, sessions.userId))
    .innerJoin(memberships, and(eq(memberships.userId, sessions.userId), eq(memberships.shopId, sessions.shopId)))
    .innerJoin(shops, eq(shops.id, sessions.shopId))
    .where(and(eq(sessions.id, sql.placeholder("sessionId")), isNull(sessions.revokedAt)))
    .limit(1)
    .prepare(),
);

/** The live session behind a session id, or null when it was revoked, expired or superseded. */
export async function loadSession(sessionId: string, now = new Date()): Promise<SessionUser | null> {
  const [row] = await sessionQuery().execute({ sessionId });
  if (!row || row.expiresAt <= now || row.sessionVersion !== row.userVersion) return null;
  const { expiresAt: _e, sessionVersion: _s, userVersion: _u, ...user } = row;
  return user;
}

export async function revokeSession(sessionId: string): Promise<void> {
  await db().update(sessions).set({ revokedAt: new Date() }).where(and(eq(sessions.id, sessionId), isNull(sessions.revokedAt)));
}

/** Newest sessions first, for tests and an eventual "signed-in devices" page. */
export async function sessionsOf(userId: string) {
  return db().select().from(sessions).where(eq(sessions.userId, userId)).orderBy(desc(sessions.createdAt));
}
