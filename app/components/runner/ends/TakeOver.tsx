// A lead takes a run over: they become its holder.
import type { RunHandle } from "../useRun";

export function TakeOver({ run }: { run: RunHandle }) {
  return (
    <button
      type="button"
      className="btn-primary min-h-16 w-full text-xl"
      disabled={run.statusPending}
      onClick={() => void run.setStatus({ action: "take-over" }).catch(() => undefined)}
    >
      Take over this run
    </button>
  );
}
