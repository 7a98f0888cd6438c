// Object storage for uploaded images (photos on run steps, images in tree steps), through the S3
// API. Production points S3_ENDPOINT at real object storage; start and test run a local fake.
import { DeleteObjectCommand, GetObjectCommand, NoSuchKey, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { fileTypeFromBuffer } from "file-type";
import { env } from "./env.server";

export const MAX_IMAGE_BYTES = 10 * 1024 * 1024;
/** Image types accepted, judged by their content (magic bytes), never by name or declared type. */
export const IMAGE_TYPES: Record<string, string> = {
  "image/jpeg": "jpg",
  "image/png": "png",
  "image/webp": "webp",
  "image/gif": "gif",
  "image/heic": "heic",
  "image/avif": "avif",
};

let client: S3Client | undefined;
function s3(): S3Client {
  const e = env();
  return (client ??= new S3Client({
    endpoint: e.S3_ENDPOINT,
    region: e.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY },
  }));
}

export type ImageCheck = { ok: true; mime: string; ext: string } | { ok: false; message: string; status: 413 | 415 | 400 };

export async function checkImage(bytes: Uint8Array): Promise<ImageCheck> {
  if (bytes.byteLength === 0) return { ok: false, status: 400, message: "The file is empty." };
  if (bytes.byteLength > MAX_IMAGE_BYTES)
    return { ok: false, status: 413, message: `The photo is larger than ${MAX_IMAGE_BYTES / 1024 / 1024} MB. Take it again at a lower resolution.` };
  const type = await fileTypeFromBuffer(bytes);
  const ext = type ? IMAGE_TYPES[type.mime] : undefined;
  // file-type takes any "GIF" prefix for a GIF; the format's signature is GIF87a or GIF89a.
  const badGif = type?.mime === "image/gif" && !/^GIF8[79]a$/.test(new TextDecoder().decode(bytes.subarray(0, 6)));
  if (!type || !ext || badGif) return { ok: false, status: 415, message: "That file is not a photo Cluepath accepts (JPEG, PNG, WebP, GIF, HEIC or AVIF)." };
  return { ok: true, mime: type.mime, ext };
}

/** A server-made key: the shop first, so one shop's objects never share a prefix with another's. */
export function objectKey(shopId: string, kind: string, ext: string): string {
  return `${shopId}/${kind}/${crypto.randomUUID()}.${ext}`;
}

export async function putObject(key: string, body: Uint8Array, contentType: string): Promise<void> {
  await s3().send(new PutObjectCommand({ Bucket: env().S3_BUCKET, Key: key, Body: body, ContentType: contentType }));
}

export async function getObject(key: string): Promise<{ body: Uint8Array; contentType: string } | null> {
  try {
    const res = await s3().send(new GetObjectCommand({ Bucket: env().S3_BUCKET, Key: key }));
    if (!res.Body) return null;
    return { body: await res.Body.transformToByteArray(), contentType: res.ContentType ?? "application/octet-stream" };
  } catch (e) {
    if (e instanceof NoSuchKey || (e as { name?: string }).name === "NoSuchKey") return null;
    throw e;
  }
}

export async function deleteObject(key: string): Promise<void> {
  await s3().send(new DeleteObjectCommand({ Bucket: env().S3_BUCKET, Key: key }));
}
