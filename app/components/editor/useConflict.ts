// A second editor saved first: fetch their draft for the diff, then keep mine (save on top of
// their revision), take theirs (replace the screen), or download mine as a tree file.
import { useQuery } from "@tanstack/react-query";
import type { Dispatch } from "react";
import { serializeTree } from "~/engine/markdown/serialize";
import { fetchDraft } from "./api";
import { downloadText } from "./download";
import type { DraftAction, DraftState } from "./draft";
import type { Autosave } from "./useAutosave";

export function useConflict(treeId: string, state: DraftState, dispatch: Dispatch<DraftAction>, save: Autosave, onReplaced: () => void) {
  const { conflict, status } = save;
  const theirs = useQuery({
    queryKey: ["tree-draft", treeId, conflict?.revision],
    queryFn: () => fetchDraft(treeId),
    enabled: status === "conflict",
  });
  return {
    conflict,
    theirs: theirs.data,
    keepMine() {
      if (conflict) save.rebase(conflict.revision);
    },
    takeTheirs() {
      const t = theirs.data;
      if (!t) return;
      dispatch({ type: "replace", tree: t.tree, layout: t.layout });
      // The replace counts one change; the screen then equals their save.
      save.adopt(t.revision, state.change + 1);
      onReplaced();
    },
    downloadMine: () => downloadText(`${treeId.slice(0, 8)}-my-changes.md`, serializeTree(state.tree)),
  };
}

export type ConflictHandle = ReturnType<typeof useConflict>;
