// POST /api/runs/:runId/steps — one step with its idempotency key. A retry with the same key gets the
// stored step (200, replayed: true); the same key with another payload is a 422.
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { api, readJson, requireMethod } from "~/lib/route.server";
import { postStep, stepPayload } from "~/models/runs/steps.server";
import type { Route } from "./+types/api.runs.$runId.steps";

export const action = api(async ({ request, params }: Route.ActionArgs) => {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const { ctx } = await requireUser(request);
  const result = await postStep(ctx, params.runId, await readJson(request, stepPayload));
  return Response.json({ ok: true, ...result }, { status: result.replayed ? 200 : 201 });
});
