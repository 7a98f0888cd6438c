// POST /api/runs/:runId/finish — a practice run that stands at an end of the tree is finished (the
// trainee then sees the hidden fault). Repeating it answers the same.
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { api, requireMethod } from "~/lib/route.server";
import { finishPractice } from "~/models/training/practice.server";
import type { Route } from "./+types/api.runs.$runId.finish";

export const action = api(async ({ request, params }: Route.ActionArgs) => {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const { ctx } = await requireUser(request, "training.practice");
  return Response.json({ ok: true, ...(await finishPractice(ctx, params.runId)) });
});
