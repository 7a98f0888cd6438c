// Query pieces the models share: a shop-scoped row lock, the unit → site → customer join, and
// numbering per shop. Used by the models only (no authorisation here: the caller has decided).
import { and, eq, type SQL } from "drizzle-orm";
import type { MySqlSelect } from "drizzle-orm/mysql-core";
import { customers, equipmentUnits, runs, serviceCalls, sites, trees, treeVersions } from "../../db/schema";
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

/** A unique index refused the insert (MariaDB's ER_DUP_ENTRY). */
export function isDuplicate(e: unknown): boolean {
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
