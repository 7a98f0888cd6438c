// POST /api/runs/:runId/outcome — action taken, parts, minutes; makes the service report.
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { api, readJson, requireMethod } from "~/lib/route.server";
import { outcomeInput, recordOutcome } from "~/models/runs/lifecycle.server";
import type { Route } from "./+types/api.runs.$runId.outcome";

export const action = api(async ({ request, params }: Route.ActionArgs) => {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const { ctx } = await requireUser(request);
  return Response.json({ ok: true, ...(await recordOutcome(ctx, params.runId, await readJson(request, outcomeInput))) });
});
