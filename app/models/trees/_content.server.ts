// A tree version's content as rows, and the guard every content write goes through. Published and
// retired versions never change their content: every write goes through a draft, and assertDraft
// refuses the rest. Used by the other tree models only.
import { and, asc, eq } from "drizzle-orm";
import { treeBranches, treeNodes, trees, treeVersions, type VersionState } from "../../../db/schema";
import type { Tree } from "../../engine/types";
import type { Ctx } from "../../lib/context";
import { db, type Db, type Tx } from "../../lib/db.server";
import { Refusal } from "../../lib/refusal";
import { rowsToTree, treeToRows } from "../../lib/tree-rows";
import { lockOwn } from "../_query.server";

/** Where the editor's canvas shows each node, by node id. */
export type Layout = Record<string, { x: number; y: number }>;

export type VersionRow = typeof treeVersions.$inferSelect;

/** The guard every write to a version's content goes through: only a draft changes. */
export function assertDraft(version: { state: VersionState }): void {
  if (version.state !== "draft") {
    throw new Refusal("gone", `This draft has been ${version.state === "retired" ? "published and retired" : "published"} meanwhile, so it can't change any more.`);
  }
}

export async function writeContent(tx: Tx, shopId: string, versionId: string, tree: Tree, layout: Layout = {}) {
  const { nodes, branches } = treeToRows(tree);
  if (nodes.length) {
    await tx.insert(treeNodes).values(nodes.map((n) => ({ ...n, versionId, shopId, x: layout[n.nodeKey]?.x ?? null, y: layout[n.nodeKey]?.y ?? null })));
  }
  if (branches.length) await tx.insert(treeBranches).values(branches.map((b) => ({ ...b, versionId, shopId })));
}

export async function deleteContent(tx: Tx, versionId: string) {
  await tx.delete(treeBranches).where(eq(treeBranches.versionId, versionId));
  await tx.delete(treeNodes).where(eq(treeNodes.versionId, versionId));
}

export async function readContent(tx: Tx | Db, version: VersionRow): Promise<{ tree: Tree; layout: Layout }> {
  const [nodes, branches] = await Promise.all([
    tx.select().from(treeNodes).where(eq(treeNodes.versionId, version.id)).orderBy(asc(treeNodes.position)),
    tx.select().from(treeBranches).where(eq(treeBranches.versionId, version.id)).orderBy(asc(treeBranches.fromKey), asc(treeBranches.position)),
  ]);
  const tree = rowsToTree(
    { title: version.title, category: version.category, symptom: version.symptom, equipment: version.equipment ?? undefined, description: version.description ?? undefined, start: version.startKey },
    nodes,
    branches,
  );
  const layout: Layout = {};
  for (const n of nodes) if (n.x !== null && n.y !== null) layout[n.nodeKey] = { x: n.x, y: n.y };
  return { tree, layout };
}

/** One of the shop's versions by id with its content, read on `q` (a transaction's own connection inside one). */
export async function versionById(ctx: Ctx, versionId: string, q: Tx | Db = db()) {
  const [version] = await q
    .select()
    .from(treeVersions)
    .where(and(eq(treeVersions.id, versionId), eq(treeVersions.shopId, ctx.shopId)))
    .limit(1);
  return version ? { version, ...(await readContent(q, version)) } : null;
}

export function versionColumns(tree: Tree) {
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

type VersionInsert = typeof treeVersions.$inferInsert;

/** Inserts a version of `treeId` with its content; `fields` say what kind (draft or published). */
export async function insertVersion(tx: Tx, ctx: Ctx, treeId: string, content: Tree, fields: Partial<VersionInsert> & Pick<VersionInsert, "state">, layout: Layout = {}) {
  const id = fields.id ?? crypto.randomUUID();
  await tx.insert(treeVersions).values({
    treeId,
    shopId: ctx.shopId,
    ...versionColumns(content),
    authorId: ctx.userId,
    updatedBy: ctx.userId,
    updatedAt: new Date(),
    ...fields,
    id,
  });
  await writeContent(tx, ctx.shopId, id, content, layout);
  return id;
}

/** A new open draft of `treeId` (the unique index refuses a second one). */
export function insertDraft(tx: Tx, ctx: Ctx, treeId: string, content: Tree, basedOnId: string | null, layout: Layout = {}) {
  return insertVersion(tx, ctx, treeId, content, { state: "draft", number: null, basedOnId, openDraftOf: treeId }, layout);
}

export async function insertTree(tx: Tx, ctx: Ctx, tree: Tree, id: string = crypto.randomUUID()) {
  await tx.insert(trees).values({ id, shopId: ctx.shopId, title: tree.title, category: tree.category, symptom: tree.symptom, createdBy: ctx.userId, updatedAt: new Date() });
  return id;
}

/** Locks one of the shop's trees for the transaction; a not-found refusal otherwise. */
export async function lockTree(tx: Tx, ctx: Ctx, treeId: string) {
  const tree = await lockOwn(tx, ctx, trees, treeId);
  if (!tree) throw new Refusal("not-found", "That tree was not found.");
  return tree;
}

/** Marks the tree as changed now (the library sorts by it). */
export async function touchTree(tx: Tx, treeId: string, at = new Date()) {
  await tx.update(trees).set({ updatedAt: at }).where(eq(trees.id, treeId));
}
