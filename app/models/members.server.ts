// An owner's changes to the people of their shop: role, access off and on, and a fresh start for
// someone's sign-in. The shop always keeps at least one owner who can sign in. Runs, reports and
// everything else a person did stay when their access is turned off.
import { eq } from "drizzle-orm";
import { memberships, users } from "../../db/schema";
import type { Ctx } from "../lib/context";
import { writeTx, type Tx } from "../lib/db.server";
import { authorize } from "../lib/policy";
import { notFound, Refusal } from "../lib/refusal";
import { ROLE_LABEL, type Role } from "../lib/roles";
import { endSessions } from "../lib/sign-in.server";
import { byCaller, recordAudit } from "./_audit.server";
import { issueResetToken, sendResetMail } from "./_reset-links.server";

/**
 * The shop's memberships, locked for the rest of the transaction (SELECT … FOR UPDATE), with the
 * one asked for. Two owners changing people at once take turns, so "the last owner" is decided on
 * what the other has committed.
 */
async function lockMembers(tx: Tx, ctx: Ctx, userId: string) {
  const rows = await tx
    .select({
      id: memberships.id,
      userId: memberships.userId,
      role: memberships.role,
      deactivatedAt: memberships.deactivatedAt,
      name: users.name,
      email: users.email,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.shopId, ctx.shopId))
    .for("update");
  const target = rows.find((r) => r.userId === userId) ?? notFound("That person");
  const activeOwners = rows.filter((r) => r.role === "owner" && r.deactivatedAt === null).length;
  const lastOwner = target.role === "owner" && target.deactivatedAt === null && activeOwners <= 1;
  return { target, lastOwner };
}

const LAST_OWNER = "the shop's only owner. Make someone else an owner first, so the shop always has one.";

/** Gives a member another role. The last owner keeps theirs. */
export async function setMemberRole(
  ctx: Ctx,
  userId: string,
  role: Role,
  address?: string | null,
): Promise<{ changed: boolean; name: string }> {
  authorize(ctx, "people.manage");
  return writeTx(async (tx) => {
    const { target, lastOwner } = await lockMembers(tx, ctx, userId);
    if (target.role === role) return { changed: false, name: target.name };
    if (lastOwner) throw new Refusal("conflict", `${target.name} is ${LAST_OWNER}`, { code: "last-owner" });
    await tx.update(memberships).set({ role }).where(eq(memberships.id, target.id));
    await recordAudit(
      {
        ...byCaller(ctx, address),
        action: "member.role-changed",
        subjectType: "user",
        subjectId: userId,
        summary: `Changed ${target.name}'s role from ${ROLE_LABEL[target.role]} to ${ROLE_LABEL[role]}`,
        details: { from: target.role, to: role },
      },
      tx,
    );
    return { changed: true, name: target.name };
  });
}

/**
 * Turns a member's access to the shop off (they cannot sign in to it, their sessions in it end at
 * once) or back on. Their runs, reports and everything else stay. Nobody turns off their own access,
 * and the last owner's stays on.
 */
export async function setMemberActive(
  ctx: Ctx,
  userId: string,
  active: boolean,
  address?: string | null,
): Promise<{ changed: boolean; sessionsEnded: number; name: string }> {
  authorize(ctx, "people.manage");
  if (!active && userId === ctx.userId)
    throw new Refusal("conflict", "You can't turn off your own access. Another owner can.", { code: "self" });
  return writeTx(async (tx) => {
    const { target, lastOwner } = await lockMembers(tx, ctx, userId);
    if ((target.deactivatedAt === null) === active) return { changed: false, sessionsEnded: 0, name: target.name };
    if (!active && lastOwner) throw new Refusal("conflict", `${target.name} is ${LAST_OWNER}`, { code: "last-owner" });
    await tx
      .update(memberships)
      .set({ deactivatedAt: active ? null : new Date() })
      .where(eq(memberships.id, target.id));
    const sessionsEnded = active ? 0 : await endSessions(tx, { userId, shopId: ctx.shopId });
    await recordAudit(
      {
        ...byCaller(ctx, address),
        action: active ? "member.reactivated" : "member.deactivated",
        subjectType: "user",
        subjectId: userId,
        summary: active
          ? `Turned ${target.name}'s access back on`
          : `Turned off ${target.name}'s access${sessionsEnded ? ` and ended ${sessionsEnded} session${sessionsEnded === 1 ? "" : "s"}` : ""}`,
        details: active ? {} : { sessionsEnded },
      },
      tx,
    );
    return { changed: true, sessionsEnded, name: target.name };
  });
}

/**
 * A fresh start for someone's sign-in (a lost phone, a forgotten password): their sessions in this
 * shop end at once and they are e-mailed a link to set a new password. The owner never sees the
 * link, so an owner cannot take over a person's account. Their current password works until they
 * use the link; to shut someone out now, turn their access off.
 */
export async function resetMemberSignIn(
  ctx: Ctx,
  userId: string,
  linkFor: (token: string) => string,
  address?: string | null,
): Promise<{ name: string; email: string; mailed: boolean; sessionsEnded: number }> {
  authorize(ctx, "people.manage");
  if (userId === ctx.userId) throw new Refusal("conflict", "To change your own password, use your Account page.", { code: "self" });
  const done = await writeTx(async (tx) => {
    const { target } = await lockMembers(tx, ctx, userId);
    if (target.deactivatedAt) throw new Refusal("conflict", `${target.name}'s access is off. Turn it back on first.`, { code: "inactive" });
    const [owner] = await tx.select({ name: users.name }).from(users).where(eq(users.id, ctx.userId));
    const sessionsEnded = await endSessions(tx, { userId, shopId: ctx.shopId });
    const token = await issueResetToken(tx, userId, ctx.userId);
    const who = byCaller(ctx, address);
    if (sessionsEnded) {
      await recordAudit(
        {
          ...who,
          action: "sessions.ended",
          subjectType: "user",
          subjectId: userId,
          summary: `Ended ${target.name}'s ${sessionsEnded} session${sessionsEnded === 1 ? "" : "s"}`,
          details: { ended: sessionsEnded },
        },
        tx,
      );
    }
    await recordAudit(
      {
        ...who,
        action: "password.reset-requested",
        subjectType: "user",
        subjectId: userId,
        summary: `Sent ${target.name} a link to set a new password`,
        details: { by: "owner" },
      },
      tx,
    );
    return { target, token, sessionsEnded, ownerName: owner?.name ?? "Your shop's owner" };
  });
  const mailed = await sendResetMail({
    shopId: ctx.shopId,
    to: done.target.email,
    name: done.target.name,
    link: linkFor(done.token),
    sentBy: done.ownerName,
  });
  return { name: done.target.name, email: done.target.email, mailed, sessionsEnded: done.sessionsEnded };
}
