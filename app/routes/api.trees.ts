// GET /api/trees — the shop's tree library (same query as the /trees page: search, category, state, sort, dir).
import { requireUser } from "~/lib/auth.server";
import { api } from "~/lib/route.server";
import { libraryQueryOf } from "~/lib/tree-params.server";
import { listLibrary } from "~/models/trees/library.server";
import type { Route } from "./+types/api.trees";

export const loader = api(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const trees = await listLibrary(ctx, libraryQueryOf(new URL(request.url)));
  return Response.json({ trees }, { headers: { "cache-control": "private, no-store" } });
});
