// The audit trail as the owner reads it: newest first, filtered. Entries are written by the models
// that do the actions (recordAudit in _audit.server.ts); nothing in the app edits or deletes them.
import { and, desc, eq, gte, lt, type SQL } from "drizzle-orm";
import { auditEvents, type AuditAction } from "../../db/schema";
import type { Ctx } from "../lib/context";
import { db } from "../lib/db.server";
import { authorize } from "../lib/policy";

export type AuditFilter = { action?: AuditAction; actorId?: string; from?: Date; to?: Date; limit?: number; before?: number };

/** The shop's entries, newest first (owners only). `before` pages by id. */
export async function listAudit(ctx: Ctx, filter: AuditFilter = {}) {
  authorize(ctx, "audit.view");
  const where: SQL[] = [eq(auditEvents.shopId, ctx.shopId)];
  if (filter.action) where.push(eq(auditEvents.action, filter.action));
  if (filter.actorId) where.push(eq(auditEvents.actorId, filter.actorId));
  if (filter.from) where.push(gte(auditEvents.at, filter.from));
  if (filter.to) where.push(lt(auditEvents.at, filter.to));
  if (filter.before) where.push(lt(auditEvents.id, filter.before));
  return db()
    .select()
    .from(auditEvents)
    .where(and(...where))
    .orderBy(desc(auditEvents.id))
    .limit(Math.min(filter.limit ?? 100, 500));
}
