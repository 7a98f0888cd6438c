// Photos on run steps: checked by content (magic bytes), capped in size, stored in object storage
// under a server-made key that starts with the shop, and served only to the run's own shop.
import { and, eq, isNull } from "drizzle-orm";
import { z } from "zod";
import { runPhotos, runs } from "../../../db/schema";
import type { Ctx } from "../../lib/context";
import { db } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { notFound, Refusal } from "../../lib/refusal";
import { photoUrl, type PhotoView } from "../../lib/run-log";
import { checkImage, deleteObject, getObject, objectKey, putObject } from "../../lib/storage.server";
import { isDuplicate } from "../_query.server";
import { nodeOf, OPEN, versionContent } from "./_version.server";

export const photoFields = z.object({
  key: z.string().uuid("Each photo needs an idempotency key (a UUID)."),
  node: z.string().min(1).max(64),
  /** The phone's clock when the photo was taken. */
  at: z.iso.datetime({ offset: true }).nullish(),
});

const view = (p: typeof runPhotos.$inferSelect): PhotoView => ({
  id: p.id,
  key: p.idempotencyKey,
  node: p.nodeKey,
  url: photoUrl(p.id),
  bytes: p.bytes,
  createdAt: p.createdAt.toISOString(),
});

/** The stored photo under this key, as a replay; a refusal when the key was used for another photo. */
function replayOf(
  existing: typeof runPhotos.$inferSelect,
  input: { node: string; bytes: Uint8Array },
): { replayed: true; photo: PhotoView } {
  if (existing.bytes !== input.bytes.byteLength || existing.nodeKey !== input.node)
    throw new Refusal("rejected", "This idempotency key was already used for a different photo.", { code: "key-reused" });
  return { replayed: true, photo: view(existing) };
}

async function photoByKey(runId: string, key: string) {
  const [row] = await db()
    .select()
    .from(runPhotos)
    .where(and(eq(runPhotos.runId, runId), eq(runPhotos.idempotencyKey, key)))
    .limit(1);
  return row;
}

/**
 * Adds a photo to a step of the run's tree. The same key again answers with the stored photo
 * (`replayed`), also when both uploads arrive at once: the unique key decides which one is stored,
 * and the other's object is removed before it answers with the winner's photo.
 */
export async function addPhoto(
  ctx: Ctx,
  runId: string,
  input: { key: string; node: string; bytes: Uint8Array; at?: string | null },
): Promise<{ replayed: boolean; photo: PhotoView }> {
  authorize(ctx, "runs.view");
  const [run] = await db()
    .select({ id: runs.id, technicianId: runs.technicianId, status: runs.status, versionId: runs.versionId })
    .from(runs)
    .where(and(eq(runs.id, runId), eq(runs.shopId, ctx.shopId)))
    .limit(1);
  if (!run) notFound("That run");
  const existing = await photoByKey(runId, input.key);
  if (existing) return replayOf(existing, input);
  authorize(ctx, "runs.photo", { holder: run.technicianId === ctx.userId });
  if (!OPEN.includes(run.status)) throw new Refusal("conflict", "This run is closed.", { code: "closed" });
  if (!nodeOf((await versionContent(ctx, run.versionId)).tree, input.node))
    throw new Refusal("rejected", "That step is not in this run's tree.");
  const check = await checkImage(input.bytes);
  const key = objectKey(ctx.shopId, "run-photos", check.ext);
  await putObject(key, input.bytes, check.mime);
  const row = {
    id: crypto.randomUUID(),
    runId,
    shopId: ctx.shopId,
    nodeKey: input.node,
    idempotencyKey: input.key,
    objectKey: key,
    contentType: check.mime,
    bytes: input.bytes.byteLength,
    uploadedBy: ctx.userId,
    clientAt: input.at ? new Date(input.at) : null,
    createdAt: new Date(),
    deletedAt: null,
  };
  try {
    await db().insert(runPhotos).values(row);
  } catch (e) {
    await deleteObject(key).catch(() => undefined);
    const winner = isDuplicate(e) ? await photoByKey(runId, input.key) : undefined;
    if (winner) return replayOf(winner, input);
    throw e;
  }
  return { replayed: false, photo: view(row) };
}

async function photoRow(ctx: Ctx, photoId: string) {
  const [row] = await db()
    .select()
    .from(runPhotos)
    .where(and(eq(runPhotos.id, photoId), eq(runPhotos.shopId, ctx.shopId), isNull(runPhotos.deletedAt)))
    .limit(1);
  return row ?? notFound("That photo");
}

/** The photo's bytes, for the caller's own shop only. */
export async function getPhotoFile(ctx: Ctx, photoId: string): Promise<{ body: Uint8Array; contentType: string; filename: string }> {
  authorize(ctx, "runs.view");
  const row = await photoRow(ctx, photoId);
  const object = (await getObject(row.objectKey)) ?? notFound("That photo");
  return { body: object.body, contentType: row.contentType, filename: `photo-${row.id.slice(0, 8)}.${row.objectKey.split(".").pop()}` };
}

/** Removes a photo while its run is open (the technician holding the run only). */
export async function deletePhoto(ctx: Ctx, photoId: string): Promise<void> {
  authorize(ctx, "runs.view");
  const row = await photoRow(ctx, photoId);
  const [run] = await db().select({ technicianId: runs.technicianId, status: runs.status }).from(runs).where(eq(runs.id, row.runId));
  authorize(ctx, "runs.photo", { holder: run?.technicianId === ctx.userId });
  if (!run || run.status === "done" || run.status === "abandoned")
    throw new Refusal("conflict", "This run is closed; its photos stay with its report.");
  await db().update(runPhotos).set({ deletedAt: new Date() }).where(eq(runPhotos.id, photoId));
  await deleteObject(row.objectKey).catch(() => undefined);
}

/** Photos of a run with their bytes (for the e-mailed report), up to a total size. */
export async function photosWithBytes(ctx: Ctx, runId: string, maxTotal = 15 * 1024 * 1024) {
  authorize(ctx, "reports.view");
  const rows = await db()
    .select()
    .from(runPhotos)
    .where(and(eq(runPhotos.runId, runId), eq(runPhotos.shopId, ctx.shopId), isNull(runPhotos.deletedAt)));
  const out: { id: string; node: string; contentType: string; body: Uint8Array; ext: string }[] = [];
  let total = 0;
  let left = 0;
  for (const r of rows) {
    if (total + r.bytes > maxTotal) {
      left++;
      continue;
    }
    const object = await getObject(r.objectKey);
    if (!object) continue;
    total += r.bytes;
    out.push({ id: r.id, node: r.nodeKey, contentType: r.contentType, body: object.body, ext: r.objectKey.split(".").pop() ?? "jpg" });
  }
  return { photos: out, left };
}
