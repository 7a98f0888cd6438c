// POST /api/trees/:treeId/draft — the editor's autosave: { versionId, revision, tree, layout }.
// 200 { revision } when saved; 409 { conflict } when someone else saved first (nothing written);
// 410 when the draft was published meanwhile; 404 when it was discarded. Read the draft with GET …/versions/draft.
import { z } from "zod";
import { TreeSchema } from "~/engine/schema";
import type { Tree } from "~/engine/types";
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { api, readJson, requireMethod } from "~/lib/route.server";
import { idOf, treeIdOf } from "~/lib/tree-params.server";
import { replaceDraftContent } from "~/models/trees/drafts.server";
import type { Route } from "./+types/api.trees.$treeId.draft";

const Save = z.object({
  versionId: z.string(),
  revision: z.number().int().positive(),
  tree: TreeSchema,
  layout: z.record(z.string().max(64), z.object({ x: z.number().finite(), y: z.number().finite() })).default({}),
});

export const action = api(async ({ request, params }: Route.ActionArgs) => {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const { ctx } = await requireUser(request);
  const treeId = treeIdOf(params);
  const body = await readJson(request, Save);
  const saved = await replaceDraftContent(ctx, idOf(body.versionId, "That draft"), body.tree as Tree, body.revision, {
    layout: body.layout,
    treeId,
  });
  return Response.json(saved);
});
