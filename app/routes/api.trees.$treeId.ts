// GET /api/trees/:treeId — a tree, its versions (oldest first, the open draft last), and which
// version new runs start on.
import { requireUser } from "~/lib/auth.server";
import { orNotFound } from "~/lib/http.server";
import { treeIdOf } from "~/lib/tree-params.server";
import { getTree } from "~/models/trees.server";
import type { Route } from "./+types/api.trees.$treeId";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const found = orNotFound(await getTree(user.ctx, treeIdOf(params)), "That tree");
  return Response.json(
    { id: found.tree.id, title: found.tree.title, category: found.tree.category, symptom: found.tree.symptom, current: found.current, draft: found.draft, versions: found.versions },
    { headers: { "cache-control": "private, no-store" } },
  );
}
