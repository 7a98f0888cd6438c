// What the editor opens with: the tree's open draft, its content and layout, and the engine's
// checks on it, in one read. Leads and owners only.
import type { Ctx } from "../../lib/context";
import { authorize } from "../../lib/policy";
import { validateDraft } from "./publish.server";
import { getTree, loadTreeVersion } from "./versions.server";

/** The draft to edit, or null when the tree has none open (published meanwhile, or never started). */
export async function openEditor(ctx: Ctx, treeId: string) {
  authorize(ctx, "trees.author");
  const t = await getTree(ctx, treeId);
  if (!t.draft) return null;
  const [draft, checks] = await Promise.all([loadTreeVersion(ctx, treeId, "draft"), validateDraft(ctx, treeId)]);
  return {
    versionId: draft.version.id,
    revision: draft.version.revision,
    tree: draft.tree,
    layout: draft.layout,
    validation: { revision: checks.revision, findings: checks.findings, errors: checks.errors, warnings: checks.warnings, sameAs: checks.sameAs },
    nextNumber: Math.max(0, ...t.versions.map((v) => v.number ?? 0)) + 1,
    basedOn: t.draft.basedOnNumber,
  };
}
