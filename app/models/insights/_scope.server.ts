// The overview's filters as the shop's summary keys, and the small readers its queries share
// (_queries.server.ts): one condition per summary table, key labels, tree titles.
import { eq, sql, type SQL } from "drizzle-orm";
import { trees } from "../../../db/schema";
import { db } from "../../lib/db.server";
import { type Scope } from "../../lib/insights/period";

export const TOP = 15;

export type Keyed = Scope & { keys: FilterKeys };

/** The filters' things as the shop's keys, looked up once so no scan runs a subquery per row. */
export type FilterKeys = {
  equipment: number[] | null;
  tree: number | null;
  customer: number | null;
  site: number | null;
  technician: number | null;
};

export async function filterKeys(scope: Scope): Promise<FilterKeys> {
  const f = scope.filters;
  const shop = scope.shopId;
  const one = async (kind: string, name: string | undefined) => {
    if (!name) return null;
    const [k] = await rows<{ id: number }>(sql`SELECT id FROM insight_keys WHERE shop_id = ${shop} AND kind = ${kind} AND name = ${name}`);
    return k ? num(k.id) : 0;
  };
  const equipment = async () => {
    if (!f.category && !f.make && !f.model) return null;
    const eq: SQL[] = [sql`shop_id = ${shop}`, sql`kind = 'equipment'`];
    if (f.category) eq.push(sql`category = ${f.category}`);
    if (f.make) eq.push(sql`make = ${f.make}`);
    if (f.model) eq.push(sql`model = ${f.model}`);
    return (await rows<{ id: number }>(sql`SELECT id FROM insight_keys WHERE ${sql.join(eq, sql` AND `)}`)).map((k) => num(k.id));
  };
  const [e, tree, customer, site, technician] = await Promise.all([
    equipment(),
    one("tree", f.treeId),
    one("customer", f.customerId),
    one("site", f.siteId),
    one("technician", f.technicianId),
  ]);
  return { equipment: e, tree, customer, site, technician };
}

/** The filters as a condition on a summary table under alias `a` (f: runs, r: readings, p: parts). A thing never seen matches nothing. */
export function where(scope: Scope & { keys: FilterKeys }, a: string): SQL {
  const c = (name: string) => sql.raw(`${a}.${name}`);
  const k = scope.keys;
  const parts: SQL[] = [
    sql`${c("shop_id")} = ${scope.shopId}`,
    sql`${c("ended_at")} >= ${scope.start}`,
    sql`${c("ended_at")} < ${scope.end}`,
  ];
  if (k.equipment)
    parts.push(
      k.equipment.length
        ? sql`${c("equipment_k")} IN (${sql.join(
            k.equipment.map((n) => sql`${n}`),
            sql`, `,
          )})`
        : sql`FALSE`,
    );
  if (k.tree !== null) parts.push(sql`${c("tree_k")} = ${k.tree}`);
  if (k.customer !== null) parts.push(sql`${c("customer_k")} = ${k.customer}`);
  if (k.site !== null) parts.push(sql`${c("site_k")} = ${k.site}`);
  if (k.technician !== null) parts.push(sql`${c("technician_k")} = ${k.technician}`);
  return sql.join(parts, sql` AND `);
}

export async function rows<T>(query: SQL): Promise<T[]> {
  const [result] = (await db().execute(query)) as unknown as [T[]];
  return result;
}

export const num = (v: unknown) => Number(v ?? 0);
export const minutes = (seconds: number | null) => (seconds === null ? null : seconds / 60);

export type Key = {
  id: number;
  kind: string;
  name: string;
  category: string | null;
  make: string | null;
  model: string | null;
  a: string | null;
  b: string | null;
};

/** The shop's keys by number, for labels (a few hundred rows at most; only the kinds asked for). */
export async function keysOf(shopId: string, ids: Iterable<unknown>): Promise<Map<number, Key>> {
  const list = [...new Set([...ids].map(num))].filter((n) => n > 0);
  if (!list.length) return new Map();
  const found = await rows<Key>(
    sql`SELECT id, kind, name, category, make, model, a, b FROM insight_keys WHERE shop_id = ${shopId} AND id IN (${sql.join(
      list.map((n) => sql`${n}`),
      sql`, `,
    )})`,
  );
  return new Map(found.map((k) => [num(k.id), k]));
}

export async function treeTitles(shopId: string): Promise<Map<string, string>> {
  const list = await db().select({ id: trees.id, title: trees.title }).from(trees).where(eq(trees.shopId, shopId));
  return new Map(list.map((t) => [t.id, t.title]));
}

export const equipmentLabel = (k: Key | undefined) => (k?.make || k?.model ? `${k.make} ${k.model}`.trim() : "No unit recorded");
export const treeLabel = (k: Key | undefined, titles: Map<string, string>) =>
  k ? (titles.get(k.name) ?? "(a removed tree)") : "(a removed tree)";
