// Query pieces the models share: a shop-scoped row lock, the unit → site → customer join, and
// numbering per shop. Used by the models only (no authorisation here: the caller has decided).
import { and, eq, max, sql, type SQL } from "drizzle-orm";
import type { MySqlSelect } from "drizzle-orm/mysql-core";
import type { ResultSetHeader } from "mysql2";
import { customers, equipmentUnits, reports, runs, serviceCalls, shopCounters, sites, trees, treeVersions, type Counter } from "../../db/schema";
import type { Ctx } from "../lib/context";
import type { RunView } from "../lib/run-log";
import { db, type Tx } from "../lib/db.server";

/** Tables whose rows belong to one shop and are locked by id. */
type Own = typeof runs | typeof trees | typeof serviceCalls | typeof treeVersions;

/**
 * Locks one of the caller's shop's rows for the rest of the transaction (SELECT … FOR UPDATE);
 * null when there is no such row in the shop. `where` narrows it further.
 */
export async function lockOwn<T extends Own>(tx: Tx, ctx: Ctx, table: T, id: string, where?: SQL): Promise<T["$inferSelect"] | null> {
  const t = table as Own;
  const rows = await tx
    .select()
    .from(t)
    .where(and(eq(t.id, id), eq(t.shopId, ctx.shopId), where))
    .for("update");
  return (rows[0] as T["$inferSelect"] | undefined) ?? null;
}

/**
 * Locks a run whose change may also change its call (pause, escalate, abandon, take over, outcome):
 * the call's row first, then the run's, the order starting a run takes them (docs/decisions/0240).
 */
export async function lockRunAndCall(tx: Tx, ctx: Ctx, runId: string): Promise<typeof runs.$inferSelect | null> {
  const [ref] = await tx
    .select({ callId: runs.callId })
    .from(runs)
    .where(and(eq(runs.id, runId), eq(runs.shopId, ctx.shopId)))
    .limit(1);
  if (!ref) return null;
  if (ref.callId) await lockOwn(tx, ctx, serviceCalls, ref.callId);
  return lockOwn(tx, ctx, runs, runId);
}

/** Joins a unit's site and the site's customer onto a query that has `equipment_units` in it. */
export function withPlace<Q extends MySqlSelect>(q: Q) {
  return q.innerJoin(sites, eq(sites.id, equipmentUnits.siteId)).innerJoin(customers, eq(customers.id, sites.customerId));
}

/** The same join for a query whose unit may be missing (a run without a call): site and customer may be null. */
export function withOptionalPlace<Q extends MySqlSelect>(q: Q) {
  return q.leftJoin(sites, eq(sites.id, equipmentUnits.siteId)).leftJoin(customers, eq(customers.id, sites.customerId));
}

/** One of the shop's units with its site and customer, or null. */
export async function unitWithPlace(ctx: Ctx, unitId: string) {
  const [row] = await withPlace(db().select({ unit: equipmentUnits, site: sites, customer: customers }).from(equipmentUnits).$dynamic())
    .where(and(eq(equipmentUnits.id, unitId), eq(equipmentUnits.shopId, ctx.shopId)))
    .limit(1);
  return row ?? null;
}

type UnitWithPlace = NonNullable<Awaited<ReturnType<typeof unitWithPlace>>>;

/** A unit as the runner shows it (with its site and customer). */
export function unitView(u: UnitWithPlace): NonNullable<RunView["unit"]> {
  return {
    id: u.unit.id,
    category: u.unit.category,
    make: u.unit.make,
    model: u.unit.model,
    serial: u.unit.serial,
    nameplate: u.unit.nameplate,
    site: u.site.name,
    customer: u.customer.name,
    contactName: u.site.contactName,
    contactEmail: u.site.contactEmail,
  };
}

/** True when MariaDB refused a write for a unique index (ER_DUP_ENTRY), also when wrapped by Drizzle. */
export function isDuplicate(e: unknown): boolean {
  for (let x: unknown = e, depth = 0; x && depth < 4; x = (x as { cause?: unknown }).cause, depth++) {
    if ((x as { code?: unknown }).code === "ER_DUP_ENTRY") return true;
  }
  return false;
}

/** The first number of each kind in a shop: calls from 1001, reports from R-0001. */
const FIRST: Record<Counter, number> = { call: 1001, report: 1 };

/** The numbered table of each kind, to start a shop's counter after numbers it already gave out. */
const NUMBERED = { call: serviceCalls, report: reports } as const;

/**
 * The shop's next call or report number, taken inside the creating transaction: the counter row
 * is incremented and stays locked until the transaction ends, so concurrent creations queue on it
 * and never pick the same number (docs/decisions/0241). The counter starts, or catches up, after
 * the highest number already in the table (a plain read, no lock), so rows numbered by other
 * means (the demo seed) are never repeated.
 */
export async function nextNumber(tx: Tx, shopId: string, counter: Counter): Promise<number> {
  const table = NUMBERED[counter];
  const [top] = await tx.select({ n: max(table.number) }).from(table).where(eq(table.shopId, shopId));
  const floor = Math.max(FIRST[counter], (top?.n ?? 0) + 1);
  const c = shopCounters;
  const [head] = (await tx.execute(
    sql`INSERT INTO ${c} (${c.shopId}, ${c.name}, ${c.last}) VALUES (${shopId}, ${counter}, LAST_INSERT_ID(${floor}))
        ON DUPLICATE KEY UPDATE ${c.last} = LAST_INSERT_ID(GREATEST(${c.last} + 1, ${floor}))`,
  )) as unknown as [ResultSetHeader];
  return head.insertId;
}
