// Customers, their sites and the equipment units at them. Always scoped to the caller's shop.
import { and, asc, count, desc, eq, or, sql } from "drizzle-orm";
import { z } from "zod";
import {
  customers,
  EQUIPMENT_CATEGORIES,
  equipmentUnits,
  memberships,
  sites,
  treeNodes,
  treeVersions,
  type EquipmentCategory,
} from "../../db/schema";
import type { Ctx } from "../lib/context";
import { db } from "../lib/db.server";
import { ratingLabel } from "../lib/display";
import { optionalText } from "../lib/forms";
import { authorize } from "../lib/policy";
import { notFound } from "../lib/refusal";
import { unitWithPlace, withPlace } from "./_query.server";

async function customerRow(ctx: Ctx, id: string) {
  const [row] = await db()
    .select()
    .from(customers)
    .where(and(eq(customers.id, id), eq(customers.shopId, ctx.shopId)))
    .limit(1);
  return row ?? notFound("That customer");
}

async function siteRow(ctx: Ctx, id: string) {
  const [row] = await db()
    .select()
    .from(sites)
    .where(and(eq(sites.id, id), eq(sites.shopId, ctx.shopId)))
    .limit(1);
  return row ?? notFound("That site");
}

export async function getCustomer(ctx: Ctx, id: string) {
  authorize(ctx, "equipment.view");
  return customerRow(ctx, id);
}

export async function getSite(ctx: Ctx, id: string) {
  authorize(ctx, "equipment.view");
  return siteRow(ctx, id);
}

/** One of the shop's units with its site and customer. */
export async function getUnit(ctx: Ctx, id: string) {
  authorize(ctx, "equipment.view");
  return (await unitWithPlace(ctx, id)) ?? notFound("That equipment unit");
}

/**
 * A unit's nameplate ratings as people read them: each key's label is the title the shop's
 * published trees for the unit's category give the nameplate step that records that variable
 * (newest version first), or else the key in words ("fanCapacitor" → "Fan capacitor").
 */
export async function unitRatings(
  ctx: Ctx,
  unit: { category: EquipmentCategory; nameplate: Record<string, { value: number; unit: string }> },
) {
  authorize(ctx, "equipment.view");
  const keys = Object.keys(unit.nameplate);
  const steps = keys.length
    ? await db()
        .select({ title: treeNodes.title, data: treeNodes.data })
        .from(treeNodes)
        .innerJoin(treeVersions, eq(treeVersions.id, treeNodes.versionId))
        .where(
          and(
            eq(treeVersions.shopId, ctx.shopId),
            eq(treeVersions.state, "published"),
            eq(treeVersions.category, unit.category),
            eq(treeNodes.kind, "nameplate"),
          ),
        )
        .orderBy(desc(treeVersions.number))
    : [];
  const titles = new Map<string, string>();
  for (const s of steps) if (typeof s.data.variable === "string" && !titles.has(s.data.variable)) titles.set(s.data.variable, s.title);
  return keys.map((key) => ({
    key,
    label: ratingLabel(key, titles.get(key)),
    value: unit.nameplate[key]!.value,
    unit: unit.nameplate[key]!.unit,
  }));
}

export async function listUnits(ctx: Ctx) {
  return searchUnits(ctx);
}

/** Real counts for the owner's overview. */
export async function shopCounts(ctx: Ctx) {
  authorize(ctx, "shop.overview");
  const one = async (table: typeof customers | typeof sites | typeof equipmentUnits | typeof memberships) => {
    const [row] = await db().select({ n: count() }).from(table).where(eq(table.shopId, ctx.shopId));
    return row?.n ?? 0;
  };
  const [people, customerCount, siteCount, unitCount] = await Promise.all([
    one(memberships),
    one(customers),
    one(sites),
    one(equipmentUnits),
  ]);
  return { people, customers: customerCount, sites: siteCount, units: unitCount };
}

// --- Lists, forms and edits (field runs) -------------------------------------------------------

export const customerInput = z.object({
  name: z.string().trim().min(1, "Enter the customer's name.").max(160, "Keep the name under 160 characters."),
  phone: optionalText(40, "Keep the phone number under 40 characters."),
});
export type CustomerInput = z.infer<typeof customerInput>;

export const siteInput = z.object({
  name: z.string().trim().min(1, "Name the site, e.g. the kitchen or counter.").max(160, "Keep the name under 160 characters."),
  address: z.string().trim().min(1, "Enter the site's address.").max(300, "Keep the address under 300 characters."),
  contactName: z.string().trim().min(1, "Who should receive service reports?").max(120, "Keep the name under 120 characters."),
  contactEmail: z.string().trim().min(1, "Enter the contact's e-mail address.").email("That doesn't look like an e-mail address.").max(254),
});
export type SiteInput = z.infer<typeof siteInput>;

export const unitInput = z.object({
  category: z.enum(EQUIPMENT_CATEGORIES, { message: "Choose the kind of equipment." }),
  make: z.string().trim().min(1, "Enter the make as on the nameplate.").max(120, "Keep it under 120 characters."),
  model: z.string().trim().min(1, "Enter the model as on the nameplate.").max(120, "Keep it under 120 characters."),
  serial: z.string().trim().min(1, "Enter the serial number.").max(120, "Keep it under 120 characters."),
  installedOn: z.preprocess(
    (v) => (typeof v === "string" && v.trim() === "" ? null : v),
    z
      .string()
      .regex(/^\d{4}-\d{2}-\d{2}$/, "Use a date like 2021-03-09.")
      .refine((d) => !Number.isNaN(Date.parse(d)) && d <= new Date().toISOString().slice(0, 10), "Use a real date, not in the future.")
      .nullable(),
  ),
});
export type UnitInput = z.infer<typeof unitInput>;

const like = (q: string) => `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

export async function listCustomers(ctx: Ctx, q = "") {
  authorize(ctx, "equipment.view");
  const term = q.trim();
  const pattern = like(term);
  return db()
    .select({
      id: customers.id,
      name: customers.name,
      phone: customers.phone,
      // Qualified by hand: in a one-table select Drizzle leaves column names bare.
      sites: sql<number>`(SELECT COUNT(*) FROM sites s WHERE s.customer_id = customers.id)`.mapWith(Number),
    })
    .from(customers)
    .where(
      and(
        eq(customers.shopId, ctx.shopId),
        term
          ? or(
              sql`${customers.name} LIKE ${pattern}`,
              sql`EXISTS (SELECT 1 FROM sites s WHERE s.customer_id = customers.id AND (s.name LIKE ${pattern} OR s.address LIKE ${pattern}))`,
            )
          : undefined,
      ),
    )
    .orderBy(asc(customers.name));
}

export async function createCustomer(ctx: Ctx, input: CustomerInput): Promise<string> {
  authorize(ctx, "equipment.write");
  const id = crypto.randomUUID();
  await db().insert(customers).values({ id, shopId: ctx.shopId, name: input.name, phone: input.phone });
  return id;
}

export async function updateCustomer(ctx: Ctx, id: string, input: CustomerInput): Promise<void> {
  authorize(ctx, "equipment.write");
  const [res] = await db()
    .update(customers)
    .set({ name: input.name, phone: input.phone })
    .where(and(eq(customers.id, id), eq(customers.shopId, ctx.shopId)));
  if (res.affectedRows === 0) notFound("That customer");
}

export async function sitesOf(ctx: Ctx, customerId: string) {
  authorize(ctx, "equipment.view");
  return db()
    .select({ site: sites, units: count(equipmentUnits.id) })
    .from(sites)
    .leftJoin(equipmentUnits, eq(equipmentUnits.siteId, sites.id))
    .where(and(eq(sites.customerId, customerId), eq(sites.shopId, ctx.shopId)))
    .groupBy(sites.id)
    .orderBy(asc(sites.name));
}

/** A new site of one of the shop's customers. */
export async function createSite(ctx: Ctx, customerId: string, input: SiteInput): Promise<string> {
  authorize(ctx, "equipment.write");
  await customerRow(ctx, customerId);
  const id = crypto.randomUUID();
  await db()
    .insert(sites)
    .values({ id, shopId: ctx.shopId, customerId, ...input });
  return id;
}

export async function updateSite(ctx: Ctx, id: string, input: SiteInput): Promise<void> {
  authorize(ctx, "equipment.write");
  const [res] = await db()
    .update(sites)
    .set(input)
    .where(and(eq(sites.id, id), eq(sites.shopId, ctx.shopId)));
  if (res.affectedRows === 0) notFound("That site");
}

export async function getSiteWithCustomer(ctx: Ctx, id: string) {
  authorize(ctx, "equipment.view");
  const [row] = await db()
    .select({ site: sites, customer: customers })
    .from(sites)
    .innerJoin(customers, eq(customers.id, sites.customerId))
    .where(and(eq(sites.id, id), eq(sites.shopId, ctx.shopId)))
    .limit(1);
  return row ?? notFound("That site");
}

export async function unitsAt(ctx: Ctx, siteId: string) {
  authorize(ctx, "equipment.view");
  return db()
    .select()
    .from(equipmentUnits)
    .where(and(eq(equipmentUnits.siteId, siteId), eq(equipmentUnits.shopId, ctx.shopId)))
    .orderBy(asc(equipmentUnits.model));
}

/** A new unit at one of the shop's sites. Nameplate ratings start empty. */
export async function createUnit(ctx: Ctx, siteId: string, input: UnitInput): Promise<string> {
  authorize(ctx, "equipment.write");
  await siteRow(ctx, siteId);
  const id = crypto.randomUUID();
  await db()
    .insert(equipmentUnits)
    .values({ id, shopId: ctx.shopId, siteId, ...input, nameplate: {} });
  return id;
}

export async function updateUnit(ctx: Ctx, id: string, input: UnitInput): Promise<void> {
  authorize(ctx, "equipment.write");
  const [res] = await db()
    .update(equipmentUnits)
    .set(input)
    .where(and(eq(equipmentUnits.id, id), eq(equipmentUnits.shopId, ctx.shopId)));
  if (res.affectedRows === 0) notFound("That equipment unit");
}

export type UnitFilter = { q?: string; category?: EquipmentCategory };

/** The shop's units, searched by make, model, serial, site or customer, and filtered by category. */
export async function searchUnits(ctx: Ctx, filter: UnitFilter = {}) {
  authorize(ctx, "equipment.view");
  const term = filter.q?.trim();
  const pattern = term ? like(term) : "";
  const query = db()
    .select({
      id: equipmentUnits.id,
      category: equipmentUnits.category,
      make: equipmentUnits.make,
      model: equipmentUnits.model,
      serial: equipmentUnits.serial,
      siteId: sites.id,
      siteName: sites.name,
      customerName: customers.name,
    })
    .from(equipmentUnits)
    .$dynamic();
  return withPlace(query)
    .where(
      and(
        eq(equipmentUnits.shopId, ctx.shopId),
        filter.category ? eq(equipmentUnits.category, filter.category) : undefined,
        term
          ? or(
              sql`${equipmentUnits.make} LIKE ${pattern}`,
              sql`${equipmentUnits.model} LIKE ${pattern}`,
              sql`${equipmentUnits.serial} LIKE ${pattern}`,
              sql`${sites.name} LIKE ${pattern}`,
              sql`${customers.name} LIKE ${pattern}`,
            )
          : undefined,
      ),
    )
    .orderBy(asc(customers.name), asc(sites.name), asc(equipmentUnits.model));
}
