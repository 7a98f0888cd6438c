// The tree library: the shop's trees as one table (search, filters, sort), and the versions new runs
// can start on. A shop has tens to hundreds of trees, read in one query and filtered here.
import { and, asc, eq, max } from "drizzle-orm";
import { trees, treeVersions } from "../../../db/schema";
import type { EquipmentCategory } from "../../engine/types";
import type { Ctx } from "../../lib/context";
import { db } from "../../lib/db.server";
import { authorize, can } from "../../lib/policy";
import type { LibraryQuery } from "../../lib/tree-library";
import { standing, summaries } from "./_summaries.server";

export type LibraryRow = {
  treeId: string;
  title: string;
  category: EquipmentCategory;
  symptom: string;
  equipment: string | null;
  /** The version new runs start on, or null (never published, or all retired). */
  current: { number: number; versionId: string; publishedAt: Date | null } | null;
  draft: { versionId: string; updatedAt: Date; revision: number } | null;
  retired: boolean;
  lastChange: Date;
  /** Who made the last change (saved the draft, or published). */
  lastAuthor: string;
  versions: number;
};

/**
 * The shop's trees for the library table. Each row shows the current published version's title,
 * category and symptom (or the draft's, for a tree never published). Filtered and sorted here:
 * a shop has tens to hundreds of trees, read in one query.
 */
export async function listLibrary(ctx: Ctx, q: LibraryQuery = {}): Promise<LibraryRow[]> {
  authorize(ctx, "trees.view");
  const ids = (await db().select({ id: trees.id }).from(trees).where(eq(trees.shopId, ctx.shopId))).map((r) => r.id);
  const all = await summaries(ctx, ids);
  const byTree = new Map<string, typeof all>();
  for (const v of all) byTree.set(v.treeId, [...(byTree.get(v.treeId) ?? []), v]);
  const rows: LibraryRow[] = [];
  for (const [treeId, versions] of byTree) {
    const { current, draft } = standing(versions);
    const numbered = versions.filter((v) => v.number !== null).sort((a, z) => z.number! - a.number!);
    const shown = current ?? numbered[0] ?? draft!;
    const latest = [...versions].sort((a, z) => z.updatedAt.getTime() - a.updatedAt.getTime())[0]!;
    const lastChange = new Date(Math.max(...versions.map((v) => Math.max(v.updatedAt.getTime(), v.retiredAt?.getTime() ?? 0))));
    rows.push({
      treeId,
      title: shown.title,
      category: shown.category,
      symptom: shown.symptom,
      equipment: shown.equipment,
      current: current ? { number: current.number!, versionId: current.id, publishedAt: current.publishedAt } : null,
      draft: draft ? { versionId: draft.id, updatedAt: draft.updatedAt, revision: draft.revision } : null,
      retired: !current && numbered.length > 0,
      lastChange,
      lastAuthor: latest.updatedByName ?? latest.authorName,
      versions: numbered.length,
    });
  }
  const needle = q.search?.trim().toLowerCase();
  // A tree never published is the authors' business: technicians and trainers don't see it.
  const authoring = can(ctx, "trees.author");
  const kept = rows.filter(
    (r) =>
      (authoring || r.versions > 0) &&
      (!needle || [r.title, r.symptom, r.equipment ?? "", r.category].some((s) => s.toLowerCase().includes(needle))) &&
      (!q.category || r.category === q.category) &&
      (!q.state || (q.state === "published" ? r.current !== null : q.state === "draft" ? r.draft !== null : r.retired)),
  );
  const sort = q.sort ?? "title";
  const sign = (q.dir ?? (sort === "changed" ? "desc" : "asc")) === "asc" ? 1 : -1;
  const key = (r: LibraryRow): string | number =>
    sort === "changed" ? r.lastChange.getTime() : sort === "version" ? (r.current?.number ?? 0) : r[sort].toLowerCase();
  return kept.sort((a, z) => {
    const x = key(a);
    const y = key(z);
    return (x < y ? -1 : x > y ? 1 : a.title.localeCompare(z.title)) * sign;
  });
}

export type PublishedTreeSummary = {
  treeId: string;
  versionId: string;
  number: number;
  title: string;
  category: EquipmentCategory;
  symptom: string;
  /** Which models or families the tree covers (free text). */
  equipment: string | null;
  publishedAt: Date | null;
};

/** The current published version of each of the shop's trees (retired ones excluded). */
export async function listPublished(ctx: Ctx, filter: { category?: EquipmentCategory } = {}): Promise<PublishedTreeSummary[]> {
  authorize(ctx, "trees.view");
  const latest = db()
    .select({ treeId: treeVersions.treeId, n: max(treeVersions.number).as("n") })
    .from(treeVersions)
    .where(and(eq(treeVersions.shopId, ctx.shopId), eq(treeVersions.state, "published")))
    .groupBy(treeVersions.treeId)
    .as("latest");
  const rows = await db()
    .select({
      treeId: treeVersions.treeId,
      versionId: treeVersions.id,
      number: treeVersions.number,
      title: treeVersions.title,
      category: treeVersions.category,
      symptom: treeVersions.symptom,
      equipment: treeVersions.equipment,
      publishedAt: treeVersions.publishedAt,
    })
    .from(treeVersions)
    .innerJoin(latest, and(eq(latest.treeId, treeVersions.treeId), eq(latest.n, treeVersions.number)))
    .where(and(eq(treeVersions.shopId, ctx.shopId), filter.category ? eq(treeVersions.category, filter.category) : undefined))
    .orderBy(asc(treeVersions.title));
  return rows.map((r) => ({ ...r, number: r.number ?? 0 }));
}
