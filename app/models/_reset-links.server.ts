// Password-reset links, shared by the person's own "forgot your password?" (password-reset.server.ts)
// and the owner's "reset their sign-in" (members.server.ts): a single-use token that expires, kept
// only as a hash, and the e-mail that carries it.
import { and, eq, isNull } from "drizzle-orm";
import { passwordResets, shops } from "../../db/schema";
import { db, type Tx } from "../lib/db.server";
import { log, safeError } from "../lib/log.server";
import { sendMail } from "../lib/mail.server";
import { newToken, tokenHash } from "../lib/tokens.server";

/** How long a link works (OWASP Forgot Password Cheat Sheet: short-lived, single use). */
export const RESET_MINUTES = 30;

/**
 * Makes a new link's token for the person inside the caller's transaction; any earlier link of
 * theirs that is still open stops working, so only the newest mail counts.
 */
export async function issueResetToken(tx: Tx, userId: string, requestedBy: string | null, now = new Date()): Promise<string> {
  await tx
    .update(passwordResets)
    .set({ usedAt: now })
    .where(and(eq(passwordResets.userId, userId), isNull(passwordResets.usedAt)));
  const token = newToken();
  await tx.insert(passwordResets).values({
    userId,
    tokenHash: tokenHash(token),
    requestedBy,
    createdAt: now,
    expiresAt: new Date(now.getTime() + RESET_MINUTES * 60_000),
  });
  return token;
}

export type ResetMail = { shopId: string; to: string; name: string; link: string; sentBy?: string };

/** E-mails a reset link. Returns false when the mail server refused it (logged, never thrown). */
export async function sendResetMail(mail: ResetMail): Promise<boolean> {
  const [shop] = await db().select({ name: shops.name }).from(shops).where(eq(shops.id, mail.shopId)).limit(1);
  const why = mail.sentBy
    ? `${mail.sentBy} at ${shop?.name ?? "your shop"} has sent you a link to set a new password for Cluepath.`
    : `Someone, hopefully you, asked for a link to set a new password for your Cluepath account at ${shop?.name ?? "your shop"}.`;
  try {
    await sendMail({
      shopId: mail.shopId,
      to: mail.to,
      subject: "Set a new password for Cluepath",
      text: [
        `Hello ${mail.name},`,
        "",
        why,
        "",
        `Open this link within ${RESET_MINUTES} minutes to choose your new password. It works once:`,
        mail.link,
        "",
        "Setting a new password signs you out everywhere else.",
        mail.sentBy
          ? "If you did not expect this, tell your shop's owner."
          : "If you did not ask for this, ignore this message: your password stays as it is.",
      ].join("\n"),
    });
    return true;
  } catch (e) {
    log().error({ err: safeError(e) }, "password-reset mail failed");
    return false;
  }
}
