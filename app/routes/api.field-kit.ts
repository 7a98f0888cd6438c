// GET /api/field-kit?have=versionId,… — what a technician's phone keeps for working without
// signal: open calls, the runs in progress on them, and the procedures to start one offline
// (versions the phone already has are left out).
import { z } from "zod";
import { requireUser } from "~/lib/auth.server";
import { api } from "~/lib/route.server";
import { fieldKit } from "~/models/runs/kit.server";
import type { Route } from "./+types/api.field-kit";

const versionId = z.string().uuid();

export const loader = api(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request, "calls.mine");
  // Ids the phone says it has; anything that is not one is ignored (it only makes the answer longer).
  const ids = (new URL(request.url).searchParams.get("have") ?? "")
    .split(",")
    .filter((id) => versionId.safeParse(id).success)
    .slice(0, 200);
  return Response.json(await fieldKit(ctx, ids), { headers: { "cache-control": "private, no-store" } });
});
