// POST /api/runs/:runId/outcome — action taken, parts, minutes; makes the service report.
import { readJson, jsonResult, requireMethod } from "~/lib/api.server";
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { outcomeInput, recordOutcome } from "~/models/runs.server";
import type { Route } from "./+types/api.runs.$runId.outcome";

export async function action({ request, params }: Route.ActionArgs) {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const user = await requireUser(request);
  return jsonResult(await recordOutcome(user.ctx, params.runId, await readJson(request, outcomeInput)));
}
