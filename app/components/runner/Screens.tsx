// One screen per kind of step: what the technician reads and the one thing they do next.
import { useState } from "react";
import type { CautionNode, QuestionNode, StepNode, TreeNode } from "~/engine/types";
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
