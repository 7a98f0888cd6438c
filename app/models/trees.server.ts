// Trees and their versions. Published and retired versions never change: every write below goes
// through a draft, and the guard refuses the rest.
import { and, asc, desc, eq, inArray, max } from "drizzle-orm";
import { treeBranches, treeNodes, trees, treeVersions, type VersionState } from "../../db/schema";
import type { EquipmentCategory, Tree } from "../engine/types";
import type { Ctx } from "../lib/context";
import { db, type Db } from "../lib/db.server";
import { rowsToTree, treeToRows } from "./tree-rows";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

export class VersionLockedError extends Error {
  constructor(public readonly state: VersionState) {
    super(`A ${state} version never changes. Start a new draft from it instead.`);
  }
}

/** The guard every write to a version's content goes through. */
export function assertDraft(version: { state: VersionState }): void {
  if (version.state !== "draft") throw new VersionLockedError(version.state);
}

async function writeContent(tx: Tx, shopId: string, versionId: string, tree: Tree) {
  const { nodes, branches } = treeToRows(tree);
  if (nodes.length) await tx.insert(treeNodes).values(nodes.map((n) => ({ ...n, versionId, shopId })));
  if (branches.length) await tx.insert(treeBranches).values(branches.map((b) => ({ ...b, versionId, shopId })));
}

function versionColumns(tree: Tree) {
  const { version } = treeToRows(tree);
  return {
    title: version.title,
    category: version.category,
    symptom: version.symptom,
    equipment: version.equipment ?? null,
    description: version.description ?? null,
    startKey: version.start,
  };
}

/**
 * Creates a tree with its first version published (the seed's starter trees, or an import that
 * was validated first). Returns the ids.
 */
export async function createPublishedTree(ctx: Ctx, tree: Tree, changeNote: string, ids: { treeId?: string; versionId?: string } = {}) {
  const treeId = ids.treeId ?? crypto.randomUUID();
  const versionId = ids.versionId ?? crypto.randomUUID();
  const now = new Date();
  await db().transaction(async (tx) => {
    await tx.insert(trees).values({ id: treeId, shopId: ctx.shopId, title: tree.title, category: tree.category, symptom: tree.symptom, createdBy: ctx.userId, updatedAt: now });
    await tx.insert(treeVersions).values({
      id: versionId,
      treeId,
      shopId: ctx.shopId,
      number: 1,
      state: "published",
      ...versionColumns(tree),
      changeNote,
      authorId: ctx.userId,
      updatedAt: now,
      publishedAt: now,
    });
    await writeContent(tx, ctx.shopId, versionId, tree);
  });
  return { treeId, versionId };
}

export async function getVersionRow(ctx: Ctx, versionId: string) {
  const [row] = await db()
    .select()
    .from(treeVersions)
    .where(and(eq(treeVersions.id, versionId), eq(treeVersions.shopId, ctx.shopId)))
    .limit(1);
  return row ?? null;
}

/** A version with its content as the engine's Tree, or null (unknown, or another shop's). */
export async function loadVersion(ctx: Ctx, versionId: string) {
  const version = await getVersionRow(ctx, versionId);
  if (!version) return null;
  const [nodes, branches] = await Promise.all([
    db().select().from(treeNodes).where(eq(treeNodes.versionId, versionId)).orderBy(asc(treeNodes.position)),
    db().select().from(treeBranches).where(eq(treeBranches.versionId, versionId)).orderBy(asc(treeBranches.fromKey), asc(treeBranches.position)),
  ]);
  const tree = rowsToTree(
    { title: version.title, category: version.category, symptom: version.symptom, equipment: version.equipment ?? undefined, description: version.description ?? undefined, start: version.startKey },
    nodes,
    branches,
  );
  return { version, tree, layout: Object.fromEntries(nodes.filter((n) => n.x !== null && n.y !== null).map((n) => [n.nodeKey, { x: n.x!, y: n.y! }])) };
}

/** Replaces a draft's content. Refused for published and retired versions. */
export async function replaceDraftContent(ctx: Ctx, versionId: string, tree: Tree, expectedRevision: number) {
  return db().transaction(async (tx) => {
    const [version] = await tx
      .select()
      .from(treeVersions)
      .where(and(eq(treeVersions.id, versionId), eq(treeVersions.shopId, ctx.shopId)))
      .for("update");
    if (!version) return { ok: false as const, reason: "not-found" as const };
    assertDraft(version);
    if (version.revision !== expectedRevision) return { ok: false as const, reason: "conflict" as const, revision: version.revision };
    await tx.delete(treeBranches).where(eq(treeBranches.versionId, versionId));
    await tx.delete(treeNodes).where(eq(treeNodes.versionId, versionId));
    await writeContent(tx, ctx.shopId, versionId, tree);
    await tx
      .update(treeVersions)
      .set({ ...versionColumns(tree), revision: version.revision + 1, updatedAt: new Date() })
      .where(eq(treeVersions.id, versionId));
    return { ok: true as const, revision: version.revision + 1 };
  });
}

export type PublishedTreeSummary = {
  treeId: string;
  versionId: string;
  number: number;
  title: string;
  category: EquipmentCategory;
  symptom: string;
  publishedAt: Date | null;
};

/** The current published version of each of the shop's trees (retired ones excluded). */
export async function listPublished(ctx: Ctx, filter: { category?: EquipmentCategory } = {}): Promise<PublishedTreeSummary[]> {
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
      publishedAt: treeVersions.publishedAt,
    })
    .from(treeVersions)
    .innerJoin(latest, and(eq(latest.treeId, treeVersions.treeId), eq(latest.n, treeVersions.number)))
    .where(and(eq(treeVersions.shopId, ctx.shopId), filter.category ? eq(treeVersions.category, filter.category) : undefined))
    .orderBy(asc(treeVersions.title));
  return rows.map((r) => ({ ...r, number: r.number ?? 0 }));
}

export async function treeIdsOf(ctx: Ctx): Promise<string[]> {
  const rows = await db().select({ id: trees.id }).from(trees).where(eq(trees.shopId, ctx.shopId)).orderBy(desc(trees.updatedAt));
  return rows.map((r) => r.id);
}

export async function versionsOfTrees(ctx: Ctx, treeIds: string[]) {
  if (!treeIds.length) return [];
  return db()
    .select()
    .from(treeVersions)
    .where(and(eq(treeVersions.shopId, ctx.shopId), inArray(treeVersions.treeId, treeIds)))
    .orderBy(asc(treeVersions.treeId), asc(treeVersions.number));
}
