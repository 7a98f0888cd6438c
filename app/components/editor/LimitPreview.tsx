// The live limit preview: type a sample reading and see the verdict the runner would give,
// computed by the engine itself ("1.40 µF → low: below 1.41 µF").
import { useId, useState } from "react";
import { Field } from "~/components/Field";
import { compileFormula } from "~/engine/formula";
import { limitFormulas, computeLimits } from "~/engine/limits";
import type { MeasurementNode, Tree } from "~/engine/types";
import { evaluateReading } from "~/engine/verdict";
import { sentence } from "./fields";

const VERDICT_STYLE = {
  low: "bg-out-soft text-out",
  high: "bg-out-soft text-out",
  within: "bg-within-soft text-within",
  marginal: "bg-marginal-soft text-marginal",
} as const;

/** Variables the limits read, with the unit each is recorded in (from the node that records it). */
export function limitVariables(node: MeasurementNode, tree: Tree): { name: string; unit: string | null }[] {
  const names = new Set<string>();
  for (const f of limitFormulas(node.limits)) {
    const c = compileFormula(f);
    if (c.ok) for (const v of c.formula.variables) names.add(v);
  }
  return [...names].map((name) => {
    const definer = tree.nodes.find((n) => (n.kind === "nameplate" || n.kind === "measurement") && n.variable === name);
    return { name, unit: definer && "unit" in definer ? definer.unit : null };
  });
}

export function LimitPreview({ node, tree }: { node: MeasurementNode; tree: Tree }) {
  const resultId = useId();
  const [reading, setReading] = useState("");
  const [samples, setSamples] = useState<Record<string, string>>({});
  const vars = limitVariables(node, tree);
  const values: Record<string, number> = {};
  for (const v of vars) {
    const n = Number(samples[v.name]);
    if (samples[v.name]?.trim() && Number.isFinite(n)) values[v.name] = n;
  }
  const limits = computeLimits(node, values);
  const result = reading.trim() ? evaluateReading(node, reading, { variables: values }) : null;
  return (
    <section aria-label="Try a reading" className="space-y-2 rounded-lg border border-copper/40 bg-copper-soft/40 p-3">
      <h3 className="font-bold">Try a reading</h3>
      {vars.map((v) => (
        <Field
          key={v.name}
          label={`Sample value of ${v.name}${v.unit ? ` (${v.unit})` : ""}`}
          name={`sample-${v.name}`}
          inputMode="decimal"
          value={samples[v.name] ?? ""}
          onChange={(e) => setSamples((x) => ({ ...x, [v.name]: e.target.value }))}
        />
      ))}
      <p className="text-sm">
        {limits.ok ? (
          <>
            Limits: <strong>{limits.limits.text}</strong>
            {!limits.limits.fixed && <> ({limits.limits.derivation})</>}
          </>
        ) : (
          <span className="text-ink-soft">{sentence(limits.message)}</span>
        )}
      </p>
      <Field
        label="Sample reading"
        name="sample-reading"
        value={reading}
        placeholder={`e.g. 1.40 ${node.unit}`}
        aria-describedby={resultId}
        onChange={(e) => setReading(e.target.value)}
      />
      <p id={resultId} aria-live="polite" className="min-h-7">
        {result &&
          (result.ok ? (
            <span className={`inline-block rounded-md px-2 py-1 font-semibold ${VERDICT_STYLE[result.verdict.verdict]}`}>
              {result.verdict.preview}
            </span>
          ) : (
            <span className="font-semibold text-out">{result.message}</span>
          ))}
      </p>
    </section>
  );
}
