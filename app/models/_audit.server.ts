// The audit trail's writer, for the models that do the actions: append-only. `recordAudit` (in
// app/lib/audit.server.ts, shared with sign-in) adds a row inside the caller's write transaction, so
// the record and the action commit together. There is deliberately no function that changes or
// removes a row; the owner's read is listAudit in audit.server.ts.
import type { Ctx } from "../lib/context";
import type { AuditEntry } from "../lib/audit.server";

export { recordAudit, type AuditEntry } from "../lib/audit.server";

/** The shop, the actor and where the request came from, for entries made by a signed-in caller. */
export function byCaller(ctx: Ctx, address?: string | null): Pick<AuditEntry, "shopId" | "actorId" | "address"> {
  return { shopId: ctx.shopId, actorId: ctx.userId, address: address ?? ctx.address ?? null };
}
