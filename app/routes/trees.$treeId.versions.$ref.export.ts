// GET /trees/:treeId/versions/:ref/export — the version as a tree file in the engine's canonical
// Markdown form, as a download. The draft is for leads and owners only.
import { requireRole, requireUser } from "~/lib/auth.server";
import { orNotFound } from "~/lib/http.server";
import { treeIdOf, versionRefOf } from "~/lib/tree-params.server";
import { exportVersion } from "~/models/trees.server";
import type { Route } from "./+types/trees.$treeId.versions.$ref.export";

export async function loader({ request, params }: Route.LoaderArgs) {
  const ref = versionRefOf(params.ref);
  const user = ref === "draft" ? await requireRole(request, ["lead"]) : await requireUser(request);
  const file = orNotFound(await exportVersion(user.ctx, treeIdOf(params), ref), "That version");
  return new Response(file.text, {
    headers: {
      "content-type": "text/markdown; charset=utf-8",
      "content-disposition": `attachment; filename="${file.filename}"`,
      "cache-control": "private, no-store",
      "x-content-type-options": "nosniff",
    },
  });
}
