// A reading in a practice run: the scenario says what the meter shows; the trainee types it (or
// takes it as shown) and makes their own call — low, within, high, marginal — before anything
// judges it. The run follows that call; the engine's verdict is kept beside it and shown at the end.
import { useId, useMemo, useState } from "react";
import { announce } from "~/components/Announcer";
import { computeLimits } from "~/engine/limits";
import type { MeasurementNode, VerdictKind } from "~/engine/types";
import { callsAt } from "~/engine/training/practice";
import { describeMeter, evaluateReading } from "~/engine/verdict";
import { composeReading, ConfirmBox, useTypedValue, ValueField } from "../Reading";
import type { RunHandle } from "../useRun";
import { ScriptedBox } from "./Scripted";

/** What each call means, in the trainee's words. */
export const CALL_WORDS: Record<VerdictKind, { word: string; detail: string }> = {
  low: { word: "Low", detail: "below the limits" },
  within: { word: "Within", detail: "inside the limits" },
  high: { word: "High", detail: "above the limits" },
  marginal: { word: "Marginal", detail: "too close to a limit to call — re-measure" },
};

export function PracticeReading({ node, run }: { node: MeasurementNode; run: RunHandle }) {
  const shows = run.view.practice?.world[node.id]?.shows;
  const typed = useTypedValue(node.quantity, node.unit);
  const { error, setError } = typed;
  const [call, setCall] = useState<VerdictKind | null>(null);
  const callName = useId();
  const variables = useMemo(
    () => Object.fromEntries(Object.entries(run.state.variables).map(([k, v]) => [k, v.value])),
    [run.state.variables],
  );
  const limits = computeLimits(node, variables);
  const reading = composeReading(typed.text, typed.unit);
  // Only what is wrong with the typing is shown here (a unit of another quantity…), never a verdict.
  const parsed = reading ? evaluateReading(node, reading, { variables }) : null;
  const problem = error ?? (parsed && !parsed.ok && parsed.code !== "limits" ? parsed.message : null);
  // An implausible reading is asked about as on a real run, without saying what it would count as.
  const confirm = parsed?.ok ? parsed.verdict.confirm : undefined;

  function refuse(message: string | null) {
    setError(message);
    if (message) announce(message, "assertive");
  }
  function save(confirmed = false) {
    if (!reading) return refuse("Type the reading first.");
    if (!call) return refuse("Make your call on the reading: which way does it go?");
    if (confirm && !confirmed) return announce(confirm.message, "assertive");
    refuse(
      run.submit(
        confirmed ? { type: "reading", node: node.id, reading, call, confirmed: true } : { type: "reading", node: node.id, reading, call },
      ),
    );
  }

  return (
    <form className="space-y-4" onSubmit={(e) => (e.preventDefault(), save())}>
      <div className="rounded-xl bg-card p-3 ring-1 ring-rule">
        <p className="text-base text-ink-soft">Expected</p>
        <p className="text-2xl font-bold">{limits.ok ? limits.limits.text : "—"}</p>
        {limits.ok && !limits.limits.fixed && <p className="text-base text-ink-soft">{limits.limits.derivation}</p>}
        {node.meter && <p className="text-base text-ink-soft">Meter accuracy {describeMeter(node.meter, node.unit)}</p>}
      </div>
      <ScriptedBox
        label="The meter shows"
        value={shows}
        missing="This practice gives no meter value here: type the reading you would expect, then make your call."
      >
        {shows && (
          <button type="button" className="btn-quiet mt-2 min-h-14 w-full text-base" onClick={() => typed.put(shows)}>
            Take the reading as shown
          </button>
        )}
      </ScriptedBox>
      <ValueField
        label="Reading"
        unitLabel="Unit of the reading"
        value={typed}
        problem={problem}
        suggestions={parsed && !parsed.ok ? parsed.suggestions : undefined}
      >
        {confirm ? <ConfirmBox confirm={confirm} typed={reading} onPick={typed.fill} onConfirm={() => save(true)} /> : null}
      </ValueField>
      <fieldset className="space-y-2">
        <legend className="field-label text-lg">Your call on this reading</legend>
        {callsAt(node).map((c) => (
          <label key={c} className="relative block">
            <input
              type="radio"
              name={callName}
              value={c}
              checked={call === c}
              onChange={() => (setCall(c), setError(null))}
              className="peer absolute left-4 top-1/2 size-6 -translate-y-1/2 cursor-pointer accent-practice"
            />
            <span className="flex min-h-16 cursor-pointer flex-col justify-center rounded-xl border-2 border-rule bg-card py-2 pl-14 pr-3 peer-checked:border-practice peer-checked:bg-practice-soft peer-focus-visible:outline-3 peer-focus-visible:outline-offset-2 peer-focus-visible:outline-focus">
              <span className="block text-xl font-bold leading-tight">{CALL_WORDS[c].word}</span>
              <span className="block text-base text-ink-soft">{CALL_WORDS[c].detail}</span>
            </span>
          </label>
        ))}
      </fieldset>
      <button type="submit" className="min-h-16 w-full rounded-xl bg-practice px-4 text-xl font-bold text-white">
        Save the reading and my call
      </button>
    </form>
  );
}
