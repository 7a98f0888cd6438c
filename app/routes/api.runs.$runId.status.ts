// POST /api/runs/:runId/status — { action: pause | resume | abandon | escalate | take-over, reason? }
import { readJson, jsonResult, requireMethod } from "~/lib/api.server";
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { changeRunStatus, statusInput } from "~/models/runs.server";
import type { Route } from "./+types/api.runs.$runId.status";

export async function action({ request, params }: Route.ActionArgs) {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const user = await requireUser(request);
  return jsonResult(await changeRunStatus(user.ctx, params.runId, await readJson(request, statusInput)));
}
