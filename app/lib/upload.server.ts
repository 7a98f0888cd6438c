// Reading an upload without trusting the client: the body is read up to a cap (plus room for the
// multipart envelope) and refused beyond it, before anything is parsed or stored.
import { MAX_IMAGE_BYTES } from "./storage.server";

const ENVELOPE = 64 * 1024;

export type UploadForm = { ok: true; form: FormData } | { ok: false; status: 400 | 413; message: string };

const tooBig = (): UploadForm => ({ ok: false, status: 413, message: `The photo is larger than ${MAX_IMAGE_BYTES / 1024 / 1024} MB. Take it again at a lower resolution.` });

export async function readUploadForm(request: Request, maxBytes = MAX_IMAGE_BYTES): Promise<UploadForm> {
  const limit = maxBytes + ENVELOPE;
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > limit) return tooBig();
  if (!request.body) return { ok: false, status: 400, message: "The upload was empty." };
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel();
      return tooBig();
    }
    chunks.push(value);
  }
  try {
    const form = await new Response(new Blob(chunks as BlobPart[]), { headers: { "content-type": request.headers.get("content-type") ?? "" } }).formData();
    return { ok: true, form };
  } catch {
    return { ok: false, status: 400, message: "Send the photo as a multipart form with a file field named “photo”." };
  }
}
