// Someone else holds the run: where it stands and what was done, read only.
import { History } from "../History";
import type { RunHandle } from "../useRun";
import { TakeOver } from "./TakeOver";
import { EndHeading } from "./EndHeading";

export function ReadOnly({ run }: { run: RunHandle }) {
  const at = run.current ?? (run.state.finished ? run.byId.get(run.state.finished.node) : undefined);
  return (
    <section className="space-y-3">
      <div className="card">
        <EndHeading
          kicker={`${run.view.run.technician.name} holds this run${run.view.run.status === "paused" ? " (paused)" : ""}. It stands at:`}
          title={at?.title ?? "—"}
          caps={false}
        />
      </div>
      {run.view.viewer.canTakeOver && <TakeOver run={run} />}
      <History run={run} />
    </section>
  );
}
