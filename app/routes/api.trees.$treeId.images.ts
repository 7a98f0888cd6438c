// POST /api/trees/:treeId/images — multipart with the image as the "photo" field; stored for the
// tree's step bodies. 201 { id, url, filename }; 413 / 415 when too large or not an image.
import { jsonResult, requireMethod } from "~/lib/api.server";
import { requireRole } from "~/lib/auth.server";
import { apiError, requireSameOrigin } from "~/lib/http.server";
import { treeIdOf } from "~/lib/tree-params.server";
import { readUploadForm } from "~/lib/upload.server";
import { addTreeImage } from "~/models/trees.server";
import type { Route } from "./+types/api.trees.$treeId.images";

export async function action({ request, params }: Route.ActionArgs) {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const user = await requireRole(request, ["lead"]);
  const treeId = treeIdOf(params);
  const upload = await readUploadForm(request);
  if (!upload.ok) return apiError(upload.status, upload.message);
  const file = upload.form.get("photo");
  if (!(file instanceof File)) return apiError(400, "Attach the image as a file field named “photo”.");
  const result = await addTreeImage(user.ctx, treeId, new Uint8Array(await file.arrayBuffer()), file.name);
  if (!result.ok) return apiError(result.status, result.message);
  return jsonResult(result, 201);
}
