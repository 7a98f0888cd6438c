// GET /api/trees/:treeId/diff?from=1&to=2 — nodes added, removed and changed between two versions
// (numbers, or "draft" for leads and owners).
import { requireUser } from "~/lib/auth.server";
import { api } from "~/lib/route.server";
import { treeIdOf, versionRefOf } from "~/lib/tree-params.server";
import { diffVersions } from "~/models/trees/versions.server";
import type { Route } from "./+types/api.trees.$treeId.diff";

export const loader = api(async ({ request, params }: Route.LoaderArgs) => {
  const url = new URL(request.url);
  const { ctx } = await requireUser(request);
  const d = await diffVersions(ctx, treeIdOf(params), versionRefOf(url.searchParams.get("from")), versionRefOf(url.searchParams.get("to")));
  return Response.json(d, { headers: { "cache-control": "private, no-store" } });
});
