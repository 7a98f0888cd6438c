// POST /api/trees/:treeId/images — multipart with the image as the "photo" field; stored for the
// tree's step bodies. 201 { id, url, filename }; 413 / 415 when too large or not an image.
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { Refusal } from "~/lib/refusal";
import { api, requireMethod } from "~/lib/route.server";
import { treeIdOf } from "~/lib/tree-params.server";
import { readUploadForm } from "~/lib/upload.server";
import { addTreeImage } from "~/models/trees/images.server";
import type { Route } from "./+types/api.trees.$treeId.images";

export const action = api(async ({ request, params }: Route.ActionArgs) => {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const { ctx } = await requireUser(request, "trees.author");
  const treeId = treeIdOf(params);
  const form = await readUploadForm(request);
  const file = form.get("photo");
  if (!(file instanceof File)) throw new Refusal("invalid", "Attach the image as a file field named “photo”.");
  const added = await addTreeImage(ctx, treeId, new Uint8Array(await file.arrayBuffer()), file.name);
  return Response.json({ ok: true, ...added }, { status: 201 });
});
