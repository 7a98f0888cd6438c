// POST /api/runs/:runId/notes — a note on a step, with its idempotency key.
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { api, readJson, requireMethod } from "~/lib/route.server";
import { addNote, noteInput } from "~/models/runs/notes.server";
import type { Route } from "./+types/api.runs.$runId.notes";

export const action = api(async ({ request, params }: Route.ActionArgs) => {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const { ctx } = await requireUser(request);
  return Response.json({ ok: true, ...(await addNote(ctx, params.runId, await readJson(request, noteInput))) });
});
