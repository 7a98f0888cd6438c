// Where the run stands, above each step: the procedure, the kind of step, how far to an answer,
// the step's title; and the verdict of the reading just saved.
import type { TreeNode } from "~/engine/types";
import { CONFIRMED_NOTE } from "~/lib/run-log";
import { FoundHereLine } from "./FoundHere";
import { stepsToGo } from "./progress";
import { VERDICT_STYLE } from "./Reading";
import { KIND_LABEL } from "./Screens";
import type { RunHandle } from "./useRun";

export function StepHeading({ run, node }: { run: RunHandle; node: TreeNode }) {
  const { view, state } = run;
  const left = state.current ? stepsToGo(view.tree, node.id) : null;
  return (
    <div>
      <p className="text-base text-ink-soft">
        {view.unit ? `${view.unit.make} ${view.unit.model} · ` : ""}
        {view.version.title}
        {view.run.practice ? " · practice" : ""}
      </p>
      <p className="mt-1 text-base font-bold uppercase tracking-wide text-copper-dark">
        {KIND_LABEL[node.kind]}
        {left && (
          <span className="font-semibold normal-case tracking-normal text-ink-soft">
            {" "}
            · {left.min === left.max ? left.min : `${left.min} to ${left.max}`} step{left.max === 1 ? "" : "s"} to an answer
          </span>
        )}
      </p>
      <h1 id="step-title" tabIndex={-1} className="mt-1 text-2xl font-bold leading-tight outline-none">
        {node.title}
      </h1>
      <FoundHereLine run={run} node={node} />
    </div>
  );
}

/** The verdict of the reading just saved, small, at the top of the next screen. */
export function LastReading({ run }: { run: RunHandle }) {
  const steps = run.view.steps;
  const last = steps[steps.length - 1];
  if (!last || last.type !== "reading" || !last.verdict || !last.message) return null;
  // Practice: the trainee's own call, not the verdict, until the practice is finished.
  if (run.view.run.practice && last.call)
    return (
      <div aria-label="Last reading" className="rounded-lg border-l-8 border-practice bg-practice-soft px-3 py-2">
        <p className="text-sm font-semibold text-ink-soft">
          {last.pending ? "Saving" : "Saved"} · {run.byId.get(last.node ?? "")?.title}
        </p>
        <p className="text-base font-semibold text-ink">
          {last.typed} — your call: <span className="font-bold">{last.call}</span>
        </p>
      </div>
    );
  const s = VERDICT_STYLE[last.verdict];
  return (
    <div aria-label="Last reading" className={`rounded-lg border-l-8 px-3 py-2 ${s.box}`}>
      <p className="text-sm font-semibold text-ink-soft">
        {last.pending ? "Saving" : "Saved"} · {run.byId.get(last.node ?? "")?.title}
      </p>
      <p className="text-base font-semibold text-ink">
        <span className="font-bold">{s.word}:</span> {last.message}
        {last.confirmed ? ` ${CONFIRMED_NOTE}` : ""}
      </p>
    </div>
  );
}
