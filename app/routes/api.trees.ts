// GET /api/trees — the shop's tree library (same query as the /trees page: search, category, state, sort, dir).
import { requireUser } from "~/lib/auth.server";
import { listLibrary } from "~/models/trees.server";
import { libraryQueryOf } from "~/lib/tree-params.server";
import type { Route } from "./+types/api.trees";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const trees = await listLibrary(user.ctx, libraryQueryOf(new URL(request.url)));
  return Response.json({ trees }, { headers: { "cache-control": "private, no-store" } });
}
