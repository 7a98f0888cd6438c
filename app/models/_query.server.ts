// Query pieces the models share: a shop-scoped row lock, the unit → site → customer join, numbering
// per shop, and related rows read as JSON inside one statement. Used by the models only (no
// authorisation here: the caller has decided).
import { and, eq, sql, type Column, type GetColumnData, type SQL } from "drizzle-orm";
import type { MySqlSelect } from "drizzle-orm/mysql-core";
import { customers, equipmentUnits, runs, serviceCalls, sites, trees, treeVersions } from "../../db/schema";
import type { Ctx } from "../lib/context";
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

function isDuplicate(e: unknown): boolean {
  const err = e as { code?: string; cause?: { code?: string } };
  return err?.code === "ER_DUP_ENTRY" || err?.cause?.code === "ER_DUP_ENTRY";
}

/** Inserts with the shop's next number (calls, reports); retries when two inserts pick the same one. */
export async function withNextNumber<T>(next: () => Promise<number>, insert: (n: number) => Promise<T>): Promise<T> {
  for (let attempt = 0; ; attempt++) {
    const n = await next();
    try {
      return await insert(n);
    } catch (e) {
      if (!isDuplicate(e) || attempt >= 5) throw e;
    }
  }
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
