// The audit trail as the owner reads it: newest first, filtered, a page at a time. Entries are
// written by the models that do the actions (recordAudit, inside each action's transaction); nothing
// in the app edits or deletes them — there is no such function, and no route.
import { and, desc, eq, gte, lt, type SQL } from "drizzle-orm";
import { auditEvents, users, type AuditAction } from "../../db/schema";
import type { Ctx } from "../lib/context";
import { db } from "../lib/db.server";
import { authorize } from "../lib/policy";

export type AuditFilter = { action?: AuditAction; actorId?: string; from?: Date; to?: Date; limit?: number; before?: number };

export type AuditPage = {
  entries: (typeof auditEvents.$inferSelect & { actorName: string | null })[];
  /** Pass as `before` for the next (older) page; null on the last page. */
  nextBefore: number | null;
};

/** The shop's entries, newest first (owners only), `limit` at a time; `before` pages by id. */
export async function listAudit(ctx: Ctx, filter: AuditFilter = {}): Promise<AuditPage> {
  authorize(ctx, "audit.view");
  const limit = Math.max(1, Math.min(filter.limit ?? 100, 500));
  const where: SQL[] = [eq(auditEvents.shopId, ctx.shopId)];
  if (filter.action) where.push(eq(auditEvents.action, filter.action));
  if (filter.actorId) where.push(eq(auditEvents.actorId, filter.actorId));
  if (filter.from) where.push(gte(auditEvents.at, filter.from));
  if (filter.to) where.push(lt(auditEvents.at, filter.to));
  if (filter.before) where.push(lt(auditEvents.id, filter.before));
  const rows = await db()
    .select({ entry: auditEvents, actorName: users.name })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorId))
    .where(and(...where))
    .orderBy(desc(auditEvents.id))
    .limit(limit + 1);
  const entries = rows.slice(0, limit).map((r) => ({ ...r.entry, actorName: r.actorName }));
  return { entries, nextBefore: rows.length > limit ? (entries.at(-1)?.id ?? null) : null };
}
