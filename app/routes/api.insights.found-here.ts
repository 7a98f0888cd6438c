// GET /api/insights/found-here?version=<id>[&unit=<id>][&node=<key>] — how the shop's past
// completed real runs went at each step of this version's tree (or one step), and how often each
// root cause was found on the unit's make and model. Any signed-in role; another shop's version
// or unit is a 404.
import { z } from "zod";
import { requireUser } from "~/lib/auth.server";
import { Refusal } from "~/lib/refusal";
import { api } from "~/lib/route.server";
import { foundHereBefore } from "~/models/insights/found-here.server";
import type { Route } from "./+types/api.insights.found-here";

const Query = z.object({
  version: z.string().uuid("Name the tree version with ?version=<its id>."),
  unit: z.string().uuid("The unit is a unit id.").optional(),
  node: z.string().min(1).max(64, "A step id has at most 64 characters.").optional(),
});

export const loader = api(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const parsed = Query.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw new Refusal("invalid", parsed.error.issues[0]?.message ?? "The query is not valid.");
  const found = await foundHereBefore(ctx, { versionId: parsed.data.version, unitId: parsed.data.unit, node: parsed.data.node });
  return Response.json(found, { headers: { "cache-control": "private, max-age=60" } });
});
