// GET /api/trees/:treeId/versions/:ref — one version's content (the engine's Tree) and canvas
// layout; :ref is a version number, or "draft" (leads and owners only).
import { requireUser } from "~/lib/auth.server";
import { api } from "~/lib/route.server";
import { treeIdOf, versionRefOf } from "~/lib/tree-params.server";
import { loadTreeVersion } from "~/models/trees/versions.server";
import type { Route } from "./+types/api.trees.$treeId.versions.$ref";

export const loader = api(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const v = await loadTreeVersion(ctx, treeIdOf(params), versionRefOf(params.ref));
  const { version } = v;
  return Response.json(
    {
      versionId: version.id,
      number: version.number,
      state: version.state,
      revision: version.revision,
      changeNote: version.changeNote,
      publishedAt: version.publishedAt,
      retiredAt: version.retiredAt,
      updatedAt: version.updatedAt,
      tree: v.tree,
      layout: v.layout,
    },
    { headers: { "cache-control": "private, no-store" } },
  );
});
