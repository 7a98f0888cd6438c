// The tree version a run walks, with its step bodies as safe blocks. Published versions never
// change, so each process caches them by version id (checked against the shop, bounded). Used by
// the run models only.
import { and, desc, eq } from "drizzle-orm";
import { treeVersions, type RunStatus } from "../../../db/schema";
import type { Tree, TreeNode } from "../../engine/types";
import type { Ctx } from "../../lib/context";
import { db, type Db, type Tx } from "../../lib/db.server";
import type { MdBlock } from "../../lib/md";
import { markdownBlocks } from "../../lib/md.server";
import { Refusal } from "../../lib/refusal";
import { versionById } from "../trees/_content.server";

/** A run is open while it can still take steps or be taken over. */
export const OPEN: RunStatus[] = ["active", "paused", "escalated"];

export type VersionContent = {
  shopId: string;
  versionId: string;
  treeId: string;
  number: number | null;
  title: string;
  tree: Tree;
  bodies: Record<string, MdBlock[]>;
  description: MdBlock[];
};
const versionCache = new Map<string, VersionContent>();

/**
 * A run's tree version with its step bodies as safe blocks (cached: published versions never
 * change). Read on `q`, so a transaction reads it on its own connection.
 */
export async function versionContent(ctx: Ctx, versionId: string, q: Tx | Db = db()): Promise<VersionContent> {
  const hit = versionCache.get(versionId);
  if (hit && hit.shopId === ctx.shopId) return hit;
  const loaded = await versionById(ctx, versionId, q);
  if (!loaded) throw new Refusal("not-found", "The run's tree version was not found.");
  const content: VersionContent = {
    shopId: ctx.shopId,
    versionId,
    treeId: loaded.version.treeId,
    number: loaded.version.number,
    title: loaded.version.title,
    tree: loaded.tree,
    bodies: Object.fromEntries(loaded.tree.nodes.map((n) => [n.id, markdownBlocks(n.body)])),
    description: markdownBlocks(loaded.tree.description),
  };
  if (loaded.version.state !== "draft") {
    if (versionCache.size > 500) versionCache.clear();
    versionCache.set(versionId, content);
  }
  return content;
}

export function nodeOf(tree: Tree | undefined, id: string | null | undefined): TreeNode | undefined {
  return id && tree ? tree.nodes.find((n) => n.id === id) : undefined;
}

/** The newest published version of one of the shop's trees. */
export async function currentPublished(ctx: Ctx, treeId: string, tx: Tx | Db = db()) {
  const [row] = await tx
    .select({ id: treeVersions.id, number: treeVersions.number })
    .from(treeVersions)
    .where(and(eq(treeVersions.treeId, treeId), eq(treeVersions.shopId, ctx.shopId), eq(treeVersions.state, "published")))
    .orderBy(desc(treeVersions.number))
    .limit(1);
  return row ?? null;
}
