// The notes and photos taken on the step on screen.
import type { TreeNode } from "~/engine/types";
import type { RunHandle } from "./useRun";

export function StepExtras({ run, node }: { run: RunHandle; node: TreeNode }) {
  const notes = run.view.notes.filter((n) => n.node === node.id);
  const photos = run.view.photos.filter((p) => p.node === node.id);
  if (!notes.length && !photos.length && !run.photoUploading) return null;
  return (
    <section className="space-y-2" aria-label="Notes and photos on this step">
      {notes.map((n) => (
        <p key={n.key} className="rounded-lg bg-card p-3 ring-1 ring-rule">
          <span className="font-semibold">Note{n.pending ? " (on this phone)" : ""}:</span> {n.text}
        </p>
      ))}
      {(photos.length > 0 || run.photoUploading) && (
        <div className="flex flex-wrap gap-2">
          {photos.map((p) => (
            <a key={p.id} href={p.url} target="_blank" rel="noreferrer" className="relative block">
              <img src={p.url} alt="Photo on this step" className="h-24 w-24 rounded-lg border border-rule object-cover" />
              {p.pending && (
                <span className="absolute inset-x-0 bottom-0 rounded-b-lg bg-ink/75 px-1 text-center text-sm font-semibold text-card">
                  on this phone
                </span>
              )}
            </a>
          ))}
          {run.photoUploading && (
            <span className="flex h-24 w-24 items-center justify-center rounded-lg border-2 border-dashed border-rule text-base text-ink-soft">
              Saving photo…
            </span>
          )}
        </div>
      )}
    </section>
  );
}
