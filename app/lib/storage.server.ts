// Object storage for uploaded images (photos on run steps, images in tree steps), through the S3
// API. Production points S3_ENDPOINT at real object storage; start and test run a local fake.
import { DeleteObjectCommand, GetObjectCommand, NoSuchKey, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { fileTypeFromBuffer } from "file-type";
import { env } from "./env.server";
import { Refusal } from "./refusal";
import { MAX_IMAGE_BYTES, TOO_LARGE_PHOTO } from "./uploads";
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
/** The one S3 client of this process (the tests' storage checks list objects through it too). */
export function s3(): S3Client {
  const e = env();
  return (client ??= new S3Client({
    endpoint: e.S3_ENDPOINT,
    region: e.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY },
  }));
}

/** The image's type and file extension, judged by its bytes; a Refusal when it is empty, too large or not an image. */
export async function checkImage(bytes: Uint8Array): Promise<{ mime: string; ext: string }> {
  if (bytes.byteLength === 0) throw new Refusal("invalid", "The file is empty.");
  if (bytes.byteLength > MAX_IMAGE_BYTES) throw new Refusal("too-large", TOO_LARGE_PHOTO);
  const type = await fileTypeFromBuffer(bytes);
  const ext = type ? IMAGE_TYPES[type.mime] : undefined;
  // file-type takes any "GIF" prefix for a GIF; the format's signature is GIF87a or GIF89a.
  const badGif = type?.mime === "image/gif" && !/^GIF8[79]a$/.test(new TextDecoder().decode(bytes.subarray(0, 6)));
  if (!type || !ext || badGif)
    throw new Refusal("wrong-type", "That file is not a photo Cluepath accepts (JPEG, PNG, WebP, GIF, HEIC or AVIF).");
  return { mime: type.mime, ext };
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
