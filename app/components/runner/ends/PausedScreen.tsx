// A paused run: everything is saved; one button picks it up again.
import type { RunHandle } from "../useRun";

export function PausedScreen({ run }: { run: RunHandle }) {
  return (
    <section className="card space-y-3 text-center">
      <h1 id="step-title" tabIndex={-1} className="text-2xl font-bold outline-none">
        Paused
      </h1>
      <p className="text-lg">Everything so far is saved. Pick up where you left off when you are back at the unit.</p>
      <button
        type="button"
        className="btn-primary min-h-16 w-full text-xl"
        disabled={run.statusPending}
        onClick={() => void run.setStatus({ action: "resume" }).catch(() => undefined)}
      >
        Resume
      </button>
    </section>
  );
}
