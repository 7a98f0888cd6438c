// POST /api/trees/:treeId/draft — the editor's autosave: { versionId, revision, tree, layout }.
// 200 { revision } when saved; 409 { conflict } when someone else saved first (nothing written);
// 410 when the draft was published or discarded meanwhile. Read the draft with GET …/versions/draft.
import { z } from "zod";
import { readJson, requireMethod } from "~/lib/api.server";
import { requireRole } from "~/lib/auth.server";
import { apiError, requireSameOrigin } from "~/lib/http.server";
import { idOf, treeIdOf } from "~/lib/tree-params.server";
import { TreeSchema } from "~/engine/schema";
import type { Tree } from "~/engine/types";
import { getVersionRow, replaceDraftContent, VersionLockedError } from "~/models/trees.server";
import type { Route } from "./+types/api.trees.$treeId.draft";

const Save = z.object({
  versionId: z.string(),
  revision: z.number().int().positive(),
  tree: TreeSchema,
  layout: z.record(z.string().max(64), z.object({ x: z.number().finite(), y: z.number().finite() })).default({}),
});

export async function action({ request, params }: Route.ActionArgs) {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const user = await requireRole(request, ["lead"]);
  const treeId = treeIdOf(params);
  const body = await readJson(request, Save);
  const versionId = idOf(body.versionId, "That draft");
  const version = await getVersionRow(user.ctx, versionId);
  if (!version || version.treeId !== treeId) return apiError(404, "That draft was not found.");
  try {
    const result = await replaceDraftContent(user.ctx, versionId, body.tree as Tree, body.revision, body.layout);
    if (result.ok) return Response.json({ revision: result.revision, updatedAt: result.updatedAt });
    if (result.reason === "conflict") {
      const who = result.updatedByName ?? "Someone";
      return Response.json(
        {
          error: `${who} saved this draft after you opened it. Nothing was saved; your changes are kept in your editor.`,
          conflict: { revision: result.revision, updatedByName: result.updatedByName, updatedAt: result.updatedAt },
        },
        { status: 409 },
      );
    }
    return apiError(410, "This draft was discarded by someone else, so it can't be saved.");
  } catch (e) {
    if (e instanceof VersionLockedError) {
      return apiError(410, `This draft has been ${e.state === "retired" ? "published and retired" : "published"} meanwhile, so it can't change any more.`);
    }
    throw e;
  }
}
