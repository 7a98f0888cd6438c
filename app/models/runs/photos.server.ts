// Photos on run steps: checked by content (magic bytes), capped in size, stored in object storage
// under a server-made key that starts with the shop, and served only to the run's own shop.
import { and, eq, isNull } from "drizzle-orm";
import { z } from "zod";
import { runPhotos, runs } from "../../db/schema";
import type { Ctx } from "../lib/context";
import { db } from "../lib/db.server";
import { checkImage, deleteObject, getObject, objectKey, putObject } from "../lib/storage.server";
import type { PhotoView } from "./run-log";
import { photoUrl } from "./runs.server";

export const photoFields = z.object({ key: z.string().uuid("Each photo needs an idempotency key (a UUID)."), node: z.string().min(1).max(64) });

export type PhotoResult = { ok: true; replayed: boolean; photo: PhotoView } | { ok: false; status: 400 | 403 | 404 | 409 | 413 | 415 | 422; message: string };

const view = (p: typeof runPhotos.$inferSelect): PhotoView => ({ id: p.id, key: p.idempotencyKey, node: p.nodeKey, url: photoUrl(p.id), bytes: p.bytes, createdAt: p.createdAt.toISOString() });

export async function addPhoto(ctx: Ctx, runId: string, input: { key: string; node: string; bytes: Uint8Array }): Promise<PhotoResult> {
  const [run] = await db()
    .select({ id: runs.id, technicianId: runs.technicianId, status: runs.status })
    .from(runs)
    .where(and(eq(runs.id, runId), eq(runs.shopId, ctx.shopId)))
    .limit(1);
  if (!run) return { ok: false, status: 404, message: "That run was not found." };
  const [existing] = await db()
    .select()
    .from(runPhotos)
    .where(and(eq(runPhotos.runId, runId), eq(runPhotos.idempotencyKey, input.key)))
    .limit(1);
  if (existing) {
    if (existing.bytes !== input.bytes.byteLength || existing.nodeKey !== input.node)
      return { ok: false, status: 422, message: "This idempotency key was already used for a different photo." };
    return { ok: true, replayed: true, photo: view(existing) };
  }
  if (run.technicianId !== ctx.userId) return { ok: false, status: 403, message: "Only the technician holding this run can add photos." };
  if (run.status !== "active" && run.status !== "paused" && run.status !== "escalated") return { ok: false, status: 409, message: "This run is closed." };
  const check = await checkImage(input.bytes);
  if (!check.ok) return { ok: false, status: check.status, message: check.message };
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
    createdAt: new Date(),
    deletedAt: null,
  };
  try {
    await db().insert(runPhotos).values(row);
  } catch (e) {
    await deleteObject(key).catch(() => undefined);
    throw e;
  }
  return { ok: true, replayed: false, photo: view(row) };
}

async function photoRow(ctx: Ctx, photoId: string) {
  const [row] = await db()
    .select()
    .from(runPhotos)
    .where(and(eq(runPhotos.id, photoId), eq(runPhotos.shopId, ctx.shopId), isNull(runPhotos.deletedAt)))
    .limit(1);
  return row ?? null;
}

/** The photo's bytes, for the caller's own shop only. */
export async function getPhotoFile(ctx: Ctx, photoId: string) {
  const row = await photoRow(ctx, photoId);
  if (!row) return null;
  const object = await getObject(row.objectKey);
  if (!object) return null;
  return { body: object.body, contentType: row.contentType, filename: `photo-${row.id.slice(0, 8)}.${row.objectKey.split(".").pop()}` };
}

export async function deletePhoto(ctx: Ctx, photoId: string): Promise<{ ok: true } | { ok: false; status: 403 | 404 | 409; message: string }> {
  const row = await photoRow(ctx, photoId);
  if (!row) return { ok: false, status: 404, message: "That photo was not found." };
  const [run] = await db().select({ technicianId: runs.technicianId, status: runs.status }).from(runs).where(eq(runs.id, row.runId));
  if (run?.technicianId !== ctx.userId) return { ok: false, status: 403, message: "Only the technician holding this run can remove its photos." };
  if (run.status === "done" || run.status === "abandoned") return { ok: false, status: 409, message: "This run is closed; its photos stay with its report." };
  await db().update(runPhotos).set({ deletedAt: new Date() }).where(eq(runPhotos.id, photoId));
  await deleteObject(row.objectKey).catch(() => undefined);
  return { ok: true };
}

/** Photos of a run with their bytes (for the e-mailed report), up to a total size. */
export async function photosWithBytes(ctx: Ctx, runId: string, maxTotal = 15 * 1024 * 1024) {
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
