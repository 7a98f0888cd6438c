// One screen per kind of step: what the technician reads and the one thing they do next.
import { useEffect, useId, useState } from "react";
import { announce } from "~/components/Announcer";
import type { CautionNode, QuestionNode, StepNode, TreeNode } from "~/engine/types";
import { Markdown } from "./Markdown";
import { MeasurementInput, NameplateInput } from "./Reading";
import { PracticeReading } from "./practice/PracticeReading";
import { LabelSays, Observation } from "./practice/Scripted";
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

/** A refused entry: shown under the control and said aloud at once. */
function useRefusal() {
  const [refused, setRefused] = useState<string | null>(null);
  const refuse = (message: string | null) => {
    setRefused(message);
    if (message) announce(message, "assertive");
  };
  const shown = refused ? <p className="field-error">{refused}</p> : null;
  return [shown, refuse] as const;
}

/** False for a moment after a screen appears: a double tap meant for the last screen does nothing here. */
function useSettled(ms = 600) {
  const [settled, setSettled] = useState(false);
  useEffect(() => {
    const t = setTimeout(() => setSettled(true), ms);
    return () => clearTimeout(t);
  }, [ms]);
  return settled;
}

/** A caution: its hazard's wording, then one large control that says what it acknowledges. */
function CautionScreen({ node, run }: { node: CautionNode; run: RunHandle }) {
  const [refusal, refuse] = useRefusal();
  const settled = useSettled();
  const hazard = node.hazard ?? "other";
  const safetyId = useId();
  return (
    <div className="space-y-4">
      <Markdown blocks={run.view.bodies[node.id]} className="text-lg" />
      <section id={safetyId} className="rounded-xl border-2 border-out bg-out-soft p-4 text-ink" aria-label="Safety">
        <p className="text-lg font-bold text-out">⚠ {HAZARD_TITLE[hazard]}</p>
        <p className="mt-1 text-lg">{HAZARD_WORDING[hazard]}</p>
        <p className="mt-2 text-base">{DEFER_WORDING}</p>
      </section>
      <button
        type="button"
        className="block min-h-20 w-full rounded-xl bg-copper px-4 py-3 text-left text-white hover:bg-copper-dark"
        disabled={!settled}
        aria-describedby={safetyId}
        onClick={() => refuse(run.submit({ type: "acknowledge", node: node.id }))}
      >
        <span className="block text-xl font-bold leading-tight">I have read this and made the work safe</span>
        <span className="mt-1 block text-base font-normal">Acknowledges the caution ‘{HAZARD_TITLE[hazard]}’ and goes on</span>
      </button>
      {refusal}
    </div>
  );
}

function QuestionScreen({ node, run }: { node: QuestionNode; run: RunHandle }) {
  const [refusal, refuse] = useRefusal();
  return (
    <div className="space-y-4">
      <Markdown blocks={run.view.bodies[node.id]} className="text-lg" />
      {run.view.run.practice && <Observation run={run} node={node.id} />}
      <div className="grid gap-3" role="group" aria-label="Answers">
        {node.answers.map((a) => (
          <button
            key={a.label}
            type="button"
            className="min-h-16 w-full rounded-xl border-2 border-ink bg-card px-4 py-3 text-left text-xl font-bold text-ink hover:bg-copper-soft active:bg-copper-soft"
            onClick={() => refuse(run.submit({ type: "answer", node: node.id, answer: a.label }))}
          >
            {a.label.charAt(0).toUpperCase() + a.label.slice(1)}
          </button>
        ))}
      </div>
      {refusal}
    </div>
  );
}

function InstructionScreen({ node, run }: { node: StepNode; run: RunHandle }) {
  const [refusal, refuse] = useRefusal();
  return (
    <div className="space-y-4">
      <Markdown blocks={run.view.bodies[node.id]} className="text-lg" />
      <button
        type="button"
        className="btn-primary min-h-16 w-full text-xl"
        onClick={() => refuse(run.submit({ type: "continue", node: node.id }))}
      >
        Done — next step
      </button>
      {refusal}
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
          {run.view.run.practice ? <PracticeReading node={node} run={run} /> : <MeasurementInput node={node} run={run} />}
        </div>
      );
    case "nameplate":
      return (
        <div className="space-y-4">
          <Markdown blocks={run.view.bodies[node.id]} className="text-lg" />
          {run.view.run.practice && <LabelSays run={run} node={node.id} />}
          <NameplateInput node={node} run={run} />
        </div>
      );
    default:
      return null;
  }
}
