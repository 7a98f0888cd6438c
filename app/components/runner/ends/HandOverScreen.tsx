// The procedure ends by handing the run to a lead, with its reason.
import type { RunHandle } from "../useRun";
import { EndHeading } from "./EndHeading";

export function HandOverScreen({ run, reason, onEscalate }: { run: RunHandle; reason: string; onEscalate: () => void }) {
  return (
    <section className="space-y-3 rounded-xl border-2 border-marginal bg-marginal-soft p-4">
      <EndHeading kicker="Hand over" title="The procedure hands over here" tone="text-marginal" />
      <p className="text-lg font-semibold">{reason}</p>
      <p className="text-lg">
        Send the run to a lead with what you have seen; they can read every step and take it over. Use Back if a step was entered wrongly.
      </p>
      <button type="button" className="btn-primary min-h-16 w-full text-xl" onClick={onEscalate}>
        Send to a lead…
      </button>
      {run.view.run.status === "paused" && <p>This run is paused.</p>}
    </section>
  );
}
