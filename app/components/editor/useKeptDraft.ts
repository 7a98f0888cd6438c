// The editor's unsaved changes, kept in this browser (app/lib/kept.ts) while they are not saved, so
// an editor that fails (the route's error boundary), a reload or an outage loses nothing. On opening,
// changes kept from an earlier visit are offered back: restored on top of the revision they were
// made on (a second editor's later save then shows as a conflict, never overwritten), or thrown away.
import { useEffect, useState, type Dispatch } from "react";
import type { Tree } from "~/engine/types";
import { forgetKept, readKept, unsavedKey, writeKept, type UnsavedDraft } from "~/lib/kept";
import { diffTrees } from "~/lib/tree-diff";
import type { DraftAction, DraftState, Layout } from "./draft";
import type { Autosave } from "./useAutosave";

export type KeptDraft = UnsavedDraft<Tree, Layout>;

export function useKeptDraft(
  treeId: string,
  versionId: string,
  loaded: Tree,
  state: DraftState,
  save: Autosave,
  dispatch: Dispatch<DraftAction>,
  onReplaced: () => void,
) {
  const key = unsavedKey(treeId);
  const [offer, setOffer] = useState<KeptDraft | null>(null);
  const [checked, setChecked] = useState(false);

  // After hydration (the server never sees this browser's storage): an earlier visit's changes to
  // this same draft, when they differ from what the server has.
  useEffect(() => {
    const kept = readKept<KeptDraft>(key);
    if (kept && kept.versionId === versionId && !diffTrees(loaded, kept.tree).same) setOffer(kept);
    else if (kept) forgetKept(key);
    setChecked(true);
  }, [key, versionId, loaded]);

  // Keep what is on screen while it is unsaved; forget it once saved. An offer not yet answered is
  // left alone.
  const { unsaved, savedRevision } = save;
  useEffect(() => {
    if (!checked || offer) return;
    if (unsaved)
      writeKept(key, {
        versionId,
        revision: savedRevision,
        tree: state.tree,
        layout: state.layout,
        at: new Date().toISOString(),
      } satisfies KeptDraft);
    else if (state.change > 0) forgetKept(key);
  }, [checked, offer, unsaved, savedRevision, state.change, state.tree, state.layout, key, versionId]);

  return {
    offer,
    restore() {
      if (!offer) return;
      dispatch({ type: "replace", tree: offer.tree, layout: offer.layout });
      save.rebase(offer.revision);
      setOffer(null);
      onReplaced();
    },
    discard() {
      forgetKept(key);
      setOffer(null);
    },
  };
}

export type KeptDraftHandle = ReturnType<typeof useKeptDraft>;
