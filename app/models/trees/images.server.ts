// Images in step bodies: checked by content, kept in object storage under a server-made key, and
// served only to the tree's own shop.
import { and, eq } from "drizzle-orm";
import { treeImages, trees } from "../../../db/schema";
import type { Ctx } from "../../lib/context";
import { db } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { notFound } from "../../lib/refusal";
import { checkImage, getObject, objectKey, putObject } from "../../lib/storage.server";
import { treeImageUrl } from "../../lib/tree-library";

/** Stores an image for a tree's step bodies: checked by content, kept under a server-made key. */
export async function addTreeImage(ctx: Ctx, treeId: string, bytes: Uint8Array, filename: string): Promise<{ id: string; url: string; filename: string }> {
  authorize(ctx, "trees.author");
  const [tree] = await db()
    .select({ id: trees.id })
    .from(trees)
    .where(and(eq(trees.id, treeId), eq(trees.shopId, ctx.shopId)))
    .limit(1);
  if (!tree) notFound("That tree");
  const check = await checkImage(bytes);
  const key = objectKey(ctx.shopId, "tree-images", check.ext);
  await putObject(key, bytes, check.mime);
  const id = crypto.randomUUID();
  const name = filename.replace(/[^\w .()-]+/g, "_").slice(0, 200) || `image.${check.ext}`;
  await db().insert(treeImages).values({ id, shopId: ctx.shopId, treeId, objectKey: key, mime: check.mime, bytes: bytes.byteLength, filename: name, createdBy: ctx.userId });
  return { id, url: treeImageUrl(treeId, id), filename: name };
}

/** An image of one of the shop's trees, with its bytes. */
export async function getTreeImage(ctx: Ctx, treeId: string, imageId: string): Promise<{ body: Uint8Array; mime: string; filename: string }> {
  authorize(ctx, "trees.view");
  const [row] = await db()
    .select()
    .from(treeImages)
    .where(and(eq(treeImages.id, imageId), eq(treeImages.treeId, treeId), eq(treeImages.shopId, ctx.shopId)))
    .limit(1);
  const object = row ? await getObject(row.objectKey) : null;
  if (!row || !object) notFound("That image");
  return { body: object.body, mime: row.mime, filename: row.filename };
}
