// GET /api/photos/:photoId — the photo's bytes, only for its own shop (another shop's is a 404).
// DELETE removes it while its run is open.
import { jsonResult, requireMethod } from "~/lib/api.server";
import { requireUser } from "~/lib/auth.server";
import { notFound, requireSameOrigin } from "~/lib/http.server";
import { deletePhoto, getPhotoFile } from "~/models/photos.server";
import type { Route } from "./+types/api.photos.$photoId";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const file = await getPhotoFile(user.ctx, params.photoId);
  if (!file) notFound("That photo");
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
}

export async function action({ request, params }: Route.ActionArgs) {
  requireMethod(request, "DELETE");
  requireSameOrigin(request);
  const user = await requireUser(request);
  return jsonResult(await deletePhoto(user.ctx, params.photoId));
}
