// One screen per kind of step: what the technician reads and the one thing they do next.
import { useState } from "react";
import type { CautionNode, OutcomeNode, QuestionNode, StepNode, TreeNode } from "~/engine/types";
import { Markdown } from "./Markdown";
import { MeasurementInput, NameplateInput } from "./Reading";
import { DEFER_WORDING, HAZARD_TITLE, HAZARD_WORDING } from "./safety";
import type { RunHandle } from "./useRun";

export const KIND_LABEL: Record<TreeNode["kind"], string> = {
  caution: "Safety first",
  question: "Check",
  measurement: "Take a reading",
  nameplate: "Read the rating",
  step: "Do this",
  outcome: "Root cause",
  escalate: "Hand over",
};

function Refusal({ message }: { message: string | null }) {
  return message ? (
    <p className="field-error" role="alert">
      {message}
    </p>
  ) : null;
}

function CautionScreen({ node, run }: { node: CautionNode; run: RunHandle }) {
  const [checked, setChecked] = useState(false);
  const [refused, setRefused] = useState<string | null>(null);
  const hazard = node.hazard ?? "other";
  return (
    <div className="space-y-4">
      <Markdown blocks={run.view.bodies[node.id]} className="text-lg" />
      <section className="rounded-xl border-2 border-out bg-out-soft p-4 text-ink" aria-label="Safety">
        <p className="text-lg font-bold text-out">⚠ {HAZARD_TITLE[hazard]}</p>
        <p className="mt-1 text-lg">{HAZARD_WORDING[hazard]}</p>
        <p className="mt-2 text-base">{DEFER_WORDING}</p>
      </section>
      <label className="flex min-h-16 cursor-pointer items-center gap-4 rounded-xl border-2 border-ink bg-card px-4 text-lg font-semibold">
        <input type="checkbox" className="h-8 w-8 shrink-0 accent-copper" checked={checked} onChange={(e) => setChecked(e.target.checked)} />
        I have read this and made the work safe
      </label>
      <button
        type="button"
        className="btn-primary min-h-16 w-full text-xl"
        disabled={!checked}
        onClick={() => setRefused(run.submit({ type: "acknowledge", node: node.id }))}
      >
        Continue
      </button>
      {!checked && <p className="text-center text-base text-ink-soft">Tick the box to continue.</p>}
      <Refusal message={refused} />
    </div>
  );
}

function QuestionScreen({ node, run }: { node: QuestionNode; run: RunHandle }) {
  const [refused, setRefused] = useState<string | null>(null);
  return (
    <div className="space-y-4">
      <Markdown blocks={run.view.bodies[node.id]} className="text-lg" />
      <div className="grid gap-3" role="group" aria-label="Answers">
        {node.answers.map((a) => (
          <button
            key={a.label}
            type="button"
            className="min-h-16 w-full rounded-xl border-2 border-ink bg-card px-4 py-3 text-left text-xl font-bold text-ink hover:bg-copper-soft active:bg-copper-soft"
            onClick={() => setRefused(run.submit({ type: "answer", node: node.id, answer: a.label }))}
          >
            {a.label.charAt(0).toUpperCase() + a.label.slice(1)}
          </button>
        ))}
      </div>
      <Refusal message={refused} />
    </div>
  );
}

function InstructionScreen({ node, run }: { node: StepNode; run: RunHandle }) {
  const [refused, setRefused] = useState<string | null>(null);
  return (
    <div className="space-y-4">
      <Markdown blocks={run.view.bodies[node.id]} className="text-lg" />
      <button type="button" className="btn-primary min-h-16 w-full text-xl" onClick={() => setRefused(run.submit({ type: "continue", node: node.id }))}>
        Done — next step
      </button>
      <Refusal message={refused} />
    </div>
  );
}

export function StepScreen({ node, run }: { node: TreeNode; run: RunHandle }) {
  switch (node.kind) {
    case "caution":
      return <CautionScreen node={node} run={run} />;
    case "question":
      return <QuestionScreen node={node} run={run} />;
    case "step":
      return <InstructionScreen node={node} run={run} />;
    case "measurement":
      return (
        <div className="space-y-4">
          <Markdown blocks={run.view.bodies[node.id]} className="text-lg" />
          <MeasurementInput node={node} run={run} />
        </div>
      );
    case "nameplate":
      return (
        <div className="space-y-4">
          <Markdown blocks={run.view.bodies[node.id]} className="text-lg" />
          <NameplateInput node={node} run={run} />
        </div>
      );
    default:
      return null;
  }
}

type PartRow = { partNumber: string; description: string; quantity: string };

/** The run stands at an outcome: what was done, parts and time, then the report. */
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
      .recordOutcome({ action: action.trim(), minutes: m, parts: parts.map((p) => ({ partNumber: p.partNumber.trim(), description: p.description.trim(), quantity: Number(p.quantity) })) })
      .catch(() => undefined);
  }

  return (
    <div className="space-y-5">
      <section className="rounded-xl border-2 border-within bg-within-soft p-4">
        <p className="text-base font-semibold uppercase tracking-wide text-within">Root cause found</p>
        <p className="text-2xl font-bold">{node.title}</p>
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
        <div>
          <label htmlFor="outcome-action" className="field-label text-lg">
            What you did
          </label>
          <textarea
            id="outcome-action"
            value={action}
            onChange={(e) => setAction(e.target.value)}
            rows={4}
            className="field-input py-2"
            aria-invalid={errors.action ? true : undefined}
          />
          <button type="button" className="btn-quiet mt-2 min-h-14 w-full text-base" onClick={() => setAction(node.remedy)}>
            Start from the usual remedy
          </button>
          {errors.action && <p className="field-error">{errors.action}</p>}
        </div>
        <fieldset className="space-y-3">
          <legend className="field-label text-lg">Parts used</legend>
          {node.parts.some((p) => !parts.some((x) => x.description === p)) && (
            <div className="space-y-2">
              <p className="text-base text-ink-soft">The procedure suggests:</p>
              {node.parts.filter((p) => !parts.some((x) => x.description === p)).map((p) => (
                <button key={p} type="button" className="btn-quiet min-h-14 w-full justify-start text-left text-base" onClick={() => setParts((ps) => [...ps, { partNumber: "", description: p, quantity: "1" }])}>
                  + {p}
                </button>
              ))}
            </div>
          )}
          {parts.map((p, i) => (
            <div key={i} className="card space-y-2" aria-label={`Part ${i + 1}`}>
              <div>
                <label className="field-label" htmlFor={`part-desc-${i}`}>
                  Description
                </label>
                <input id={`part-desc-${i}`} className="field-input" value={p.description} onChange={(e) => setPart(i, { description: e.target.value })} />
                {errors[`part-${i}`] && <p className="field-error">{errors[`part-${i}`]}</p>}
              </div>
              <div className="grid grid-cols-[1fr_6rem] gap-2">
                <div>
                  <label className="field-label" htmlFor={`part-no-${i}`}>
                    Part number
                  </label>
                  <input id={`part-no-${i}`} className="field-input" value={p.partNumber} onChange={(e) => setPart(i, { partNumber: e.target.value })} autoCapitalize="characters" />
                </div>
                <div>
                  <label className="field-label" htmlFor={`part-qty-${i}`}>
                    Qty
                  </label>
                  <input id={`part-qty-${i}`} className="field-input" inputMode="numeric" value={p.quantity} onChange={(e) => setPart(i, { quantity: e.target.value })} />
                  {errors[`qty-${i}`] && <p className="field-error">{errors[`qty-${i}`]}</p>}
                </div>
              </div>
              <button type="button" className="btn-quiet min-h-12 w-full text-base" onClick={() => setParts((ps) => ps.filter((_, j) => j !== i))}>
                Remove this part
              </button>
            </div>
          ))}
          <button type="button" className="btn-quiet min-h-14 w-full" onClick={() => setParts((ps) => [...ps, { partNumber: "", description: "", quantity: "1" }])}>
            + Add another part
          </button>
        </fieldset>
        <div>
          <label htmlFor="outcome-minutes" className="field-label text-lg">
            Time on the job (minutes)
          </label>
          <input id="outcome-minutes" className="field-input text-2xl" inputMode="numeric" value={minutes} onChange={(e) => setMinutes(e.target.value)} aria-invalid={errors.minutes ? true : undefined} />
          {errors.minutes && <p className="field-error">{errors.minutes}</p>}
        </div>
        <button type="submit" className="btn-primary min-h-16 w-full text-xl" disabled={run.outcomePending}>
          {run.outcomePending ? "Saving…" : "Finish and make the report"}
        </button>
      </form>
    </div>
  );
}
