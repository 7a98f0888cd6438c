// GET /api/trees/:treeId/validation — the engine's findings on the saved draft (the publish gate),
// with the revision they describe; sameAs names the published version the draft only repeats.
import { requireRole } from "~/lib/auth.server";
import { orNotFound } from "~/lib/http.server";
import { treeIdOf } from "~/lib/tree-params.server";
import { validateDraft } from "~/models/trees.server";
import type { Route } from "./+types/api.trees.$treeId.validation";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireRole(request, ["lead"]);
  const v = orNotFound(await validateDraft(user.ctx, treeIdOf(params)), "That tree's draft");
  return Response.json({ revision: v.revision, sameAs: v.sameAs, findings: v.findings, errors: v.errors, warnings: v.warnings }, { headers: { "cache-control": "private, no-store" } });
}
