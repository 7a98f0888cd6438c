// GET /api/trees/:treeId — a tree, its versions (oldest first, the open draft last), and which
// version new runs start on.
import { requireUser } from "~/lib/auth.server";
import { api } from "~/lib/route.server";
import { treeIdOf } from "~/lib/tree-params.server";
import { getTree } from "~/models/trees/versions.server";
import type { Route } from "./+types/api.trees.$treeId";

export const loader = api(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const found = await getTree(ctx, treeIdOf(params));
  return Response.json(
    {
      id: found.tree.id,
      title: found.tree.title,
      category: found.tree.category,
      symptom: found.tree.symptom,
      current: found.current,
      draft: found.draft,
      versions: found.versions,
    },
    { headers: { "cache-control": "private, no-store" } },
  );
});
