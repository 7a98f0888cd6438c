// GET /api/trees/:treeId/diff?from=1&to=2 — nodes added, removed and changed between two versions
// (numbers, or "draft" for leads and owners).
import { requireRole, requireUser } from "~/lib/auth.server";
import { orNotFound } from "~/lib/http.server";
import { treeIdOf, versionRefOf } from "~/lib/tree-params.server";
import { diffVersions } from "~/models/trees.server";
import type { Route } from "./+types/api.trees.$treeId.diff";

export async function loader({ request, params }: Route.LoaderArgs) {
  const url = new URL(request.url);
  const from = versionRefOf(url.searchParams.get("from"));
  const to = versionRefOf(url.searchParams.get("to"));
  const user = from === "draft" || to === "draft" ? await requireRole(request, ["lead"]) : await requireUser(request);
  const d = orNotFound(await diffVersions(user.ctx, treeIdOf(params), from, to), "One of those versions");
  return Response.json(d, { headers: { "cache-control": "private, no-store" } });
}
