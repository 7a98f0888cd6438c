// Customers, their sites and the equipment units at them. Always scoped to the caller's shop.
import { and, asc, count, eq } from "drizzle-orm";
import { customers, equipmentUnits, memberships, sites } from "../../db/schema";
import type { Ctx } from "../lib/context";
import { db } from "../lib/db.server";

export async function getCustomer(ctx: Ctx, id: string) {
  const [row] = await db().select().from(customers).where(and(eq(customers.id, id), eq(customers.shopId, ctx.shopId))).limit(1);
  return row ?? null;
}

export async function getSite(ctx: Ctx, id: string) {
  const [row] = await db().select().from(sites).where(and(eq(sites.id, id), eq(sites.shopId, ctx.shopId))).limit(1);
  return row ?? null;
}

export async function getUnit(ctx: Ctx, id: string) {
  const [row] = await db()
    .select({ unit: equipmentUnits, site: sites, customer: customers })
    .from(equipmentUnits)
    .innerJoin(sites, eq(sites.id, equipmentUnits.siteId))
    .innerJoin(customers, eq(customers.id, sites.customerId))
    .where(and(eq(equipmentUnits.id, id), eq(equipmentUnits.shopId, ctx.shopId)))
    .limit(1);
  return row ?? null;
}

export async function listUnits(ctx: Ctx) {
  return db()
    .select({
      id: equipmentUnits.id,
      category: equipmentUnits.category,
      make: equipmentUnits.make,
      model: equipmentUnits.model,
      serial: equipmentUnits.serial,
      siteName: sites.name,
      customerName: customers.name,
    })
    .from(equipmentUnits)
    .innerJoin(sites, eq(sites.id, equipmentUnits.siteId))
    .innerJoin(customers, eq(customers.id, sites.customerId))
    .where(eq(equipmentUnits.shopId, ctx.shopId))
    .orderBy(asc(customers.name), asc(sites.name), asc(equipmentUnits.model));
}

/** Real counts for the owner's overview. */
export async function shopCounts(ctx: Ctx) {
  const one = async (table: typeof customers | typeof sites | typeof equipmentUnits | typeof memberships) => {
    const [row] = await db().select({ n: count() }).from(table).where(eq(table.shopId, ctx.shopId));
    return row?.n ?? 0;
  };
  const [people, customerCount, siteCount, unitCount] = await Promise.all([one(memberships), one(customers), one(sites), one(equipmentUnits)]);
  return { people, customers: customerCount, sites: siteCount, units: unitCount };
}
