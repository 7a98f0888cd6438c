// The run stands at an outcome: the root cause, then what was done, the parts and the time, which
// close the run and make the report.
import { useState } from "react";
import { Field, Labelled } from "~/components/Field";
import type { OutcomeNode } from "~/engine/types";
import { FoundHereLine } from "../FoundHere";
import { Markdown } from "../Markdown";
import type { RunHandle } from "../useRun";
import { EndHeading } from "./EndHeading";

type PartRow = { partNumber: string; description: string; quantity: string };

export function OutcomeScreen({ node, run }: { node: OutcomeNode; run: RunHandle }) {
  const started = new Date(run.view.run.startedAt).getTime();
  const [action, setAction] = useState("");
  const [minutes, setMinutes] = useState(() => String(Math.max(1, Math.ceil((Date.now() - started) / 60_000))));
  const [parts, setParts] = useState<PartRow[]>([]);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const setPart = (i: number, patch: Partial<PartRow>) => setParts((ps) => ps.map((p, j) => (j === i ? { ...p, ...patch } : p)));

  async function finish() {
    const errs: Record<string, string> = {};
    if (action.trim().length < 3) errs.action = "Say what you did about it.";
    const m = Number(minutes);
    if (!Number.isInteger(m) || m < 1 || m > 1440) errs.minutes = "Whole minutes between 1 and 1440.";
    parts.forEach((p, i) => {
      if (!p.description.trim()) errs[`part-${i}`] = "Describe the part, or remove the row.";
      const q = Number(p.quantity);
      if (!Number.isInteger(q) || q < 1 || q > 999) errs[`qty-${i}`] = "A whole number from 1.";
    });
    setErrors(errs);
    if (Object.keys(errs).length) return;
    await run
      .recordOutcome({
        action: action.trim(),
        minutes: m,
        parts: parts.map((p) => ({ partNumber: p.partNumber.trim(), description: p.description.trim(), quantity: Number(p.quantity) })),
      })
      .catch(() => undefined);
  }

  return (
    <div className="space-y-5">
      <section className="rounded-xl border-2 border-within bg-within-soft p-4">
        <EndHeading kicker="Root cause found" title={node.title} tone="text-within" />
        <FoundHereLine run={run} node={node} />
        <p className="mt-2 text-lg">{node.remedy}</p>
        <Markdown blocks={run.view.bodies[node.id]} className="mt-2" />
      </section>
      <form
        className="space-y-5"
        noValidate
        onSubmit={(e) => {
          e.preventDefault();
          void finish();
        }}
      >
        <Labelled label="What you did" labelClassName="text-lg" error={errors.action}>
          {(control) => (
            <textarea {...control} value={action} onChange={(e) => setAction(e.target.value)} rows={4} className="field-input py-2" />
          )}
        </Labelled>
        <button type="button" className="btn-quiet -mt-3 min-h-14 w-full text-base" onClick={() => setAction(node.remedy)}>
          Start from the usual remedy
        </button>
        <fieldset className="space-y-3">
          <legend className="field-label text-lg">Parts used</legend>
          {node.parts.some((p) => !parts.some((x) => x.description === p)) && (
            <div className="space-y-2">
              <p className="text-base text-ink-soft">The procedure suggests:</p>
              {node.parts
                .filter((p) => !parts.some((x) => x.description === p))
                .map((p) => (
                  <button
                    key={p}
                    type="button"
                    className="btn-quiet min-h-14 w-full justify-start text-left text-base"
                    onClick={() => setParts((ps) => [...ps, { partNumber: "", description: p, quantity: "1" }])}
                  >
                    + {p}
                  </button>
                ))}
            </div>
          )}
          {parts.map((p, i) => (
            <div key={i} className="card space-y-2" aria-label={`Part ${i + 1}`}>
              <Field
                label="Description"
                name={`part-desc-${i}`}
                value={p.description}
                onChange={(e) => setPart(i, { description: e.target.value })}
                error={errors[`part-${i}`]}
              />
              <div className="grid grid-cols-[1fr_6rem] gap-2">
                <Field
                  label="Part number"
                  name={`part-no-${i}`}
                  value={p.partNumber}
                  onChange={(e) => setPart(i, { partNumber: e.target.value })}
                  autoCapitalize="characters"
                />
                <Field
                  label="Qty"
                  name={`part-qty-${i}`}
                  inputMode="numeric"
                  value={p.quantity}
                  onChange={(e) => setPart(i, { quantity: e.target.value })}
                  error={errors[`qty-${i}`]}
                />
              </div>
              <button
                type="button"
                className="btn-quiet min-h-12 w-full text-base"
                onClick={() => setParts((ps) => ps.filter((_, j) => j !== i))}
              >
                Remove this part
              </button>
            </div>
          ))}
          <button
            type="button"
            className="btn-quiet min-h-14 w-full"
            onClick={() => setParts((ps) => [...ps, { partNumber: "", description: "", quantity: "1" }])}
          >
            + Add another part
          </button>
        </fieldset>
        <Labelled label="Time on the job (minutes)" labelClassName="text-lg" error={errors.minutes}>
          {(control) => (
            <input
              {...control}
              className="field-input text-2xl"
              inputMode="numeric"
              value={minutes}
              onChange={(e) => setMinutes(e.target.value)}
            />
          )}
        </Labelled>
        <button type="submit" className="btn-primary min-h-16 w-full text-xl" disabled={run.outcomePending}>
          {run.outcomePending ? "Saving…" : "Finish and make the report"}
        </button>
      </form>
    </div>
  );
}
