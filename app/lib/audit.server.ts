// The audit trail's writer: append-only. `recordAudit` adds a row inside the caller's write
// transaction, so the record and the action commit together (or neither does). It lives below the
// models because sign-in (app/lib/sign-in.server.ts) records too; the models reach it through
// app/models/_audit.server.ts. There is deliberately no function that changes or removes a row; the
// owner's read is listAudit in app/models/audit.server.ts.
import { auditEvents, type AuditAction } from "../../db/schema";
import { db, type Db, type Tx } from "./db.server";

export type AuditEntry = {
  /** The shop the action belongs to; null only for a refused sign-in no shop can be told of. */
  shopId: string | null;
  actorId?: string | null;
  actorEmail?: string | null;
  action: AuditAction;
  subjectType?: string;
  subjectId?: string;
  summary: string;
  details?: Record<string, unknown>;
  address?: string | null;
};

/** Appends one entry. Pass the transaction that does the action, so both commit or neither. */
export async function recordAudit(entry: AuditEntry, tx: Tx | Db = db()): Promise<void> {
  await tx.insert(auditEvents).values({
    shopId: entry.shopId,
    actorId: entry.actorId ?? null,
    actorEmail: entry.actorEmail?.slice(0, 254) ?? null,
    action: entry.action,
    subjectType: entry.subjectType ?? null,
    subjectId: entry.subjectId ?? null,
    summary: entry.summary.slice(0, 500),
    details: entry.details ?? null,
    address: entry.address?.slice(0, 64) ?? null,
    at: new Date(),
  });
}
