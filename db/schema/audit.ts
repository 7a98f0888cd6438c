// The audit trail: an append-only record of the actions a shop may be asked about (who, when, what,
// from where). The app only ever inserts rows; no model function updates or deletes them.
import { bigint, index, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import { json, timestamp, uuidRef } from "./columns";

export const AUDIT_ACTIONS = [
  "version.published",
  "version.retired",
  "member.role-changed",
  "member.deactivated",
  "member.reactivated",
  "invitation.sent",
  "invitation.accepted",
  "invitation.withdrawn",
  "run.taken-over",
  "report.sent",
  "sign-in.succeeded",
  "sign-in.refused",
  "password.reset-requested",
  "password.reset",
  "password.changed",
  "sessions.ended",
] as const;
export type AuditAction = (typeof AUDIT_ACTIONS)[number];

export const auditEvents = mysqlTable(
  "audit_events",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    /** Null only for a refused sign-in with an e-mail no shop knows. */
    shopId: uuidRef("shop_id"),
    /** Who did it; null when nobody was signed in (a refused sign-in, a reset request). */
    actorId: uuidRef("actor_id"),
    /** The e-mail as typed or as the actor's account had it then, kept as text so it survives edits. */
    actorEmail: varchar("actor_email", { length: 254 }),
    action: varchar("action", { length: 40 }).$type<AuditAction>().notNull(),
    /** What it was done to: "tree-version", "user", "invitation", "run", "report"… and its id. */
    subjectType: varchar("subject_type", { length: 24 }),
    subjectId: varchar("subject_id", { length: 64 }),
    /** One line in the owner's words: "Published ‘Fryer won't heat’ version 3". */
    summary: varchar("summary", { length: 500 }).notNull(),
    details: json<Record<string, unknown>>("details"),
    /** The client's address as the server entry saw it. */
    address: varchar("address", { length: 64 }),
    at: timestamp("at").notNull(),
  },
  (t) => [index("audit_events_shop_at_idx").on(t.shopId, t.at), index("audit_events_shop_action_at_idx").on(t.shopId, t.action, t.at)],
);
