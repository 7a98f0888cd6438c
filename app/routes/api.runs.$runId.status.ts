// POST /api/runs/:runId/status — { action: pause | resume | abandon | escalate | take-over, reason? }
import { requireUser } from "~/lib/auth.server";
import { fromClient, requireSameOrigin } from "~/lib/http.server";
import { api, readJson, requireMethod } from "~/lib/route.server";
import { changeRunStatus, statusInput } from "~/models/runs/lifecycle.server";
import type { Route } from "./+types/api.runs.$runId.status";

export const action = api(async ({ request, params, context }: Route.ActionArgs) => {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const { ctx } = await requireUser(request);
  return Response.json({
    ok: true,
    ...(await changeRunStatus(fromClient(ctx, context), params.runId, await readJson(request, statusInput))),
  });
});
