// GET /api/trees/:treeId/versions/:ref — one version's content (the engine's Tree) and canvas
// layout; :ref is a version number, or "draft" (leads and owners only).
import { requireRole, requireUser } from "~/lib/auth.server";
import { orNotFound } from "~/lib/http.server";
import { treeIdOf, versionRefOf } from "~/lib/tree-params.server";
import { loadTreeVersion } from "~/models/trees.server";
import type { Route } from "./+types/api.trees.$treeId.versions.$ref";

export async function loader({ request, params }: Route.LoaderArgs) {
  const ref = versionRefOf(params.ref);
  const user = ref === "draft" ? await requireRole(request, ["lead"]) : await requireUser(request);
  const v = orNotFound(await loadTreeVersion(user.ctx, treeIdOf(params), ref), "That version");
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
}
