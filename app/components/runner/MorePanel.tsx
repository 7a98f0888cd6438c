// The More menu over the bottom bar: pause or resume, ask a lead, abandon.
import type { Panel } from "./Toolbar";
import type { RunHandle } from "./useRun";

export function MorePanel({ run, onPick }: { run: RunHandle; onPick: (p: Panel) => void }) {
  const paused = run.view.run.status === "paused";
  return (
    <section
      data-overlay
      className="fixed inset-x-0 bottom-[4.75rem] z-30 mx-auto grid max-w-xl gap-2 rounded-t-2xl border border-rule bg-card p-3 shadow-[0_-8px_24px_rgba(0,0,0,0.18)]"
      aria-label="More"
    >
      <button
        type="button"
        className="btn-quiet min-h-14 w-full"
        disabled={run.statusPending}
        onClick={() =>
          void run.setStatus({ action: paused ? "resume" : "pause" }).then(
            () => onPick(null),
            () => undefined,
          )
        }
      >
        {paused ? "Resume the run" : "Pause — carry on later"}
      </button>
      {!run.view.run.practice && (
        <button type="button" className="btn-quiet min-h-14 w-full" onClick={() => onPick("escalate")}>
          Ask a lead to take over…
        </button>
      )}
      <button type="button" className="btn-quiet min-h-14 w-full text-out" onClick={() => onPick("abandon")}>
        Abandon this run…
      </button>
      <button type="button" className="btn-quiet min-h-14 w-full" onClick={() => onPick(null)}>
        Close
      </button>
    </section>
  );
}
