// A run waiting for a lead: the reason given, and for a lead the way to take it over.
import { History } from "../History";
import type { RunHandle } from "../useRun";
import { TakeOver } from "./TakeOver";

export function EscalatedScreen({ run }: { run: RunHandle }) {
  const e = run.view.escalation;
  return (
    <section className="space-y-3">
      <div className="rounded-xl border-2 border-marginal bg-marginal-soft p-4">
        <p className="text-base font-semibold uppercase tracking-wide text-marginal">Waiting for a lead</p>
        {e && (
          <p className="text-lg">
            <span className="font-semibold">{e.raisedBy}:</span> {e.reason}
          </p>
        )}
        {!run.view.viewer.canTakeOver && <p className="mt-2 text-lg">A lead will read the run and take it over. Everything you entered is saved.</p>}
      </div>
      {run.view.viewer.canTakeOver && <TakeOver run={run} />}
      <History run={run} />
    </section>
  );
}
