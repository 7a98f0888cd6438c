// POST /api/runs/:runId/notes — a note on a step, with its idempotency key.
import { readJson, jsonResult, requireMethod } from "~/lib/api.server";
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { addNote, noteInput } from "~/models/runs.server";
import type { Route } from "./+types/api.runs.$runId.notes";

export async function action({ request, params }: Route.ActionArgs) {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const user = await requireUser(request);
  return jsonResult(await addNote(user.ctx, params.runId, await readJson(request, noteInput)));
}
