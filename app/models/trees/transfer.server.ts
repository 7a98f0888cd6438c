// Tree files in and out: a file in the engine's Markdown format becomes a draft (nothing is saved
// when it doesn't parse), and any version goes out in the engine's canonical form.
import { eq } from "drizzle-orm";
import { treeVersions } from "../../../db/schema";
import { parseTree } from "../../engine/markdown/parse";
import { serializeTree } from "../../engine/markdown/serialize";
import type { Ctx } from "../../lib/context";
import { writeTx } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { Refusal } from "../../lib/refusal";
import type { VersionRef } from "../../lib/tree-library";
import { insertDraft, lockTree, touchTree } from "./_content.server";
import { createDraftTree } from "./drafts.server";
import { loadTreeVersion } from "./versions.server";

/** A parse error of an imported file, with the text of its line. */
export type ImportProblem = { line: number; column: number; message: string; source: string };

/**
 * A tree file (the engine's Markdown format) becomes a draft: of a new tree, or of the tree
 * `into` (which must have no open draft). A file that doesn't parse saves nothing and is refused
 * (`rejected`) with each error's line and that line's text. Validation findings don't block an
 * import; they block publishing, as for any draft.
 */
export async function importTree(ctx: Ctx, source: string, opts: { into?: string; filename?: string } = {}): Promise<{ treeId: string; versionId: string }> {
  authorize(ctx, "trees.author");
  const parsed = parseTree(source);
  if (!parsed.ok) {
    const lines = source.replace(/\r\n?/g, "\n").split("\n");
    const n = parsed.errors.length;
    throw new Refusal("rejected", `${opts.filename ?? "That file"} can't be read as a tree, so nothing was saved. Fix ${n === 1 ? "this line" : `these ${n} lines`} and upload it again:`, {
      code: "parse",
      details: { parseErrors: parsed.errors.map((e): ImportProblem => ({ line: e.line, column: e.column, message: e.message, source: lines[e.line - 1] ?? "" })) },
    });
  }
  const into = opts.into;
  if (!into) return createDraftTree(ctx, parsed.tree);
  return writeTx(async (tx) => {
    await lockTree(tx, ctx, into);
    const versions = await tx.select().from(treeVersions).where(eq(treeVersions.treeId, into));
    if (versions.some((v) => v.state === "draft")) {
      throw new Refusal("conflict", "That tree already has an open draft. Publish or discard it first, or import as a new tree.", { code: "draft-open", details: { draftOf: into } });
    }
    const latest = versions.filter((v) => v.number !== null).sort((a, z) => z.number! - a.number!)[0];
    const versionId = await insertDraft(tx, ctx, into, parsed.tree, latest?.id ?? null);
    await touchTree(tx, into);
    return { treeId: into, versionId };
  });
}

/** A version as a tree file in the engine's canonical form, with a download name. */
export async function exportVersion(ctx: Ctx, treeId: string, ref: VersionRef): Promise<{ filename: string; text: string }> {
  const v = await loadTreeVersion(ctx, treeId, ref);
  const slug =
    v.tree.title
      .toLowerCase()
      .normalize("NFKD")
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-+|-+$/g, "")
      .slice(0, 60) || "tree";
  return { filename: `${slug}-${ref === "draft" ? "draft" : `v${ref}`}.md`, text: serializeTree(v.tree) };
}
