// Sign-in: password check, the rate limit, and the session rows the cookie points at.
import { and, count, desc, eq, gt, isNull, lt, max, ne, or, sql } from "drizzle-orm";
import { memberships, sessions, shops, signInAttempts, users, type AttemptPurpose } from "../../db/schema";
import { recordAudit } from "./audit.server";
import { db, prepared, writeTx, type Db, type Tx } from "./db.server";
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

/**
 * The same limiter for "forgot your password?" requests, counted apart from sign-ins (someone who
 * just failed to sign in must still be able to ask), and lower, since each request sends a mail.
 * Every request counts; unknown e-mails too, so the limit says nothing about who has an account.
 */
export const RESET_REQUEST_LIMITS = { windowMinutes: 15, perPair: 3, perAddress: 10, perAccount: 5, knownAddressDays: 90 };

const LIMITS: Record<AttemptPurpose, typeof SIGN_IN_LIMITS> = { "sign-in": SIGN_IN_LIMITS, "password-reset": RESET_REQUEST_LIMITS };

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

export async function signInAllowed(
  emailRaw: string,
  address: string,
  now = new Date(),
  purpose: AttemptPurpose = "sign-in",
): Promise<boolean> {
  const email = normaliseEmail(emailRaw);
  const limits = LIMITS[purpose];
  const windowStart = new Date(now.getTime() - limits.windowMinutes * 60_000);
  const ofPurpose = eq(signInAttempts.purpose, purpose);
  const [lastPairSuccess] = await db()
    .select({ at: max(signInAttempts.at) })
    .from(signInAttempts)
    .where(and(eq(signInAttempts.email, email), eq(signInAttempts.address, address), eq(signInAttempts.succeeded, true), ofPurpose));
  const pairSince = lastPairSuccess?.at && lastPairSuccess.at > windowStart ? lastPairSuccess.at : windowStart;
  if (
    (await failuresSince(and(eq(signInAttempts.email, email), eq(signInAttempts.address, address), ofPurpose), pairSince)) >= limits.perPair
  )
    return false;
  if ((await failuresSince(and(eq(signInAttempts.address, address), ofPurpose), windowStart)) >= limits.perAddress) return false;
  const knownSince = new Date(now.getTime() - limits.knownAddressDays * 86_400_000);
  const known = lastPairSuccess?.at !== null && lastPairSuccess?.at !== undefined && lastPairSuccess.at > knownSince;
  if (!known) {
    const fromOthers = await failuresSince(
      and(eq(signInAttempts.email, email), ne(signInAttempts.address, address), ofPurpose),
      windowStart,
    );
    if (fromOthers >= limits.perAccount) return false;
  }
  return true;
}

export async function recordSignInAttempt(
  emailRaw: string,
  address: string,
  succeeded: boolean,
  at = new Date(),
  purpose: AttemptPurpose = "sign-in",
  tx: Tx | Db = db(),
) {
  await tx
    .insert(signInAttempts)
    .values({ email: normaliseEmail(emailRaw).slice(0, 254), address: address.slice(0, 64), succeeded, at, purpose });
}

export type SignInResult =
  | { kind: "ok"; sessionId: string; userId: string; name: string; email: string }
  | { kind: "bad-credentials" }
  /** The password was right, but every shop of theirs has turned their access off. */
  | { kind: "access-off" }
  | { kind: "rate-limited" };

/** What the session list shows about where a session was opened. */
export type SessionOrigin = { address?: string | null; userAgent?: string | null };

/**
 * Checks the password and, on success, opens a new session row (a new session id at every
 * sign-in). Unknown e-mail and wrong password give the same answer and take about as long.
 */
export async function signIn(emailRaw: string, password: string, address: string, userAgent?: string | null): Promise<SignInResult> {
  const email = normaliseEmail(emailRaw);
  if (!(await signInAllowed(email, address))) {
    await burnVerify(password);
    return { kind: "rate-limited" };
  }
  const [user] = await db().select().from(users).where(eq(users.email, email)).limit(1);
  const ok = user ? await verifyPassword(user.passwordHash, password) : (await burnVerify(password), false);
  const [membership] =
    user && ok
      ? await db()
          .select()
          .from(memberships)
          .where(and(eq(memberships.userId, user.id), isNull(memberships.deactivatedAt)))
          .orderBy(memberships.createdAt)
          .limit(1)
      : [];
  if (!user || !ok || !membership) {
    // Audited in the same transaction as the attempt: in every shop of the account typed, or in
    // no shop when nobody has that e-mail (docs/decisions/0244).
    const shopIds = user
      ? (await db().select({ shopId: memberships.shopId }).from(memberships).where(eq(memberships.userId, user.id))).map((m) => m.shopId)
      : [];
    const kind = user && ok ? "access-off" : "bad-credentials";
    await writeTx(async (tx) => {
      await recordSignInAttempt(email, address, false, new Date(), "sign-in", tx);
      for (const shopId of shopIds.length ? shopIds : [null]) {
        await recordAudit(
          {
            shopId,
            actorEmail: email,
            address,
            action: "sign-in.refused",
            ...(user ? { subjectType: "user", subjectId: user.id } : {}),
            summary: `Refused sign-in as ${email}`,
            details: { reason: !user ? "unknown e-mail" : !ok ? "wrong password" : "access off" },
          },
          tx,
        );
      }
    });
    return { kind };
  }
  const sessionId = await writeTx(async (tx) => {
    await recordSignInAttempt(email, address, true, new Date(), "sign-in", tx);
    const id = await openSession(user.id, membership.shopId, user.sessionVersion, { address, userAgent }, tx);
    await recordAudit(
      {
        shopId: membership.shopId,
        actorId: user.id,
        actorEmail: user.email,
        address,
        action: "sign-in.succeeded",
        subjectType: "user",
        subjectId: user.id,
        summary: `${user.email} signed in`,
      },
      tx,
    );
    return id;
  });
  return { kind: "ok", sessionId, userId: user.id, name: user.name, email: user.email };
}

/** Opens a session row (inside the caller's transaction when one is given) and returns its id. */
export async function openSession(
  userId: string,
  shopId: string,
  sessionVersion: number,
  origin: SessionOrigin = {},
  executor: Db | Tx = db(),
): Promise<string> {
  const id = Buffer.from(crypto.getRandomValues(new Uint8Array(32))).toString("base64url");
  const now = new Date();
  await executor.insert(sessions).values({
    id,
    userId,
    shopId,
    sessionVersion,
    createdAt: now,
    expiresAt: new Date(now.getTime() + SESSION_HOURS * 3_600_000),
    lastSeenAt: now,
    userAgent: origin.userAgent?.slice(0, 400) || null,
    address: origin.address?.slice(0, 64) || null,
  });
  return id;
}

/** "Last seen" is written at most this often per session, so most requests only read the row. */
export const LAST_SEEN_MINUTES = 5;

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
      lastSeenAt: sessions.lastSeenAt,
    })
    .from(sessions)
    .innerJoin(users, eq(users.id, sessions.userId))
    .innerJoin(
      memberships,
      and(eq(memberships.userId, sessions.userId), eq(memberships.shopId, sessions.shopId), isNull(memberships.deactivatedAt)),
    )
    .innerJoin(shops, eq(shops.id, sessions.shopId))
    .where(and(eq(sessions.id, sql.placeholder("sessionId")), isNull(sessions.revokedAt)))
    .limit(1)
    .prepare(),
);

/** The live session behind a session id, or null when it was revoked, expired or superseded. */
export async function loadSession(sessionId: string, now = new Date()): Promise<SessionUser | null> {
  const [row] = await sessionQuery().execute({ sessionId });
  if (!row || row.expiresAt <= now || row.sessionVersion !== row.userVersion) return null;
  const { expiresAt: _e, sessionVersion: _s, userVersion: _u, lastSeenAt, ...user } = row;
  const stale = new Date(now.getTime() - LAST_SEEN_MINUTES * 60_000);
  if (!lastSeenAt || lastSeenAt < stale) {
    // Conditional, so two servers seeing the same session at once write it once.
    await db()
      .update(sessions)
      .set({ lastSeenAt: now })
      .where(and(eq(sessions.id, sessionId), or(isNull(sessions.lastSeenAt), lt(sessions.lastSeenAt, stale))));
  }
  return user;
}

export async function revokeSession(sessionId: string): Promise<void> {
  await db()
    .update(sessions)
    .set({ revokedAt: new Date() })
    .where(and(eq(sessions.id, sessionId), isNull(sessions.revokedAt)));
}

/**
 * Ends a person's live sessions (all of them, or one shop's, or all but one) inside the caller's
 * transaction; returns how many ended. Each ends at once on every app server: the row is the truth.
 */
export async function endSessions(tx: Tx, who: { userId: string; shopId?: string; except?: string }): Promise<number> {
  const now = new Date();
  const [res] = await tx
    .update(sessions)
    .set({ revokedAt: now })
    .where(
      and(
        eq(sessions.userId, who.userId),
        isNull(sessions.revokedAt),
        gt(sessions.expiresAt, now),
        who.shopId ? eq(sessions.shopId, who.shopId) : undefined,
        who.except ? ne(sessions.id, who.except) : undefined,
      ),
    );
  return res.affectedRows;
}

/** Newest sessions first, for tests. */
export async function sessionsOf(userId: string) {
  return db().select().from(sessions).where(eq(sessions.userId, userId)).orderBy(desc(sessions.createdAt));
}
