// GET /api/photos/:photoId — the photo's bytes, only for its own shop (another shop's is a 404).
// DELETE removes it while its run is open.
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { api, requireMethod } from "~/lib/route.server";
import { deletePhoto, getPhotoFile } from "~/models/runs/photos.server";
import type { Route } from "./+types/api.photos.$photoId";

export const loader = api(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const file = await getPhotoFile(ctx, params.photoId);
  return new Response(file.body as BodyInit, {
    headers: {
      "content-type": file.contentType,
      "content-length": String(file.body.byteLength),
      "content-disposition": `inline; filename="${file.filename}"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, max-age=86400",
      "content-security-policy": "default-src 'none'; sandbox",
    },
  });
});

export const action = api(async ({ request, params }: Route.ActionArgs) => {
  requireMethod(request, "DELETE");
  requireSameOrigin(request);
  const { ctx } = await requireUser(request);
  await deletePhoto(ctx, params.photoId);
  return Response.json({ ok: true });
});
