// GET /api/trees/:treeId/validation — the engine's findings on the saved draft (the publish gate),
// with the revision they describe; sameAs names the published version the draft only repeats.
import { requireUser } from "~/lib/auth.server";
import { api } from "~/lib/route.server";
import { treeIdOf } from "~/lib/tree-params.server";
import { validateDraft } from "~/models/trees/publish.server";
import type { Route } from "./+types/api.trees.$treeId.validation";

export const loader = api(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const v = await validateDraft(ctx, treeIdOf(params));
  return Response.json(
    { revision: v.revision, sameAs: v.sameAs, findings: v.findings, errors: v.errors, warnings: v.warnings },
    { headers: { "cache-control": "private, no-store" } },
  );
});
