// The engine's checks on the saved draft (GET /api/trees/:id/validation, one fetch per saved
// revision), the marks they put on nodes, and the publish gate's reason for holding back.
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { useMemo } from "react";
import type { Tree } from "~/engine/types";
import { fetchValidation, type Validation } from "./api";
import type { NodeMarks } from "./Outline";
import type { Autosave } from "./useAutosave";

const NONE: Validation = { revision: 0, findings: [], errors: 0, warnings: 0, sameAs: null };

export function useChecks(treeId: string, tree: Tree, save: Autosave, initial: { revision: number; validation: Validation }) {
  const { savedRevision, status, unsaved } = save;
  const validation = useQuery({
    queryKey: ["tree-validation", treeId, savedRevision],
    queryFn: () => fetchValidation(treeId),
    initialData: savedRevision === initial.revision ? initial.validation : undefined,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });
  const checks = validation.data ?? NONE;
  const checking = unsaved || status === "saving" || validation.isPlaceholderData || checks.revision !== savedRevision;
  const marks: NodeMarks = useMemo(() => {
    const m: NodeMarks = new Map();
    for (const f of checks.findings) {
      if (!f.nodeId) continue;
      const x = m.get(f.nodeId) ?? { errors: 0, warnings: 0 };
      if (f.severity === "error") x.errors++;
      else x.warnings++;
      m.set(f.nodeId, x);
    }
    return m;
  }, [checks]);

  let blocked: string | null = null;
  if (tree.nodes.length === 0) blocked = "Add nodes to the tree first.";
  else if (status === "conflict") blocked = "Sort out the save conflict first.";
  else if (status === "gone") blocked = "This draft can no longer be saved.";
  else if (status === "error") blocked = "Your latest changes aren't saved yet.";
  else if (checking) blocked = "Saving and checking your latest changes…";
  else if (checks.errors > 0) blocked = `Fix the ${checks.errors === 1 ? "error" : `${checks.errors} errors`} under Checks first.`;
  else if (checks.sameAs !== null) blocked = `Nothing has changed since version ${checks.sameAs} yet.`;

  /** Why the checks describe an older save than the screen, if they do. */
  const stale = !checking
    ? null
    : status === "idle" || status === "saving"
      ? "Checking your latest changes…"
      : "These checks are for the last save; your latest changes aren't saved.";

  return { checks, checking, marks, blocked, stale };
}
