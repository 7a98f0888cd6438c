// GET /api/runs/:runId — everything the runner needs: the pinned tree version, the step log, notes, photos, meters.
import { requireUser } from "~/lib/auth.server";
import { api } from "~/lib/route.server";
import { getRunView } from "~/models/runs/view.server";
import type { Route } from "./+types/api.runs.$runId";

export const loader = api(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  return Response.json(await getRunView(ctx, params.runId), { headers: { "cache-control": "private, no-store" } });
});
