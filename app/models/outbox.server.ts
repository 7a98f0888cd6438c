// The outbox: what the local mail catcher received for the caller's shop (dev and test setups).
// In production mail goes to the configured SMTP server, which keeps no copy here.
import type { Ctx } from "../lib/context";
import { capturedMail, mailCaptureEnabled } from "../lib/mail.server";
import { authorize } from "../lib/policy";

export async function listOutbox(ctx: Ctx) {
  authorize(ctx, "outbox.view");
  if (!mailCaptureEnabled()) return { enabled: false as const, messages: [] };
  return { enabled: true as const, messages: await capturedMail(ctx.shopId) };
}
