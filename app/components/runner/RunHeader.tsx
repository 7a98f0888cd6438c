// The runner's top bar: back to the call, the step count (opens the history), the save state
// (saved, saving, kept on this phone until there is signal, or refused by the server).
import { PracticeBanner } from "./practice/Scripted";
import { stepsDone } from "~/lib/run-log";
import type { RunHandle } from "./useRun";

function SaveState({ run }: { run: RunHandle }) {
  if (run.phone.items.some((i) => i.state !== "queued"))
    return (
      <span className="rounded-full bg-out-soft px-3 py-1 text-base font-bold text-out" role="status">
        Not accepted
      </span>
    );
  if (run.waiting > 0)
    return (
      <span className="rounded-full bg-marginal-soft px-3 py-1 text-base font-bold text-marginal" role="status">
        On this phone · {run.waiting}
      </span>
    );
  if (run.phone.offline)
    return (
      <span className="rounded-full bg-marginal-soft px-3 py-1 text-base font-bold text-marginal" role="status">
        No signal
      </span>
    );
  if (run.saving > 0)
    return (
      <span className="rounded-full bg-marginal-soft px-3 py-1 text-base font-bold text-marginal" role="status">
        Saving…
      </span>
    );
  return (
    <span className="rounded-full bg-within-soft px-3 py-1 text-base font-bold text-within" role="status">
      ✓ Saved
    </span>
  );
}

export function RunHeader({
  run,
  walking,
  historyOpen,
  onHistory,
}: {
  run: RunHandle;
  walking: boolean;
  historyOpen: boolean;
  onHistory: () => void;
}) {
  const { view } = run;
  const done = stepsDone(view.steps);
  const back = view.run.practice ? "/practice" : view.call ? `/calls/${view.call.id}` : "/";
  return (
    <header className="sticky top-0 z-20 border-b border-rule bg-card">
      <div className="mx-auto flex max-w-xl items-center justify-between gap-2 px-3 py-1">
        <a href={back} className="flex min-h-12 items-center text-base font-semibold">
          ← {view.run.practice ? "Practice" : view.call ? `Call ${view.call.number}` : "Back"}
        </a>
        {walking && (
          <button
            type="button"
            onClick={onHistory}
            className="min-h-12 rounded-lg px-2 text-base font-bold text-copper-dark"
            aria-expanded={historyOpen}
            title="Show the steps done"
          >
            Step {done + 1} · <span className="underline">{done} done</span>
          </button>
        )}
        <SaveState run={run} />
      </div>
      {view.run.practice && <PracticeBanner run={run} />}
    </header>
  );
}
