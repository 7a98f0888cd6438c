// POST /api/runs/:runId/photos — multipart: photo (the file), key (idempotency UUID), node (the step),
// at (the phone's clock when it was taken, optional).
// Refused with a clear message when the content is not an image or is over the cap; nothing is stored then.
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { Refusal } from "~/lib/refusal";
import { api, requireMethod } from "~/lib/route.server";
import { readUploadForm } from "~/lib/upload.server";
import { addPhoto, photoFields } from "~/models/runs/photos.server";
import type { Route } from "./+types/api.runs.$runId.photos";

export const action = api(async ({ request, params }: Route.ActionArgs) => {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const { ctx } = await requireUser(request);
  const form = await readUploadForm(request);
  const fields = photoFields.safeParse({ key: form.get("key"), node: form.get("node"), at: form.get("at") });
  if (!fields.success) throw new Refusal("invalid", fields.error.issues[0]?.message ?? "Say which step the photo is for.");
  const file = form.get("photo");
  if (!(file instanceof Blob)) throw new Refusal("invalid", "Attach the photo as a file field named “photo”.");
  const result = await addPhoto(ctx, params.runId, { ...fields.data, bytes: new Uint8Array(await file.arrayBuffer()) });
  return Response.json({ ok: true, ...result }, { status: result.replayed ? 200 : 201 });
});
