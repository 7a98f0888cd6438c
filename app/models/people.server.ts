// Shop members and invitations.
import { and, asc, eq, gt, isNull } from "drizzle-orm";
import { invitations, memberships, shops, users } from "../../db/schema";
import type { Ctx } from "../lib/context";
import { db, writeTx } from "../lib/db.server";
import { sendMail } from "../lib/mail.server";
import { hashPassword, passwordProblem, verifyPassword } from "../lib/password.server";
import { authorize } from "../lib/policy";
import { fieldRefusal, notFound, Refusal } from "../lib/refusal";
import { ROLE_LABEL, type Role } from "../lib/roles";
import { normaliseEmail, openSession, type SessionOrigin } from "../lib/sign-in.server";
import { newToken, tokenHash } from "../lib/tokens.server";
import { byCaller, recordAudit } from "./_audit.server";

export const INVITATION_DAYS = 7;

export async function listMembers(ctx: Ctx) {
  authorize(ctx, "people.manage");
  return db()
    .select({
      userId: users.id,
      name: users.name,
      email: users.email,
      role: memberships.role,
      since: memberships.createdAt,
      deactivatedAt: memberships.deactivatedAt,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.shopId, ctx.shopId))
    .orderBy(asc(users.name));
}

export async function listOpenInvitations(ctx: Ctx, now = new Date()) {
  authorize(ctx, "people.manage");
  return db()
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, expiresAt: invitations.expiresAt })
    .from(invitations)
    .where(
      and(
        eq(invitations.shopId, ctx.shopId),
        isNull(invitations.acceptedAt),
        isNull(invitations.revokedAt),
        gt(invitations.expiresAt, now),
      ),
    )
    .orderBy(asc(invitations.createdAt));
}

/** Creates an invitation and returns the token for the link (only its hash is stored). */
export async function invite(ctx: Ctx, emailRaw: string, role: Role): Promise<{ id: string; token: string }> {
  authorize(ctx, "people.manage");
  const token = newToken();
  const id = crypto.randomUUID();
  const email = normaliseEmail(emailRaw);
  await writeTx(async (tx) => {
    await tx.insert(invitations).values({
      id,
      shopId: ctx.shopId,
      email,
      role,
      tokenHash: tokenHash(token),
      invitedBy: ctx.userId,
      expiresAt: new Date(Date.now() + INVITATION_DAYS * 86_400_000),
    });
    await recordAudit(
      {
        ...byCaller(ctx),
        action: "invitation.sent",
        subjectType: "invitation",
        subjectId: id,
        summary: `Invited ${email} as ${ROLE_LABEL[role]}`,
        details: { email, role },
      },
      tx,
    );
  });
  return { id, token };
}

/** E-mails the invitation link. Returns false when the mail server refused it (the link still works). */
export async function sendInvitationMail(ctx: Ctx, to: string, role: Role, link: string): Promise<boolean> {
  authorize(ctx, "people.manage");
  const [shop] = await db().select({ name: shops.name }).from(shops).where(eq(shops.id, ctx.shopId)).limit(1);
  const [from] = await db().select({ name: users.name }).from(users).where(eq(users.id, ctx.userId)).limit(1);
  try {
    await sendMail({
      shopId: ctx.shopId,
      to,
      subject: `Join ${shop?.name ?? "your shop"} on Cluepath`,
      text: [
        `${from?.name ?? "Your shop owner"} has invited you to ${shop?.name ?? "their shop"} on Cluepath as ${ROLE_LABEL[role]}.`,
        "",
        `Open this link to set your password and join (valid ${INVITATION_DAYS} days):`,
        link,
        "",
        "If you did not expect this, ignore this message.",
      ].join("\n"),
    });
    return true;
  } catch (e) {
    console.error("invitation mail failed:", e instanceof Error ? e.message : e);
    return false;
  }
}

export async function revokeInvitation(ctx: Ctx, id: string): Promise<void> {
  authorize(ctx, "people.manage");
  await writeTx(async (tx) => {
    const [inv] = await tx
      .select({ email: invitations.email, role: invitations.role })
      .from(invitations)
      .where(and(eq(invitations.id, id), eq(invitations.shopId, ctx.shopId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
      .for("update");
    if (!inv) notFound("That invitation");
    await tx.update(invitations).set({ revokedAt: new Date() }).where(eq(invitations.id, id));
    await recordAudit(
      {
        ...byCaller(ctx),
        action: "invitation.withdrawn",
        subjectType: "invitation",
        subjectId: id,
        summary: `Withdrew the invitation of ${inv.email}`,
        details: { email: inv.email, role: inv.role },
      },
      tx,
    );
  });
}

export type OpenInvitation = { id: string; email: string; role: Role; shopId: string; shopName: string; hasAccount: boolean };

/** The invitation behind a link, if it is still open. No session needed: the token is the key. */
export async function findInvitation(token: string, now = new Date()): Promise<OpenInvitation | null> {
  const [row] = await db()
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, shopId: shops.id, shopName: shops.name })
    .from(invitations)
    .innerJoin(shops, eq(shops.id, invitations.shopId))
    .where(
      and(
        eq(invitations.tokenHash, tokenHash(token)),
        isNull(invitations.acceptedAt),
        isNull(invitations.revokedAt),
        gt(invitations.expiresAt, now),
      ),
    )
    .limit(1);
  if (!row) return null;
  const [user] = await db().select({ id: users.id }).from(users).where(eq(users.email, row.email)).limit(1);
  return { ...row, hasAccount: Boolean(user) };
}

/**
 * Accepts an invitation: a new person sets their name and password; someone who already has an
 * account confirms with their password. Either way they become a member with the invited role
 * (access on, if an owner had turned it off) and are signed in to the shop: the new session is
 * returned for the cookie.
 */
export async function acceptInvitation(
  token: string,
  input: { name?: string; password: string },
  origin: SessionOrigin = {},
): Promise<{ shopName: string; role: Role; userId: string; sessionId: string }> {
  const inv = await findInvitation(token);
  if (!inv) throw new Refusal("gone", "This invitation has expired, was withdrawn, or was already used.");
  if (!inv.hasAccount) {
    // A new account: a name for the reports, and a password the rules accept.
    const fields: Record<string, string> = {};
    if (!input.name?.trim()) fields.name = "Enter your name as customers should see it on reports.";
    const problem = passwordProblem(input.password, inv.email);
    if (problem) fields.password = problem;
    if (Object.keys(fields).length) throw new Refusal("invalid", Object.values(fields)[0]!, { fields });
  }
  return writeTx(async (tx) => {
    const [existing] = await tx.select().from(users).where(eq(users.email, inv.email)).limit(1);
    let userId: string;
    let sessionVersion = 1;
    if (existing) {
      if (!(await verifyPassword(existing.passwordHash, input.password)))
        throw fieldRefusal("password", "That password doesn't match your existing account.");
      userId = existing.id;
      sessionVersion = existing.sessionVersion;
    } else {
      userId = crypto.randomUUID();
      await tx.insert(users).values({
        id: userId,
        email: inv.email,
        name: input.name?.trim() || inv.email,
        passwordHash: await hashPassword(input.password),
        sessionVersion,
      });
    }
    const [member] = await tx
      .select()
      .from(memberships)
      .where(and(eq(memberships.shopId, inv.shopId), eq(memberships.userId, userId)))
      .limit(1);
    if (member && member.role === "owner" && inv.role !== "owner") {
      // An invitation never demotes the shop's last owner (members.server.ts keeps the same rule).
      const owners = await tx
        .select({ id: memberships.id })
        .from(memberships)
        .where(and(eq(memberships.shopId, inv.shopId), eq(memberships.role, "owner"), isNull(memberships.deactivatedAt)))
        .for("update");
      if (owners.length <= 1)
        throw new Refusal(
          "conflict",
          "You are this shop's only owner; this invitation would take that away. Ask for an owner's invitation instead.",
          { code: "last-owner" },
        );
    }
    if (member) await tx.update(memberships).set({ role: inv.role, deactivatedAt: null }).where(eq(memberships.id, member.id));
    else await tx.insert(memberships).values({ shopId: inv.shopId, userId, role: inv.role });
    await tx.update(invitations).set({ acceptedAt: new Date() }).where(eq(invitations.id, inv.id));
    await recordAudit(
      {
        shopId: inv.shopId,
        actorId: userId,
        actorEmail: inv.email,
        address: origin.address ?? null,
        action: "invitation.accepted",
        subjectType: "invitation",
        subjectId: inv.id,
        summary: `${inv.email} accepted the invitation and joined as ${ROLE_LABEL[inv.role]}`,
        details: { role: inv.role, newAccount: !existing },
      },
      tx,
    );
    const sessionId = await openSession(userId, inv.shopId, sessionVersion, origin, tx);
    return { shopName: inv.shopName, role: inv.role, userId, sessionId };
  });
}
