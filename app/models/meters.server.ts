// The shop's meters: one row per function and range, with its stated accuracy. Leads and owners
// keep the list; the runner offers the meters that measure a step's quantity.
import { and, asc, eq, isNull } from "drizzle-orm";
import { z } from "zod";
import { meters } from "../../db/schema";
import { QUANTITIES, type Quantity } from "../engine/types";
import { QUANTITY_INFO, unitQuantity } from "../engine/units";
import type { Ctx } from "../lib/context";
import { db } from "../lib/db.server";
import { formNumber } from "../lib/forms";
import { authorize, can } from "../lib/policy";
import { notFound } from "../lib/refusal";
import type { MeterView } from "../lib/run-log";

const positive = (what: string) => formNumber(`Enter the ${what} as a number.`).refine((n) => n > 0, `The ${what} must be more than 0.`);

export const meterInput = z
  .object({
    name: z.string().trim().min(1, "Give the meter a name people will recognise.").max(120, "Keep the name under 120 characters."),
    quantity: z.enum(QUANTITIES, { message: "Choose what this range measures." }),
    unit: z.string().trim().min(1, "Enter the unit of the range, e.g. V or µF.").max(16),
    rangeMax: positive("top of the range"),
    resolution: positive("resolution"),
    percent: formNumber("Enter the % of reading as a number.").pipe(z.number().min(0, "Can't be negative.").max(100, "At most 100 %.")),
    counts: formNumber("Enter the counts as a whole number.").pipe(
      z.number().int("Counts are a whole number.").min(0, "Can't be negative.").max(10000, "At most 10000 counts."),
    ),
  })
  .superRefine((m, ctx) => {
    if (unitQuantity(m.unit, m.quantity) !== m.quantity) {
      const offered = QUANTITY_INFO[m.quantity].units.join(", ");
      ctx.addIssue({
        code: "custom",
        path: ["unit"],
        message: `“${m.unit}” isn't a unit of ${QUANTITY_INFO[m.quantity].noun}; try ${offered}.`,
      });
    }
    if (m.resolution > m.rangeMax)
      ctx.addIssue({ code: "custom", path: ["resolution"], message: "The resolution can't be coarser than the range." });
  });
export type MeterInput = z.infer<typeof meterInput>;

function view(row: typeof meters.$inferSelect): MeterView & { retired: boolean } {
  return {
    id: row.id,
    name: row.name,
    quantity: row.quantity,
    unit: row.unit,
    rangeMax: row.rangeMax,
    resolution: row.resolution,
    percent: row.percent,
    counts: row.counts,
    retired: row.retiredAt !== null,
  };
}

/** The shop's meters; retired ones too when asked for by someone who keeps the list. */
export async function listMeters(ctx: Ctx, opts: { includeRetired?: boolean; quantity?: Quantity } = {}) {
  authorize(ctx, "meters.view");
  const includeRetired = opts.includeRetired === true && can(ctx, "meters.manage");
  const rows = await db()
    .select()
    .from(meters)
    .where(
      and(
        eq(meters.shopId, ctx.shopId),
        includeRetired ? undefined : isNull(meters.retiredAt),
        opts.quantity ? eq(meters.quantity, opts.quantity) : undefined,
      ),
    )
    .orderBy(asc(meters.quantity), asc(meters.name));
  return rows.map(view);
}

export async function getMeter(ctx: Ctx, id: string) {
  authorize(ctx, "meters.view");
  const [row] = await db()
    .select()
    .from(meters)
    .where(and(eq(meters.id, id), eq(meters.shopId, ctx.shopId)))
    .limit(1);
  return row ? view(row) : notFound("That meter");
}

export async function createMeter(ctx: Ctx, input: MeterInput): Promise<string> {
  authorize(ctx, "meters.manage");
  const id = crypto.randomUUID();
  await db()
    .insert(meters)
    .values({ id, shopId: ctx.shopId, ...input, updatedAt: new Date() });
  return id;
}

export async function updateMeter(ctx: Ctx, id: string, input: MeterInput): Promise<void> {
  authorize(ctx, "meters.manage");
  const [res] = await db()
    .update(meters)
    .set({ ...input, updatedAt: new Date() })
    .where(and(eq(meters.id, id), eq(meters.shopId, ctx.shopId)));
  if (res.affectedRows === 0) notFound("That meter");
}

/** Retired meters stay on the steps that used them; the runner stops offering them. */
export async function setMeterRetired(ctx: Ctx, id: string, retired: boolean): Promise<void> {
  authorize(ctx, "meters.manage");
  const [res] = await db()
    .update(meters)
    .set({ retiredAt: retired ? new Date() : null, updatedAt: new Date() })
    .where(and(eq(meters.id, id), eq(meters.shopId, ctx.shopId)));
  if (res.affectedRows === 0) notFound("That meter");
}
