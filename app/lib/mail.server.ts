// Outgoing mail through SMTP (nodemailer). Production sets SMTP_URL; start and test run a local
// catcher (scripts/fakes.ts) that stores each message as JSON under MAIL_CAPTURE_DIR.
import { readdir, readFile } from "node:fs/promises";
import { join } from "node:path";
import nodemailer, { type Transporter } from "nodemailer";
import { env } from "./env.server";

let transport: Transporter | undefined;
function transporter(): Transporter {
  return (transport ??= nodemailer.createTransport(env().SMTP_URL));
}

export type OutgoingMail = {
  /** The shop the mail is sent for; carried in a header so the outbox can be scoped. */
  shopId: string;
  /** The service report the mail carries, if any; in a header so the outbox can link to it. */
  reportId?: string;
  to: string;
  subject: string;
  text: string;
  html?: string;
  attachments?: { filename: string; content: Uint8Array; contentType: string; cid?: string }[];
};

export async function sendMail(mail: OutgoingMail): Promise<{ messageId: string }> {
  const info = await transporter().sendMail({
    from: env().MAIL_FROM,
    to: mail.to,
    subject: mail.subject,
    text: mail.text,
    html: mail.html,
    headers: { "X-Cluepath-Shop": mail.shopId, ...(mail.reportId ? { "X-Cluepath-Report": mail.reportId } : {}) },
    attachments: mail.attachments?.map((a) => ({
      filename: a.filename,
      content: Buffer.from(a.content),
      contentType: a.contentType,
      cid: a.cid,
    })),
  });
  return { messageId: String(info.messageId) };
}

export type CapturedMail = {
  id: string;
  receivedAt: string;
  shopId: string | null;
  /** From the X-Cluepath-Report header (absent in mail caught before it existed). */
  reportId?: string | null;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  attachments: { filename: string; contentType: string; size: number }[];
};

/** Whether a local mail catcher is configured (dev and tests); the outbox page needs one. */
export function mailCaptureEnabled(): boolean {
  return Boolean(env().MAIL_CAPTURE_DIR);
}

/** What the local mail catcher received for one shop, newest first. */
export async function capturedMail(shopId: string): Promise<CapturedMail[]> {
  const dir = env().MAIL_CAPTURE_DIR;
  if (!dir) return [];
  let names: string[];
  try {
    names = (await readdir(dir)).filter((n) => n.endsWith(".json"));
  } catch {
    return [];
  }
  const all = await Promise.all(names.map(async (n) => JSON.parse(await readFile(join(dir, n), "utf8")) as CapturedMail));
  return all.filter((m) => m.shopId === shopId).sort((a, b) => b.receivedAt.localeCompare(a.receivedAt));
}
