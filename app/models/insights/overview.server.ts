// The owner's overview: root causes, first-time fixes, time to diagnose and on the job, parts,
// readings out of limits and hand-offs to a lead — every figure from the shop's own ended real
// runs (the summary rows in db/schema/insights.ts), filtered as the URL says.
import { and, asc, eq, ne } from "drizzle-orm";
import { customers, equipmentUnits, memberships, sites, trees, users } from "../../../db/schema";
import { CATEGORIES } from "../../engine/types";
import type { Ctx } from "../../lib/context";
import { db } from "../../lib/db.server";
import type { OverviewFilters } from "../../lib/insights/filters";
import { resolveScope } from "../../lib/insights/period";
import { type Table, type TableId } from "../../lib/insights/table";
import { authorize } from "../../lib/policy";
import { shopTimeZone } from "../shop.server";
import { filterKeys, FIRST_TIME_FIX_DEFINITION, num, QUERIES, TABLE_QUERY, type Keyed } from "./_queries.server";

export { FIRST_TIME_FIX_DEFINITION };
export const QUERY_NAMES = Object.keys(QUERIES);

// --- filter choices ------------------------------------------------------------------------------

export type FilterOptions = Awaited<ReturnType<typeof filterOptions>>;

/** What the filters offer: the shop's trees, equipment, customers (and the chosen customer's sites) and people. */
export async function filterOptions(ctx: Ctx, filters: Pick<OverviewFilters, "customerId">) {
  authorize(ctx, "shop.overview");
  const d = db();
  const [treeList, equipment, customerList, siteList, people] = await Promise.all([
    d.select({ id: trees.id, title: trees.title }).from(trees).where(eq(trees.shopId, ctx.shopId)).orderBy(asc(trees.title)),
    d
      .selectDistinct({ make: equipmentUnits.make, model: equipmentUnits.model })
      .from(equipmentUnits)
      .where(eq(equipmentUnits.shopId, ctx.shopId))
      .orderBy(asc(equipmentUnits.make), asc(equipmentUnits.model)),
    d
      .select({ id: customers.id, name: customers.name })
      .from(customers)
      .where(eq(customers.shopId, ctx.shopId))
      .orderBy(asc(customers.name)),
    filters.customerId
      ? d
          .select({ id: sites.id, name: sites.name })
          .from(sites)
          .where(and(eq(sites.shopId, ctx.shopId), eq(sites.customerId, filters.customerId)))
          .orderBy(asc(sites.name))
      : Promise.resolve([]),
    d
      .select({ id: users.id, name: users.name })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.shopId, ctx.shopId), ne(memberships.role, "trainer")))
      .orderBy(asc(users.name)),
  ]);
  return {
    categories: [...CATEGORIES],
    trees: treeList,
    makes: [...new Set(equipment.map((e) => e.make))],
    models: equipment,
    customers: customerList,
    sites: siteList,
    technicians: people,
  };
}

// --- what routes call -------------------------------------------------------------------------------

async function scopeOf(ctx: Ctx, filters: OverviewFilters, now?: Date): Promise<Keyed> {
  const scope = resolveScope(ctx.shopId, filters, await shopTimeZone(ctx), now);
  return { ...scope, keys: await filterKeys(scope) };
}

/** Everything the overview shows, for owners and leads of the caller's shop. */
export async function overview(ctx: Ctx, filters: OverviewFilters, now?: Date) {
  authorize(ctx, "shop.overview");
  const scope = await scopeOf(ctx, filters, now);
  const [options, ...groups] = await Promise.all([filterOptions(ctx, filters), ...Object.values(QUERIES).map((q) => q(scope))]);
  const tables = Object.fromEntries(groups.flat().map((t) => [t.id, t])) as Record<TableId, Table>;
  const sum = (id: TableId, key: string) => tables[id].rows.reduce((n, r) => n + num(r[key]), 0);
  const allTrees = tables["time-by-tree"].rows[0];
  return {
    totals: {
      ended: sum("hand-offs", "runs"),
      handed: sum("hand-offs", "handed"),
      done: num(allTrees?.runs),
      diagnoseMedian: (allTrees?.diagnoseMedian as number | null | undefined) ?? null,
      calls: sum("first-time-fix-by-month", "calls"),
      fixed: sum("first-time-fix-by-month", "fixed"),
    },
    period: {
      start: scope.start.toISOString(),
      end: scope.end.toISOString(),
      firstDay: scope.firstDay,
      lastDay: scope.lastDay,
      timeZone: scope.timeZone,
    },
    options,
    tables,
    definition: FIRST_TIME_FIX_DEFINITION,
  };
}

/** One table of the overview with the filters applied: the rows a CSV download writes. */
export async function overviewTable(
  ctx: Ctx,
  filters: OverviewFilters,
  id: TableId,
  now?: Date,
): Promise<{ table: Table; firstDay: string; lastDay: string }> {
  authorize(ctx, "shop.overview");
  const scope = await scopeOf(ctx, filters, now);
  const tables = await QUERIES[TABLE_QUERY[id]]!(scope);
  return { table: tables.find((t) => t.id === id)!, firstDay: scope.firstDay, lastDay: scope.lastDay };
}

/** For the benchmark: one named query on already-resolved filters. */
export async function runQuery(ctx: Ctx, name: string, filters: OverviewFilters, now?: Date): Promise<Table[]> {
  authorize(ctx, "shop.overview");
  return QUERIES[name]!(await scopeOf(ctx, filters, now));
}
