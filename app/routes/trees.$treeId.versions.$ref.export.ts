// GET /trees/:treeId/versions/:ref/export — the version as a tree file in the engine's canonical
// Markdown form, as a download. The draft is for leads and owners only.
import { requireUser } from "~/lib/auth.server";
import { api } from "~/lib/route.server";
import { treeIdOf, versionRefOf } from "~/lib/tree-params.server";
import { exportVersion } from "~/models/trees/transfer.server";
import type { Route } from "./+types/trees.$treeId.versions.$ref.export";

export const loader = api(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const file = await exportVersion(ctx, treeIdOf(params), versionRefOf(params.ref));
  return new Response(file.text, {
    headers: {
      "content-type": "text/markdown; charset=utf-8",
      "content-disposition": `attachment; filename="${file.filename}"`,
      "cache-control": "private, no-store",
      "x-content-type-options": "nosniff",
    },
  });
});
