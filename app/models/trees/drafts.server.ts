// Making trees and working on their drafts: a new tree, the one open draft per tree (copied from a
// published version, never touching it), the editor's autosave with optimistic concurrency, and
// throwing a draft away. Leads and owners only.
import { and, eq } from "drizzle-orm";
import { treeImages, trees, treeVersions, users } from "../../../db/schema";
import type { Tree } from "../../engine/types";
import type { Ctx } from "../../lib/context";
import { writeTx, type Tx } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { Refusal } from "../../lib/refusal";
import { lockOwn } from "../_query.server";
import { assertDraft, deleteContent, insertDraft, insertTree, insertVersion, lockTree, readContent, touchTree, versionColumns, writeContent, type Layout } from "./_content.server";

export type { Layout };

/** Creates a tree with its first version published (the seed's starter trees). Returns the ids. */
export async function createPublishedTree(ctx: Ctx, tree: Tree, changeNote: string, ids: { treeId?: string; versionId?: string } = {}) {
  authorize(ctx, "trees.author");
  return writeTx(async (tx) => {
    const treeId = await insertTree(tx, ctx, tree, ids.treeId);
    const now = new Date();
    const versionId = await insertVersion(tx, ctx, treeId, tree, { id: ids.versionId, state: "published", number: 1, changeNote, publishedBy: ctx.userId, publishedAt: now, updatedAt: now });
    return { treeId, versionId };
  });
}

/** A new tree whose only version is a draft (a tree made in the editor, or an imported file). */
export async function createDraftTree(ctx: Ctx, tree: Tree, layout: Layout = {}) {
  authorize(ctx, "trees.author");
  return writeTx(async (tx) => {
    const treeId = await insertTree(tx, ctx, tree);
    const versionId = await insertDraft(tx, ctx, treeId, tree, null, layout);
    return { treeId, versionId };
  });
}

/**
 * Opens the tree's draft: the one already open, or a new one copied from version `fromNumber`
 * (default: the newest numbered version). Published versions are copied, never touched.
 */
export async function startDraft(ctx: Ctx, treeId: string, fromNumber?: number): Promise<{ versionId: string; existing: boolean }> {
  authorize(ctx, "trees.author");
  return writeTx(async (tx) => {
    await lockTree(tx, ctx, treeId);
    const versions = await tx.select().from(treeVersions).where(and(eq(treeVersions.treeId, treeId), eq(treeVersions.shopId, ctx.shopId)));
    const open = versions.find((v) => v.state === "draft");
    if (open) return { versionId: open.id, existing: true };
    const numbered = versions.filter((v) => v.number !== null).sort((a, z) => z.number! - a.number!);
    const from = fromNumber === undefined ? numbered[0] : numbered.find((v) => v.number === fromNumber);
    if (!from) throw new Refusal("not-found", "That version was not found.");
    const { tree: content, layout } = await readContent(tx, from);
    const versionId = await insertDraft(tx, ctx, treeId, content, from.id, layout);
    await touchTree(tx, treeId);
    return { versionId, existing: false };
  });
}

/**
 * Replaces a draft's content (the editor's autosave). Optimistic concurrency: the save names the
 * revision it was based on; if another save came first, nothing is written and the refusal
 * (`conflict`) carries the newer revision and who saved it. A version that has been published or
 * retired meanwhile is `gone`. With `treeId`, the draft must be that tree's.
 */
export async function replaceDraftContent(ctx: Ctx, versionId: string, tree: Tree, expectedRevision: number, opts: { layout?: Layout; treeId?: string } = {}): Promise<{ revision: number; updatedAt: Date }> {
  authorize(ctx, "trees.author");
  return writeTx(async (tx) => {
    // The tree's row first, then the version's: the order publishing takes them (docs/decisions/0240).
    const treeId = opts.treeId ?? (await treeOfVersion(tx, ctx, versionId));
    if (!treeId) throw new Refusal("not-found", "That draft was not found.");
    await lockTree(tx, ctx, treeId);
    const version = await lockOwn(tx, ctx, treeVersions, versionId);
    if (!version || version.treeId !== treeId) throw new Refusal("not-found", "That draft was not found.");
    assertDraft(version);
    if (version.revision !== expectedRevision) {
      const [who] = version.updatedBy ? await tx.select({ name: users.name }).from(users).where(eq(users.id, version.updatedBy)) : [];
      const updatedByName = who?.name ?? null;
      throw new Refusal("conflict", `${updatedByName ?? "Someone"} saved this draft after you opened it. Nothing was saved; your changes are kept in your editor.`, {
        details: { conflict: { revision: version.revision, updatedByName, updatedAt: version.updatedAt } },
      });
    }
    await deleteContent(tx, versionId);
    await writeContent(tx, ctx.shopId, versionId, tree, opts.layout);
    const now = new Date();
    await tx
      .update(treeVersions)
      .set({ ...versionColumns(tree), revision: version.revision + 1, updatedAt: now, updatedBy: ctx.userId })
      .where(eq(treeVersions.id, versionId));
    await touchTree(tx, version.treeId, now);
    return { revision: version.revision + 1, updatedAt: now };
  });
}

/** The tree a version of the shop belongs to (a plain read: a version never changes tree). */
async function treeOfVersion(tx: Tx, ctx: Ctx, versionId: string): Promise<string | null> {
  const [row] = await tx
    .select({ treeId: treeVersions.treeId })
    .from(treeVersions)
    .where(and(eq(treeVersions.id, versionId), eq(treeVersions.shopId, ctx.shopId)))
    .limit(1);
  return row?.treeId ?? null;
}

/** Throws away the tree's open draft. A tree that never had a published version goes with it. */
export async function discardDraft(ctx: Ctx, treeId: string): Promise<{ treeDeleted: boolean }> {
  authorize(ctx, "trees.author");
  return writeTx(async (tx) => {
    await lockTree(tx, ctx, treeId);
    const versions = await tx.select().from(treeVersions).where(eq(treeVersions.treeId, treeId));
    const draft = versions.find((v) => v.state === "draft");
    if (!draft) throw new Refusal("not-found", "There is no open draft to discard.");
    assertDraft(draft);
    await deleteContent(tx, draft.id);
    await tx.delete(treeVersions).where(and(eq(treeVersions.id, draft.id), eq(treeVersions.state, "draft")));
    const treeDeleted = versions.length === 1;
    if (treeDeleted) {
      await tx.delete(treeImages).where(eq(treeImages.treeId, treeId));
      await tx.delete(trees).where(eq(trees.id, treeId));
    }
    return { treeDeleted };
  });
}
