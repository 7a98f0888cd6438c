// What the practice scenario shows the trainee at a step: what they see on the unit, what the
// meter reads, what the label says — in the practice colour, so it is never taken for a real unit.
import type { ReactNode } from "react";
import type { RunHandle } from "../useRun";

export function ScriptedBox({
  label,
  value,
  missing,
  children,
}: {
  label: string;
  value: string | undefined;
  missing: string;
  children?: ReactNode;
}) {
  return (
    <section className="rounded-xl border-2 border-practice bg-practice-soft p-3" aria-label={label}>
      <p className="text-base font-semibold text-practice">{label}</p>
      {value ? <p className="text-2xl font-bold leading-snug text-ink">{value}</p> : <p className="text-lg text-ink">{missing}</p>}
      {children}
    </section>
  );
}

/** At a question: what the trainee observes on the unit. */
export function Observation({ run, node }: { run: RunHandle; node: string }) {
  const seen = run.view.practice?.world[node]?.observation;
  return (
    <ScriptedBox
      label="On the unit you find"
      value={seen}
      missing="This practice gives no observation here: answer from what you know of the unit so far."
    />
  );
}

/** At a nameplate input: what the label says. */
export function LabelSays({ run, node }: { run: RunHandle; node: string }) {
  return (
    <ScriptedBox
      label="The label says"
      value={run.view.practice?.world[node]?.label}
      missing="This practice gives no label here: type the rating you would expect."
    />
  );
}

/** The practice strip under the runner's top bar, on every screen. */
export function PracticeBanner({ run }: { run: RunHandle }) {
  const p = run.view.practice;
  return (
    <div className="bg-practice px-3 py-1 text-center text-base font-bold text-white" role="note">
      Practice{p ? ` · ${p.scenario.name}` : ""} — no customer, no report
    </div>
  );
}

/** The call the trainee is on, shown before the first step. */
export function PracticeBrief({ run }: { run: RunHandle }) {
  const p = run.view.practice;
  if (!p) return null;
  return (
    <section className="rounded-xl border-2 border-practice bg-card p-4" aria-label="The practice call">
      <p className="text-base font-semibold uppercase tracking-wide text-practice">The practice call</p>
      <p className="mt-1 text-xl font-semibold">“{p.scenario.complaint}”</p>
      <p className="text-lg text-ink-soft">{p.scenario.unitText}</p>
      <p className="mt-2 text-base">
        Work it as on site. At each reading, make your own call before anything judges it: the run follows your call.
      </p>
    </section>
  );
}
