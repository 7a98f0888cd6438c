// GET /api/runs/:runId — everything the runner needs: the pinned tree version, the step log, notes, photos, meters.
import { requireUser } from "~/lib/auth.server";
import { notFound } from "~/lib/http.server";
import { getRunView } from "~/models/runs.server";
import type { Route } from "./+types/api.runs.$runId";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const view = await getRunView(user.ctx, params.runId);
  if (!view) notFound("That run");
  return Response.json(view, { headers: { "cache-control": "private, no-store" } });
}
