// "Forgot your password?": the person asks with their e-mail, gets a single-use link that expires,
// and sets a new password with it (OWASP Forgot Password Cheat Sheet; ASVS 5.0 credential
// recovery). No session is needed: the token in the link is the key, so these take no caller.
import { and, asc, eq, gt, isNull, sql } from "drizzle-orm";
import { memberships, passwordResets, shops, users } from "../../db/schema";
import { db, writeTx } from "../lib/db.server";
import { log, safeError } from "../lib/log.server";
import { hashPassword, passwordProblem } from "../lib/password.server";
import { fieldRefusal, Refusal } from "../lib/refusal";
import type { Role } from "../lib/roles";
import { endSessions, normaliseEmail, openSession, recordSignInAttempt, signInAllowed, type SessionOrigin } from "../lib/sign-in.server";
import { tokenHash } from "../lib/tokens.server";
import { recordAudit } from "./_audit.server";
import { issueResetToken, sendResetMail } from "./_reset-links.server";

export { RESET_MINUTES } from "./_reset-links.server";

/** The person behind an e-mail, in the first shop that still lets them in (as sign-in picks it). */
async function activeAccount(email: string) {
  const [row] = await db()
    .select({ userId: users.id, name: users.name, email: users.email, shopId: memberships.shopId, role: memberships.role })
    .from(users)
    .innerJoin(memberships, and(eq(memberships.userId, users.id), isNull(memberships.deactivatedAt)))
    .where(eq(users.email, email))
    .orderBy(asc(memberships.createdAt))
    .limit(1);
  return row ?? null;
}

export type ResetRequestResult = { kind: "accepted" } | { kind: "rate-limited" };

/**
 * A "forgot your password?" request. The answer is the same whether or not the e-mail has an
 * account, and so is its timing: the link is made and mailed after the answer. Every request counts
 * against the reset limiter (per address, per address and e-mail, per e-mail), known or not.
 */
export async function requestPasswordReset(
  emailRaw: string,
  origin: { address: string },
  linkFor: (token: string) => string,
): Promise<ResetRequestResult> {
  const email = normaliseEmail(emailRaw);
  const now = new Date();
  if (!(await signInAllowed(email, origin.address, now, "password-reset"))) return { kind: "rate-limited" };
  await recordSignInAttempt(email, origin.address, false, now, "password-reset");
  const account = await activeAccount(email);
  // The link is made and mailed after the answer, so a known e-mail answers as fast as an unknown one.
  if (account) void issueAndMail(account, origin.address, linkFor, now);
  return { kind: "accepted" };
}

async function issueAndMail(
  account: NonNullable<Awaited<ReturnType<typeof activeAccount>>>,
  address: string,
  linkFor: (token: string) => string,
  now: Date,
) {
  try {
    const token = await writeTx(async (tx) => {
      const t = await issueResetToken(tx, account.userId, null, now);
      await recordAudit(
        {
          shopId: account.shopId,
          actorId: null,
          actorEmail: account.email,
          action: "password.reset-requested",
          subjectType: "user",
          subjectId: account.userId,
          summary: `${account.name} asked for a link to set a new password`,
          details: { by: "self" },
          address,
        },
        tx,
      );
      return t;
    });
    await sendResetMail({ shopId: account.shopId, to: account.email, name: account.name, link: linkFor(token) });
  } catch (e) {
    log().error({ err: safeError(e) }, "password-reset link could not be made");
  }
}

/** The person a reset link is for, while the link is unused and unexpired; null otherwise. */
export async function findPasswordReset(token: string, now = new Date()): Promise<{ email: string; name: string } | null> {
  const [row] = await db()
    .select({ email: users.email, name: users.name, userId: users.id })
    .from(passwordResets)
    .innerJoin(users, eq(users.id, passwordResets.userId))
    .where(and(eq(passwordResets.tokenHash, tokenHash(token)), isNull(passwordResets.usedAt), gt(passwordResets.expiresAt, now)))
    .limit(1);
  if (!row || !(await activeAccount(row.email))) return null;
  return { email: row.email, name: row.name };
}

const GONE = "This link has expired or was already used. Ask for a new one: links work once, for 30 minutes.";

/**
 * Sets the new password with a reset link: the link is used up, every session of the person ends
 * (a new session version), and a new session is opened for them here. Returns it for the cookie.
 */
export async function completePasswordReset(
  token: string,
  password: string,
  origin: SessionOrigin,
): Promise<{ sessionId: string; userId: string; role: Role }> {
  const found = await findPasswordReset(token);
  if (!found) throw new Refusal("gone", GONE, { code: "link-gone" });
  const problem = passwordProblem(password, found.email);
  if (problem) throw fieldRefusal("password", problem);
  const hash = await hashPassword(password);
  return writeTx(async (tx) => {
    const now = new Date();
    const [reset] = await tx
      .select({ id: passwordResets.id, userId: passwordResets.userId, requestedBy: passwordResets.requestedBy })
      .from(passwordResets)
      .where(and(eq(passwordResets.tokenHash, tokenHash(token)), isNull(passwordResets.usedAt), gt(passwordResets.expiresAt, now)))
      .for("update");
    if (!reset) throw new Refusal("gone", GONE, { code: "link-gone" });
    const [member] = await tx
      .select({ shopId: memberships.shopId, role: memberships.role, shopName: shops.name })
      .from(memberships)
      .innerJoin(shops, eq(shops.id, memberships.shopId))
      .where(and(eq(memberships.userId, reset.userId), isNull(memberships.deactivatedAt)))
      .orderBy(asc(memberships.createdAt))
      .limit(1);
    if (!member) throw new Refusal("gone", GONE, { code: "link-gone" });
    // This link and any other open one of theirs are used up.
    await tx
      .update(passwordResets)
      .set({ usedAt: now })
      .where(and(eq(passwordResets.userId, reset.userId), isNull(passwordResets.usedAt)));
    await tx
      .update(users)
      .set({ passwordHash: hash, sessionVersion: sql`${users.sessionVersion} + 1` })
      .where(eq(users.id, reset.userId));
    const [user] = await tx
      .select({ v: users.sessionVersion, name: users.name, email: users.email })
      .from(users)
      .where(eq(users.id, reset.userId));
    const sessionsEnded = await endSessions(tx, { userId: reset.userId });
    const sessionId = await openSession(reset.userId, member.shopId, user!.v, origin, tx);
    await recordAudit(
      {
        shopId: member.shopId,
        actorId: reset.userId,
        actorEmail: user!.email,
        action: "password.reset",
        subjectType: "user",
        subjectId: reset.userId,
        summary: `${user!.name} set a new password with a reset link${sessionsEnded ? ` (${sessionsEnded} other session${sessionsEnded === 1 ? "" : "s"} ended)` : ""}`,
        details: { sessionsEnded, linkSentByOwner: reset.requestedBy !== null },
        address: origin.address ?? null,
      },
      tx,
    );
    return { sessionId, userId: reset.userId, role: member.role };
  });
}
