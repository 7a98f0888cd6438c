// What stands between the screen and the saved draft: a conflict with a second editor (with the
// diff and the three ways out), a draft that is gone, or a save that is being retried.
import { DiffView } from "~/components/DiffView";
import { atShop } from "~/lib/display";
import { diffTrees } from "~/lib/tree-diff";
import type { Tree } from "~/engine/types";
import type { Autosave } from "./useAutosave";
import type { ConflictHandle } from "./useConflict";

export function SaveProblems({
  save,
  conflict: c,
  tree,
  timeZone,
}: {
  save: Autosave;
  conflict: ConflictHandle;
  tree: Tree;
  timeZone: string;
}) {
  const { status, problem, conflict } = save;
  const download = (
    <button type="button" className="btn-quiet" onClick={c.downloadMine}>
      Download my version (.md)
    </button>
  );
  if (status === "conflict" && conflict) {
    return (
      <section role="alert" aria-labelledby="conflict-heading" className="space-y-2 border-b-2 border-out bg-out-soft px-4 py-3">
        <h2 id="conflict-heading" className="text-lg font-bold text-out">
          {conflict.updatedByName ?? "Someone"} saved this draft at {atShop(conflict.updatedAt, timeZone, "time")}, while you were editing
        </h2>
        <p>
          Nothing of yours was saved, and nothing of theirs was overwritten. Your changes are still on this screen. Compare the two, then
          keep yours (replacing theirs) or take theirs (download yours first to re-apply what you need).
        </p>
        <div className="flex flex-wrap gap-2">
          {download}
          <button type="button" className="btn-quiet" onClick={c.keepMine}>
            Keep mine, replacing theirs
          </button>
          <button type="button" className="btn-quiet" onClick={c.takeTheirs} disabled={!c.theirs}>
            Take theirs, dropping mine
          </button>
        </div>
        {c.theirs && (
          <details className="rounded-lg bg-card p-3">
            <summary className="cursor-pointer font-semibold">What differs between their save and your screen</summary>
            <div className="mt-2">
              <DiffView diff={diffTrees(c.theirs.tree, tree)} fromLabel="their save" toLabel="your screen" />
            </div>
          </details>
        )}
      </section>
    );
  }
  if (status === "gone") {
    return (
      <section role="alert" className="space-y-2 border-b-2 border-out bg-out-soft px-4 py-3">
        <p className="font-semibold text-out">{problem}</p>
        <p>Your changes are still on this screen. Download them as a tree file and import it as a new draft from the tree page.</p>
        {download}
      </section>
    );
  }
  if (status === "error" && problem) {
    return (
      <p role="status" className="border-b border-marginal bg-marginal-soft px-4 py-2 text-marginal">
        {problem} Your changes are kept on this screen and saved as soon as the server answers.
      </p>
    );
  }
  return null;
}
