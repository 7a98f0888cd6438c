// POST /api/runs — a run the phone started without signal: { id (made on the phone), treeId,
// versionId (the version it walked), callId?, at (the phone's clock) }. 201 with the new run;
// the same id again answers 200 with the same run (replayed: true).
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { api, readJson, requireMethod } from "~/lib/route.server";
import { startPayload, startRun } from "~/models/runs/start.server";
import type { Route } from "./+types/api.runs";

export const action = api(async ({ request }: Route.ActionArgs) => {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const { ctx } = await requireUser(request, "runs.start");
  const p = await readJson(request, startPayload);
  const result = await startRun(ctx, {
    runId: p.id,
    treeId: p.treeId,
    versionId: p.versionId,
    callId: p.callId ?? undefined,
    startedAt: p.at ? new Date(p.at) : undefined,
  });
  return Response.json({ ok: true, ...result }, { status: result.replayed ? 200 : 201 });
});
