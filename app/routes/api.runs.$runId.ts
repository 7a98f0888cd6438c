// GET /api/runs/:runId — everything the runner needs: the pinned tree version, the step log, notes, photos, meters.
import { requireUser } from "~/lib/auth.server";
import { api } from "~/lib/route.server";
import { runViewJson } from "~/lib/run-json.server";
import { getRunView } from "~/models/runs/view.server";
import type { Route } from "./+types/api.runs.$runId";

export const loader = api(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const view = await getRunView(ctx, params.runId);
  return new Response(runViewJson(view), { headers: { "content-type": "application/json", "cache-control": "private, no-store" } });
});
