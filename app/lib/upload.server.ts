// Reading an upload without trusting the client: the body is read up to a cap (plus room for the
// multipart envelope) and refused beyond it, before anything is parsed or stored.
import { Refusal } from "./refusal";
import { MAX_IMAGE_BYTES, TOO_LARGE_PHOTO } from "./uploads";

const ENVELOPE = 64 * 1024;

export type UploadLimits = {
  maxBytes?: number;
  /** What the user reads when the upload is over the cap. */
  tooLarge?: string;
  /** What the user reads when the body is not a multipart form (or is empty). */
  malformed?: string;
};

/** The request's body, read up to `limit` bytes; a Refusal (413) beyond it, before anything is parsed. */
export async function readBody(request: Request, limit: number, messages: { tooLarge: string; empty: string }): Promise<Uint8Array> {
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > limit) throw new Refusal("too-large", messages.tooLarge);
  if (!request.body) throw new Refusal("invalid", messages.empty);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel();
      throw new Refusal("too-large", messages.tooLarge);
    }
    chunks.push(value);
  }
  return Buffer.concat(chunks);
}

/** The multipart form of an upload, read up to the cap; a Refusal (413, or 400) otherwise. */
export async function readUploadForm(request: Request, limits: UploadLimits = {}): Promise<FormData> {
  const {
    maxBytes = MAX_IMAGE_BYTES,
    tooLarge = TOO_LARGE_PHOTO,
    malformed = "Send the photo as a multipart form with a file field named “photo”.",
  } = limits;
  const body = await readBody(request, maxBytes + ENVELOPE, { tooLarge, empty: limits.malformed ?? "The upload was empty." });
  try {
    return await new Response(body as BodyInit, { headers: { "content-type": request.headers.get("content-type") ?? "" } }).formData();
  } catch {
    throw new Refusal("invalid", malformed);
  }
}
