// A run waiting for a lead: the reason given, and for a lead the way to take it over.
import { History } from "../History";
import type { RunHandle } from "../useRun";
import { TakeOver } from "./TakeOver";
import { EndHeading } from "./EndHeading";

export function EscalatedScreen({ run }: { run: RunHandle }) {
  const e = run.view.escalation;
  return (
    <section className="space-y-3">
      <div className="rounded-xl border-2 border-marginal bg-marginal-soft p-4">
        <EndHeading kicker="Handed over" title="Waiting for a lead" tone="text-marginal" />
        {e && (
          <p className="text-lg">
            <span className="font-semibold">{e.raisedBy}:</span> {e.reason}
          </p>
        )}
        {!run.view.viewer.canTakeOver && (
          <p className="mt-2 text-lg">A lead will read the run and take it over. Everything you entered is saved.</p>
        )}
      </div>
      {run.view.viewer.canTakeOver && <TakeOver run={run} />}
      <History run={run} />
    </section>
  );
}
