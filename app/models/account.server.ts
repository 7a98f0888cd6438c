// A person's own account: what the shop knows of them, their name, their password, and the
// sessions they are signed in with (which they can end). Every function acts on the caller only.
import { and, desc, eq, gt, isNull, sql } from "drizzle-orm";
import { z } from "zod";
import { memberships, sessions, shops, users } from "../../db/schema";
import type { Ctx } from "../lib/context";
import { db, writeTx } from "../lib/db.server";
import { describeDevice } from "../lib/device";
import { passwordProblem, hashPassword, verifyPassword } from "../lib/password.server";
import { authorize } from "../lib/policy";
import { fieldRefusal, notFound, Refusal } from "../lib/refusal";
import { endSessions, recordSignInAttempt, signInAllowed } from "../lib/sign-in.server";
import { tokenHash } from "../lib/tokens.server";
import { recordAudit } from "./_audit.server";

/** Who is asking, beyond the ctx: the session they ask from, and the address it came from. */
export type Caller = { sessionId: string; address: string };

/** How a session is named on the page and in forms: a hash of its id, never the id itself. */
function sessionRef(sessionId: string): string {
  return tokenHash(sessionId).slice(0, 24);
}

async function me(ctx: Ctx) {
  const [row] = await db()
    .select({
      name: users.name,
      email: users.email,
      passwordHash: users.passwordHash,
      sessionVersion: users.sessionVersion,
      role: memberships.role,
      shopName: shops.name,
      shopTown: shops.town,
      settings: shops.settings,
    })
    .from(users)
    .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.shopId, ctx.shopId)))
    .innerJoin(shops, eq(shops.id, ctx.shopId))
    .where(eq(users.id, ctx.userId))
    .limit(1);
  return row ?? notFound("Your account");
}

/** The caller's live sessions (any shop of theirs), newest first. */
async function liveSessions(ctx: Ctx, sessionVersion: number) {
  return db()
    .select({
      id: sessions.id,
      createdAt: sessions.createdAt,
      lastSeenAt: sessions.lastSeenAt,
      userAgent: sessions.userAgent,
      address: sessions.address,
      shopName: shops.name,
    })
    .from(sessions)
    .innerJoin(shops, eq(shops.id, sessions.shopId))
    .where(
      and(
        eq(sessions.userId, ctx.userId),
        isNull(sessions.revokedAt),
        gt(sessions.expiresAt, new Date()),
        eq(sessions.sessionVersion, sessionVersion),
      ),
    )
    .orderBy(desc(sessions.createdAt));
}

/** The account page: who they are in this shop (the owner decides role and shop) and their sessions. */
export async function getAccount(ctx: Ctx, caller: Pick<Caller, "sessionId">) {
  authorize(ctx, "account.self");
  const row = await me(ctx);
  const live = await liveSessions(ctx, row.sessionVersion);
  const list = live.map((s) => ({
    ref: sessionRef(s.id),
    current: s.id === caller.sessionId,
    device: describeDevice(s.userAgent),
    address: s.address,
    shopName: s.shopName,
    signedInAt: s.createdAt,
    lastSeenAt: s.lastSeenAt ?? s.createdAt,
  }));
  // This device first, then the most recently seen.
  list.sort((a, b) => Number(b.current) - Number(a.current) || b.lastSeenAt.getTime() - a.lastSeenAt.getTime());
  return {
    name: row.name,
    email: row.email,
    role: row.role,
    shopName: row.shopName,
    shopTown: row.shopTown,
    timeZone: row.settings.timeZone || "UTC",
    sessions: list,
  };
}

export const nameInput = z.object({
  name: z.string().trim().min(1, "Enter your name as customers should see it on reports.").max(120, "Keep your name under 120 characters."),
});

/** The name on reports and lists; the person's own to change. */
export async function renameSelf(ctx: Ctx, input: z.infer<typeof nameInput>): Promise<void> {
  authorize(ctx, "account.self");
  const { name } = nameInput.parse(input);
  await db().update(users).set({ name }).where(eq(users.id, ctx.userId));
}

/**
 * Changes the caller's password: the current one first (wrong guesses count against the sign-in
 * rate limit, so a borrowed session cannot try passwords), the new one under the sign-up rules.
 * Every other session of theirs ends; this one stays.
 */
export async function changePassword(
  ctx: Ctx,
  caller: Caller,
  input: { currentPassword: string; newPassword: string },
): Promise<{ otherSessionsEnded: number }> {
  authorize(ctx, "account.self");
  const row = await me(ctx);
  if (!(await signInAllowed(row.email, caller.address))) {
    throw fieldRefusal("currentPassword", "Too many wrong passwords. Wait 15 minutes and try again.");
  }
  if (!(await verifyPassword(row.passwordHash, input.currentPassword))) {
    await recordSignInAttempt(row.email, caller.address, false);
    throw fieldRefusal("currentPassword", "That is not your current password.");
  }
  const problem = passwordProblem(input.newPassword, row.email);
  if (problem) throw fieldRefusal("newPassword", problem);
  if (input.newPassword === input.currentPassword) throw fieldRefusal("newPassword", "Choose a password different from your current one.");
  const hash = await hashPassword(input.newPassword);
  return writeTx(async (tx) => {
    // A new session version ends every session made before it; this one moves to the new version.
    await tx
      .update(users)
      .set({ passwordHash: hash, sessionVersion: sql`${users.sessionVersion} + 1` })
      .where(eq(users.id, ctx.userId));
    const [u] = await tx.select({ v: users.sessionVersion }).from(users).where(eq(users.id, ctx.userId));
    await tx
      .update(sessions)
      .set({ sessionVersion: u!.v })
      .where(and(eq(sessions.id, caller.sessionId), eq(sessions.userId, ctx.userId)));
    const otherSessionsEnded = await endSessions(tx, { userId: ctx.userId, except: caller.sessionId });
    await recordAudit(
      {
        shopId: ctx.shopId,
        actorId: ctx.userId,
        actorEmail: row.email,
        action: "password.changed",
        subjectType: "user",
        subjectId: ctx.userId,
        summary: `${row.name} changed their password${otherSessionsEnded ? ` and was signed out of ${otherSessionsEnded} other session${otherSessionsEnded === 1 ? "" : "s"}` : ""}`,
        details: { otherSessionsEnded },
        address: caller.address,
      },
      tx,
    );
    return { otherSessionsEnded };
  });
}

/**
 * Ends one of the caller's sessions (by its ref from the page), or every one but this ("sign out
 * everywhere else"). Says whether the caller's own session was the one ended.
 */
export async function endMySessions(
  ctx: Ctx,
  caller: Caller,
  which: { ref: string } | { allButThis: true },
): Promise<{ ended: number; endedThisOne: boolean }> {
  authorize(ctx, "account.self");
  const row = await me(ctx);
  let target: string | undefined;
  if ("ref" in which) {
    target = (await liveSessions(ctx, row.sessionVersion)).find((s) => sessionRef(s.id) === which.ref)?.id;
    if (!target) throw new Refusal("gone", "That session has already ended.", { code: "session-gone" });
  }
  return writeTx(async (tx) => {
    let ended: number;
    if (target) {
      const [res] = await tx
        .update(sessions)
        .set({ revokedAt: new Date() })
        .where(and(eq(sessions.id, target), eq(sessions.userId, ctx.userId), isNull(sessions.revokedAt)));
      ended = res.affectedRows;
    } else {
      ended = await endSessions(tx, { userId: ctx.userId, except: caller.sessionId });
    }
    if (ended > 0) {
      await recordAudit(
        {
          shopId: ctx.shopId,
          actorId: ctx.userId,
          actorEmail: row.email,
          action: "sessions.ended",
          subjectType: "user",
          subjectId: ctx.userId,
          summary: target
            ? `${row.name} signed out ${target === caller.sessionId ? "of this session" : "one of their other sessions"}`
            : `${row.name} signed out everywhere else (${ended} session${ended === 1 ? "" : "s"})`,
          details: { ended, everywhereElse: !target },
          address: caller.address,
        },
        tx,
      );
    }
    return { ended, endedThisOne: target === caller.sessionId };
  });
}
