// GET /trees/:treeId/images/:imageId — an image from a tree's step bodies, for signed-in members
// of the tree's shop only (another shop's image is a 404), served inline under its own name.
import { requireUser } from "~/lib/auth.server";
import { api } from "~/lib/route.server";
import { idOf, treeIdOf } from "~/lib/tree-params.server";
import { getTreeImage } from "~/models/trees/images.server";
import type { Route } from "./+types/trees.$treeId.images.$imageId";

export const loader = api(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const image = await getTreeImage(ctx, treeIdOf(params), idOf(params.imageId, "That image"));
  return new Response(image.body as BodyInit, {
    headers: {
      "content-type": image.mime,
      "content-disposition": `inline; filename="${image.filename.replace(/"/g, "")}"`,
      "cache-control": "private, max-age=86400, immutable",
      "x-content-type-options": "nosniff",
      "content-security-policy": "default-src 'none'",
    },
  });
});
