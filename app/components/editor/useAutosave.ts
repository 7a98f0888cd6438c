// Autosave with optimistic concurrency: the draft is saved 0.7 s after the last change with the
// revision the editor last saw; a 409 stops saving and keeps the author's changes on screen
// (a conflict), a 410/404 means the draft is gone, anything else is retried every 5 s.
import { useMutation } from "@tanstack/react-query";
import { useCallback, useEffect, useRef, useState } from "react";
import { saveDraft, SaveError, type Conflict } from "./api";
import type { DraftState } from "./draft";

export type SaveStatus = "idle" | "saving" | "error" | "conflict" | "gone";

export function useAutosave(treeId: string, versionId: string, state: DraftState, initialRevision: number) {
  const stateRef = useRef(state);
  stateRef.current = state;
  const [savedRevision, setSavedRevision] = useState(initialRevision);
  const [savedChange, setSavedChange] = useState(0);
  const [status, setStatus] = useState<SaveStatus>("idle");
  const [problem, setProblem] = useState<string | null>(null);
  const [conflict, setConflict] = useState<Conflict | null>(null);

  const mutation = useMutation({ mutationFn: (body: Parameters<typeof saveDraft>[1]) => saveDraft(treeId, body) });
  const save = useCallback(
    async (revision: number) => {
      const snap = stateRef.current;
      setStatus("saving");
      try {
        const res = await mutation.mutateAsync({ versionId, revision, tree: snap.tree, layout: snap.layout });
        setSavedRevision(res.revision);
        setSavedChange(snap.change);
        setStatus("idle");
        setProblem(null);
      } catch (e) {
        if (e instanceof SaveError && e.status === 409 && e.conflict) {
          setConflict(e.conflict);
          setStatus("conflict");
        } else if (e instanceof SaveError && (e.status === 410 || e.status === 404)) {
          setProblem(e.message);
          setStatus("gone");
        } else {
          setProblem(e instanceof Error && !(e instanceof TypeError) ? e.message : "Cluepath can't reach the server.");
          setStatus("error");
        }
      }
    },
    [mutation, versionId],
  );

  const unsaved = state.change !== savedChange;
  useEffect(() => {
    if (!unsaved || status === "saving" || status === "conflict" || status === "gone") return;
    const t = setTimeout(() => void save(savedRevision), status === "error" ? 5000 : 700);
    return () => clearTimeout(t);
  }, [unsaved, state.change, status, savedRevision, save]);
  useEffect(() => {
    if (!unsaved) return;
    const warn = (e: BeforeUnloadEvent) => e.preventDefault();
    window.addEventListener("beforeunload", warn);
    return () => window.removeEventListener("beforeunload", warn);
  }, [unsaved]);

  return {
    savedRevision,
    unsaved,
    status,
    problem,
    conflict,
    /** Save on top of the other editor's revision: the author keeps their own changes. */
    rebase(revision: number) {
      setSavedRevision(revision);
      setConflict(null);
      setStatus("idle");
    },
    /** The screen now shows `revision` as saved (after taking the other editor's draft). */
    adopt(revision: number, change: number) {
      setSavedChange(change);
      setSavedRevision(revision);
      setConflict(null);
      setStatus("idle");
    },
  };
}

export type Autosave = ReturnType<typeof useAutosave>;

export function statusText(status: SaveStatus, unsaved: boolean): string {
  if (status === "saving") return "Saving…";
  if (status === "conflict") return "Not saved: someone else saved first";
  if (status === "gone") return "Not saved";
  if (status === "error") return "Not saved yet — retrying";
  return unsaved ? "Unsaved changes" : "All changes saved";
}
