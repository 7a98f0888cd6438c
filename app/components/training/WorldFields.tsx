// The world a trainee meets, step by step, as form fields: what they observe at each question and
// which answer it means, what the meter shows, what the label says. Steps on the way to the hidden
// fault come first; the rest are optional (what a trainee who strays finds). The hidden fault is
// chosen here too, so the split follows it as the trainer changes it.
import { useMemo, useState } from "react";
import { Labelled } from "~/components/Field";
import { formatLimits } from "~/engine/markdown/syntax";
import { nodesToward } from "~/engine/training/script";
import { computeLimits } from "~/engine/limits";
import type { MeasurementNode, Tree, TreeNode } from "~/engine/types";
import { distinctLabels } from "~/lib/node-labels";
import { scriptableSteps, worldField } from "~/lib/training";

/** The limits as the technician reads them when they are fixed, else as the author wrote them ("rated_uf ± 6 %"). */
function limitsText(node: MeasurementNode): string {
  const fixed = computeLimits(node, {});
  return fixed.ok ? fixed.limits.text : formatLimits(node.limits).replace(/`/g, "");
}

const KIND_WORD = { question: "Question", measurement: "Reading", nameplate: "Rating" } as const;

function StepFields({
  node,
  values,
  set,
  errors,
}: {
  node: TreeNode;
  values: Record<string, string>;
  set: (k: string, v: string) => void;
  errors: Record<string, string | undefined>;
}) {
  const field = (part: "observation" | "answer" | "shows" | "label") => worldField(node.id, part);
  const bind = (part: "observation" | "answer" | "shows" | "label") => ({
    name: field(part),
    value: values[field(part)] ?? "",
    onChange: (e: { target: { value: string } }) => set(field(part), e.target.value),
  });
  return (
    <fieldset className="card space-y-3">
      <legend className="sr-only">{`${KIND_WORD[node.kind as keyof typeof KIND_WORD]}: ${node.title}`}</legend>
      <p aria-hidden className="text-base font-bold">
        <span className="mr-2 text-sm font-semibold uppercase tracking-wide text-copper-dark">
          {KIND_WORD[node.kind as keyof typeof KIND_WORD]}
        </span>
        {node.title}
      </p>
      {node.kind === "question" && (
        <div className="grid gap-3 md:grid-cols-[2fr_1fr]">
          <Labelled
            label="What the trainee observes"
            hint="What they see, hear or feel — not the answer's words."
            error={errors[field("observation")]}
          >
            {(c) => <textarea {...c} {...bind("observation")} rows={2} className="field-input py-2" />}
          </Labelled>
          <Labelled label="Which answer that means" error={errors[field("answer")]}>
            {(c) => (
              <select {...c} {...bind("answer")} className="field-input">
                <option value="">Not scripted</option>
                {node.answers.map((a) => (
                  <option key={a.label} value={a.label}>
                    {a.label}
                  </option>
                ))}
              </select>
            )}
          </Labelled>
        </div>
      )}
      {node.kind === "measurement" && (
        <Labelled
          label="The meter shows"
          hint={`The value with its unit, in ${node.unit}. The step's limits: ${limitsText(node)}.`}
          error={errors[field("shows")]}
        >
          {(c) => <input {...c} {...bind("shows")} className="field-input max-w-xs" autoComplete="off" />}
        </Labelled>
      )}
      {node.kind === "nameplate" && (
        <Labelled label="The label says" hint={`The rating with its unit, in ${node.unit}.`} error={errors[field("label")]}>
          {(c) => <input {...c} {...bind("label")} className="field-input max-w-xs" autoComplete="off" />}
        </Labelled>
      )}
    </fieldset>
  );
}

export function WorldFields({
  tree,
  initial,
  errors,
  faultError,
}: {
  tree: Tree;
  initial: Record<string, string>;
  errors: Record<string, string | undefined>;
  faultError?: string;
}) {
  const [values, setValues] = useState(initial);
  const set = (k: string, v: string) => setValues((old) => ({ ...old, [k]: v }));
  const fault = values.fault ?? "";
  const steps = useMemo(() => scriptableSteps(tree), [tree]);
  const toward = useMemo(() => (fault ? nodesToward(tree, fault) : null), [tree, fault]);
  const onWay = steps.filter((n) => !toward || toward.has(n.id));
  const offWay = toward ? steps.filter((n) => !toward.has(n.id)) : [];
  const outcomes = tree.nodes.filter((n) => n.kind === "outcome");
  const outcomeLabels = distinctLabels(outcomes, (n) => n.title);
  return (
    <div className="space-y-4">
      <Labelled label="Hidden fault" hint="The root cause the trainee should reach: one of this version's outcomes." error={faultError}>
        {(c) => (
          <select {...c} name="fault" value={fault} onChange={(e) => set("fault", e.target.value)} className="field-input">
            <option value="">Choose the hidden fault…</option>
            {outcomes.map((n) => (
              <option key={n.id} value={n.id}>
                {outcomeLabels.get(n.id)}
              </option>
            ))}
          </select>
        )}
      </Labelled>
      <section className="space-y-3" aria-labelledby="on-way">
        <h2 id="on-way" className="text-lg font-bold">
          {fault ? "On the way to the hidden fault" : "What the trainee finds at each step"}
        </h2>
        <p className="text-ink-soft">
          {fault
            ? "Script each step the walk to the fault meets. Cautions and instructions need nothing: the trainee acknowledges them as on site."
            : "Choose the hidden fault first: the steps on the way to it come to the top."}
        </p>
        {onWay.map((n) => (
          <StepFields key={n.id} node={n} values={values} set={set} errors={errors} />
        ))}
      </section>
      {offWay.length > 0 && (
        <details className="space-y-3">
          <summary className="min-h-12 cursor-pointer py-2 text-lg font-bold">
            Steps off the way to the fault ({offWay.length}) — optional
          </summary>
          <p className="text-ink-soft">
            What a trainee who takes a wrong turn finds. Left blank, the phone says the practice gives nothing there.
          </p>
          {offWay.map((n) => (
            <StepFields key={n.id} node={n} values={values} set={set} errors={errors} />
          ))}
        </details>
      )}
    </div>
  );
}
