// The publish gate and a published version's one change: the engine judges the draft, publishing
// numbers it (refused on errors, a stale revision, a missing note, or a draft that only repeats
// the version it started from), and retiring takes a published version out of new runs.
import { and, eq, max } from "drizzle-orm";
import { trees, treeVersions } from "../../../db/schema";
import type { Tree } from "../../engine/types";
import { errorsOf, validateTree } from "../../engine/validate";
import type { Ctx } from "../../lib/context";
import { db, writeTx, type Db, type Tx } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { fieldRefusal, Refusal } from "../../lib/refusal";
import { diffTrees } from "../../lib/tree-diff";
import { byCaller, recordAudit } from "../_audit.server";
import { assertDraft, lockTree, readContent, touchTree, type VersionRow } from "./_content.server";
import { loadTreeVersion } from "./versions.server";

/**
 * The number of the published version the draft only repeats, or null: publishing it would add
 * nothing. (A draft of a retired version may be published unchanged: that is how a retired
 * procedure comes back.)
 */
async function repeatsItsBase(tx: Tx | Db, draft: VersionRow, content: Tree): Promise<number | null> {
  if (!draft.basedOnId) return null;
  const [base] = await tx.select().from(treeVersions).where(eq(treeVersions.id, draft.basedOnId)).limit(1);
  if (!base || base.state !== "published") return null;
  return diffTrees((await readContent(tx, base)).tree, content).same ? base.number : null;
}

/** The tree's draft judged by the engine, as the publish gate sees it. */
export async function validateDraft(ctx: Ctx, treeId: string) {
  authorize(ctx, "trees.author");
  const draft = await loadTreeVersion(ctx, treeId, "draft");
  const sameAs = await repeatsItsBase(db(), draft.version, draft.tree);
  return { versionId: draft.version.id, revision: draft.version.revision, sameAs, ...validateTree(draft.tree) };
}

/**
 * Publishes the tree's open draft as its next version number, with a change note. Refused when
 * the draft moved on since the caller saw it (`expectedRevision`), when the engine finds any
 * error in it, or when it only repeats the published version it started from. From then on the
 * version never changes.
 */
export async function publishDraft(ctx: Ctx, treeId: string, expectedRevision: number, changeNote: string): Promise<{ number: number; versionId: string }> {
  authorize(ctx, "trees.author");
  const note = changeNote.trim();
  if (!note) throw fieldRefusal("changeNote", "Say what changed in this version, so technicians and trainers know.");
  return writeTx(async (tx) => {
    await lockTree(tx, ctx, treeId);
    const [draft] = await tx
      .select()
      .from(treeVersions)
      .where(and(eq(treeVersions.treeId, treeId), eq(treeVersions.state, "draft")))
      .for("update");
    if (!draft) throw new Refusal("not-found", "There is no open draft to publish (it may have been published already).");
    assertDraft(draft);
    if (draft.revision !== expectedRevision) {
      throw new Refusal("conflict", "The draft changed since your last save was checked. Wait for it to save, then publish again.", { code: "stale", details: { revision: draft.revision } });
    }
    const { tree: content } = await readContent(tx, draft);
    const findings = errorsOf(validateTree(content).findings);
    if (findings.length) throw new Refusal("rejected", "The draft still has errors, so it was not published:", { code: "invalid", details: { findings } });
    const sameAs = await repeatsItsBase(tx, draft, content);
    if (sameAs !== null) {
      throw new Refusal("conflict", `This draft says exactly what version ${sameAs} says; change something before publishing.`, { code: "unchanged", details: { sameAs } });
    }
    const [top] = await tx.select({ n: max(treeVersions.number) }).from(treeVersions).where(eq(treeVersions.treeId, treeId));
    const number = (top?.n ?? 0) + 1;
    const now = new Date();
    await tx
      .update(treeVersions)
      .set({ state: "published", number, changeNote: note.slice(0, 500), publishedAt: now, publishedBy: ctx.userId, openDraftOf: null, updatedAt: now })
      .where(eq(treeVersions.id, draft.id));
    await tx.update(trees).set({ title: content.title, category: content.category, symptom: content.symptom, updatedAt: now }).where(eq(trees.id, treeId));
    await recordAudit(
      {
        ...byCaller(ctx),
        action: "version.published",
        subjectType: "tree-version",
        subjectId: draft.id,
        summary: `Published ‘${content.title}’ version ${number}`,
        details: { treeId, number, changeNote: note.slice(0, 500) },
      },
      tx,
    );
    return { number, versionId: draft.id };
  });
}

/**
 * Retires a published version: new runs can't start on it; runs that used it keep it (the rows
 * stay, untouched). The only state change a published version can take.
 */
export async function retireVersion(ctx: Ctx, treeId: string, number: number): Promise<void> {
  authorize(ctx, "trees.author");
  await writeTx(async (tx) => {
    await lockTree(tx, ctx, treeId);
    const [v] = await tx
      .select()
      .from(treeVersions)
      .where(and(eq(treeVersions.treeId, treeId), eq(treeVersions.number, number)))
      .for("update");
    if (!v) throw new Refusal("not-found", "That version was not found.");
    if (v.state !== "published") throw new Refusal("conflict", `Version ${number} is not published, so it can't be retired.`, { code: "not-published" });
    const now = new Date();
    await tx.update(treeVersions).set({ state: "retired", retiredAt: now }).where(and(eq(treeVersions.id, v.id), eq(treeVersions.state, "published")));
    await touchTree(tx, treeId, now);
    await recordAudit({ ...byCaller(ctx), action: "version.retired", subjectType: "tree-version", subjectId: v.id, summary: `Retired ‘${v.title}’ version ${number}`, details: { treeId, number } }, tx);
  });
}
