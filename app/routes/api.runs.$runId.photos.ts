// POST /api/runs/:runId/photos — multipart: photo (the file), key (idempotency UUID), node (the step).
// Refused with a clear message when the content is not an image or is over the cap; nothing is stored then.
import { jsonResult, requireMethod } from "~/lib/api.server";
import { requireUser } from "~/lib/auth.server";
import { apiError, requireSameOrigin } from "~/lib/http.server";
import { readUploadForm } from "~/lib/upload.server";
import { addPhoto, photoFields } from "~/models/photos.server";
import type { Route } from "./+types/api.runs.$runId.photos";

export async function action({ request, params }: Route.ActionArgs) {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const user = await requireUser(request);
  const upload = await readUploadForm(request);
  if (!upload.ok) return apiError(upload.status, upload.message);
  const fields = photoFields.safeParse({ key: upload.form.get("key"), node: upload.form.get("node") });
  if (!fields.success) return apiError(400, fields.error.issues[0]?.message ?? "Say which step the photo is for.");
  const file = upload.form.get("photo");
  if (!(file instanceof Blob)) return apiError(400, "Attach the photo as a file field named “photo”.");
  const result = await addPhoto(user.ctx, params.runId, { ...fields.data, bytes: new Uint8Array(await file.arrayBuffer()) });
  return jsonResult(result, result.ok && !result.replayed ? 201 : 200);
}
