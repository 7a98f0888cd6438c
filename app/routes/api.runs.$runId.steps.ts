// POST /api/runs/:runId/steps — one step with its idempotency key. A retry with the same key gets the
// stored step (200, replayed: true); the same key with another payload is a 422.
import { readJson, jsonResult, requireMethod } from "~/lib/api.server";
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { postStep, stepPayload } from "~/models/runs.server";
import type { Route } from "./+types/api.runs.$runId.steps";

export async function action({ request, params }: Route.ActionArgs) {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const user = await requireUser(request);
  const input = await readJson(request, stepPayload);
  const result = await postStep(user.ctx, params.runId, input);
  return jsonResult(result, result.ok && !result.replayed ? 201 : 200);
}
