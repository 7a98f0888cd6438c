// Query pieces the models share: a shop-scoped row lock, the unit → site → customer join, numbering
// per shop, and related rows read as JSON inside one statement. Used by the models only (no
// authorisation here: the caller has decided).
import { and, eq, max, sql, type Column, type GetColumnData, type SQL } from "drizzle-orm";
import type { MySqlSelect } from "drizzle-orm/mysql-core";
import type { ResultSetHeader } from "mysql2";
import {
  customers,
  equipmentUnits,
  reports,
  runs,
  serviceCalls,
  shopCounters,
  sites,
  trees,
  treeVersions,
  type Counter,
} from "../../db/schema";
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
  const [top] = await tx
    .select({ n: max(table.number) })
    .from(table)
    .where(eq(table.shopId, shopId));
  const floor = Math.max(FIRST[counter], (top?.n ?? 0) + 1);
  const c = shopCounters;
  const [head] = (await tx.execute(
    sql`INSERT INTO ${c} (${c.shopId}, ${c.name}, ${c.last}) VALUES (${shopId}, ${counter}, LAST_INSERT_ID(${floor}))
        ON DUPLICATE KEY UPDATE ${c.last} = LAST_INSERT_ID(GREATEST(${c.last} + 1, ${floor}))`,
  )) as unknown as [ResultSetHeader];
  return head.insertId;
}

// --- related rows as JSON, in the statement that reads their parent --------------------------------
//
// A page that shows a record with its lists (a run with its steps, notes, photos…) reads them all in
// one statement: each list is a correlated subquery that MariaDB folds into one JSON value
// (JSON_ARRAYAGG of JSON_OBJECT). One round trip instead of one per list; in Node, one JSON.parse
// instead of a driver row and an ORM mapping per row. Dates arrive as "YYYY-MM-DD hh:mm:ss.fff"
// (UTC, the connection's zone) and booleans as 0/1; JSON columns arrive as JSON.

/** What a column reads as inside JSON_OBJECT. */
type JsonValue<T> = T extends Date ? string : T extends boolean ? 0 | 1 : T;
type JsonField = Column | SQL<unknown>;
/** The object JSON_OBJECT(fields) reads as. */
export type JsonOf<F extends Record<string, JsonField>> = {
  [K in keyof F]: F[K] extends Column ? JsonValue<GetColumnData<F[K]>> : F[K] extends SQL<infer T> ? JsonValue<T> : never;
};

/** JSON_OBJECT('name', column, …). Names are written into the SQL, so they are plain words only. */
export function jsonObject(fields: Record<string, JsonField>): SQL {
  const pairs = Object.entries(fields).map(([name, value]) => {
    if (!/^\w+$/.test(name)) throw new Error(`not a JSON field name: ${name}`);
    return sql`${sql.raw(`'${name}'`)}, ${value}`;
  });
  return sql`JSON_OBJECT(${sql.join(pairs, sql`, `)})`;
}

/** `(SELECT JSON_OBJECT(fields) <from…>)`: one related row as an object, or null. */
export function jsonRow<F extends Record<string, JsonField>>(fields: F, from: SQL): SQL<JsonOf<F> | string | null> {
  return sql<JsonOf<F> | string | null>`(SELECT ${jsonObject(fields)} ${from} LIMIT 1)`;
}

/** `(SELECT JSON_ARRAYAGG(JSON_OBJECT(fields) ORDER BY …) <from…>)`: related rows as an array, or null when none. */
export function jsonRows<F extends Record<string, JsonField>>(fields: F, from: SQL, orderBy: SQL): SQL<JsonOf<F>[] | string | null> {
  return sql<JsonOf<F>[] | string | null>`(SELECT JSON_ARRAYAGG(${jsonObject(fields)} ORDER BY ${orderBy}) ${from})`;
}

/** A JSON function's result: mysql2 parses it when MariaDB marks it as JSON, else it is text. */
export function fromJson<T>(value: T | string | null): T | null {
  return typeof value === "string" ? (JSON.parse(value) as T) : value;
}

/** A DATETIME read inside JSON ("2026-12-03 09:47:02.319", UTC) as ISO 8601. */
export function jsonIso(value: string): string;
export function jsonIso(value: string | null): string | null;
export function jsonIso(value: string | null): string | null {
  return value === null ? null : `${value.replace(" ", "T")}Z`;
}
