// The bottom bar, sized for gloved hands: undo, note, photo (the camera) and the More menu.
import type { TreeNode } from "~/engine/types";
import { TOOLBAR_ID } from "./inView";
import { MAX_PHOTO_MB } from "./limits";
import type { RunHandle } from "./useRun";

/** What opens over the step: a panel from the bar or the history. */
export type Panel = null | "note" | "history" | "more" | "escalate" | "abandon";

export function Toolbar({
  run,
  node,
  panel,
  setPanel,
}: {
  run: RunHandle;
  node: TreeNode | undefined;
  panel: Panel;
  setPanel: (p: Panel) => void;
}) {
  const canUndo = run.state.steps.length > 0;
  const btn = "flex min-h-14 flex-1 flex-col items-center justify-center rounded-lg text-base font-bold";
  return (
    <nav
      id={TOOLBAR_ID}
      aria-label="Run tools"
      className="fixed inset-x-0 bottom-0 z-20 border-t border-rule bg-card px-2 pb-[max(0.5rem,env(safe-area-inset-bottom))] pt-2"
    >
      <div className="mx-auto flex max-w-xl gap-2">
        <button
          type="button"
          className={`${btn} border-2 border-ink text-ink disabled:border-rule disabled:text-ink-soft`}
          disabled={!canUndo}
          onClick={() => {
            const refused = run.submit({ type: "undo" });
            if (refused) run.setError(refused);
          }}
        >
          ↶ Undo
        </button>
        <button
          type="button"
          className={`${btn} border-2 ${panel === "note" ? "border-copper bg-copper-soft" : "border-rule"}`}
          disabled={!node}
          onClick={() => setPanel(panel === "note" ? null : "note")}
        >
          Note
        </button>
        <label
          className={`${btn} cursor-pointer border-2 border-rule has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-offset-2 has-[:focus-visible]:outline-focus ${!node ? "opacity-60" : ""}`}
        >
          Photo
          <input
            type="file"
            accept="image/*"
            capture="environment"
            className="sr-only"
            disabled={!node}
            aria-label="Add a photo to this step"
            onChange={(e) => {
              const f = e.target.files?.[0];
              e.target.value = "";
              if (!f || !node) return;
              if (f.size > MAX_PHOTO_MB * 1024 * 1024)
                return run.setError(`That photo is larger than ${MAX_PHOTO_MB} MB. Take it again at a lower resolution.`);
              run.addPhoto(node.id, f);
            }}
          />
        </label>
        <button
          type="button"
          className={`${btn} border-2 ${panel === "more" ? "border-copper bg-copper-soft" : "border-rule"}`}
          onClick={() => setPanel(panel === "more" ? null : "more")}
          aria-expanded={panel === "more"}
        >
          More
        </button>
      </div>
    </nav>
  );
}
