// Typing a value with its unit: measurements (judged live by the engine, with the meter chosen)
// and nameplate ratings. Big input, unit buttons, the verdict under the number as it is typed.
import { useId, useMemo, useState } from "react";
import { computeLimits } from "~/engine/limits";
import type { MeasurementNode, NameplateNode, VerdictKind } from "~/engine/types";
import { parseReading, QUANTITY_INFO, unitQuantity } from "~/engine/units";
import { describeMeter, evaluateReading } from "~/engine/verdict";
import { meterAccuracy, type MeterView } from "~/lib/run-log";
import type { RunHandle } from "./useRun";

/** "1,47" → "1.47"; a bare number gets the chosen unit, a typed unit wins. */
export function composeReading(text: string, unit: string): string {
  let t = text.trim();
  if (/^[+-]?\d+,\d+$/.test(t.split(/\s+/)[0] ?? "")) t = t.replace(",", ".");
  if (!t) return "";
  return /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t) ? `${t} ${unit}` : t;
}

export const VERDICT_STYLE: Record<VerdictKind, { word: string; box: string }> = {
  within: { word: "Within limits", box: "border-within bg-within-soft text-within" },
  low: { word: "Low — out of limits", box: "border-out bg-out-soft text-out" },
  high: { word: "High — out of limits", box: "border-out bg-out-soft text-out" },
  marginal: { word: "Marginal — re-measure", box: "border-marginal bg-marginal-soft text-marginal" },
};

export function VerdictBox({ verdict, message, live }: { verdict: VerdictKind; message: string; live?: boolean }) {
  const s = VERDICT_STYLE[verdict];
  return (
    <div className={`rounded-xl border-2 p-3 ${s.box}`} role={live ? "status" : undefined} aria-live={live ? "polite" : undefined}>
      <p className="text-xl font-bold">{s.word}</p>
      <p className="text-lg font-semibold text-ink">{message}</p>
      {verdict === "marginal" && <p className="mt-1 text-base text-ink">Too close to a limit to call: check the leads and measure again.</p>}
    </div>
  );
}

function UnitButtons({ units, value, onChange, label }: { units: readonly string[]; value: string; onChange: (u: string) => void; label: string }) {
  return (
    <div role="radiogroup" aria-label={label} className="flex flex-wrap gap-2">
      {units.map((u) => (
        <button
          key={u}
          type="button"
          role="radio"
          aria-checked={u === value}
          onClick={() => onChange(u)}
          className={`min-h-14 min-w-16 rounded-lg border-2 px-4 text-xl font-bold ${u === value ? "border-ink bg-ink text-white" : "border-rule bg-card text-ink"}`}
        >
          {u}
        </button>
      ))}
    </div>
  );
}

function unitsFor(quantity: keyof typeof QUANTITY_INFO, own: string): string[] {
  const list = [...QUANTITY_INFO[quantity].units];
  return list.includes(own) ? list : [own, ...list];
}

function BigInput(props: { id: string; value: string; onChange: (v: string) => void; unit: string; invalid: boolean; describedBy?: string }) {
  return (
    <input
      id={props.id}
      value={props.value}
      onChange={(e) => props.onChange(e.target.value)}
      inputMode="decimal"
      autoComplete="off"
      autoCorrect="off"
      spellCheck={false}
      enterKeyHint="done"
      placeholder={`e.g. in ${props.unit}`}
      aria-invalid={props.invalid || undefined}
      aria-describedby={props.describedBy}
      className="block h-16 w-full rounded-xl border-2 border-ink bg-card px-4 text-3xl font-bold text-ink placeholder:text-lg placeholder:font-normal placeholder:text-ink-soft"
    />
  );
}

function defaultMeter(run: RunHandle, node: MeasurementNode, offered: MeterView[]): string {
  // The meter used last for this quantity in this run, else the procedure's own, else the first listed.
  for (let i = run.view.steps.length - 1; i >= 0; i--) {
    const s = run.view.steps[i]!;
    if (s.meterId && offered.some((m) => m.id === s.meterId)) return s.meterId;
  }
  if (node.meter) return "";
  return offered[0]?.id ?? "";
}

export function MeasurementInput({ node, run }: { node: MeasurementNode; run: RunHandle }) {
  const id = useId();
  const [text, setText] = useState("");
  const [unit, setUnit] = useState(node.unit);
  const [error, setError] = useState<string | null>(null);
  const offered = run.view.meters.filter((m) => m.quantity === node.quantity);
  const [meterId, setMeterId] = useState(() => defaultMeter(run, node, offered));
  const chosen = offered.find((m) => m.id === meterId);
  const meter = chosen ? meterAccuracy(chosen) : node.meter;
  const variables = useMemo(() => Object.fromEntries(Object.entries(run.state.variables).map(([k, v]) => [k, v.value])), [run.state.variables]);
  const limits = computeLimits(node, variables);
  const reading = composeReading(text, unit);
  const preview = reading ? evaluateReading(node, reading, meter ? { variables, meter } : { variables }) : null;
  const overRange = chosen && preview?.ok ? rangeWarning(preview.verdict.reading.si, chosen) : null;

  function save() {
    if (!reading) return setError("Type the reading first.");
    const refused = run.submit({ type: "reading", node: node.id, reading }, chosen?.id ?? null);
    setError(refused);
  }

  return (
    <form className="space-y-4" onSubmit={(e) => (e.preventDefault(), save())}>
      <div className="rounded-xl bg-card p-3 ring-1 ring-rule">
        <p className="text-base text-ink-soft">Expected</p>
        <p className="text-2xl font-bold">{limits.ok ? limits.limits.text : "—"}</p>
        {limits.ok && !limits.limits.fixed && <p className="text-base text-ink-soft">{limits.limits.derivation}</p>}
        {!limits.ok && <p className="field-error">{limits.message}</p>}
      </div>
      <div>
        <label htmlFor={id} className="field-label text-lg">
          Reading
        </label>
        <BigInput id={id} value={text} onChange={(v) => (setText(v), setError(null))} unit={unit} invalid={Boolean(error)} describedBy={error ? `${id}-err` : undefined} />
      </div>
      <UnitButtons units={unitsFor(node.quantity, node.unit)} value={unit} onChange={setUnit} label="Unit of the reading" />
      <div>
        <label htmlFor={`${id}-meter`} className="field-label">
          Meter
        </label>
        <select id={`${id}-meter`} value={meterId} onChange={(e) => setMeterId(e.target.value)} className="field-input min-h-14">
          {node.meter && <option value="">As the procedure assumes: {describeMeter(node.meter, node.unit)}</option>}
          {!node.meter && <option value="">Not listed (judge the reading as read)</option>}
          {offered.map((m) => (
            <option key={m.id} value={m.id}>
              {m.name}
            </option>
          ))}
        </select>
        {chosen && <p className="mt-1 text-base text-ink-soft">Accuracy {describeMeter(meterAccuracy(chosen), chosen.unit)}</p>}
      </div>
      {preview && !preview.ok && (
        <p id={`${id}-err`} className="field-error" role="status">
          {preview.message}
        </p>
      )}
      {preview?.ok && <VerdictBox verdict={preview.verdict.verdict} message={preview.verdict.message} live />}
      {overRange && <p className="font-semibold text-marginal">{overRange}</p>}
      {error && !(preview && !preview.ok) && (
        <p id={`${id}-err`} className="field-error" role="alert">
          {error}
        </p>
      )}
      <button type="submit" className="btn-primary min-h-16 w-full text-xl">
        Save reading
      </button>
    </form>
  );
}

function rangeWarning(si: number, m: MeterView): string | null {
  const top = parseReading(`${m.rangeMax} ${m.unit}`, m.quantity, m.unit);
  if (!top.ok) return null;
  return Math.abs(si) > Math.abs(top.si) ? `That is above this meter's ${m.rangeMax} ${m.unit} range: check the range setting.` : null;
}

export function NameplateInput({ node, run }: { node: NameplateNode; run: RunHandle }) {
  const id = useId();
  const [text, setText] = useState("");
  const [unit, setUnit] = useState(node.unit);
  const [error, setError] = useState<string | null>(null);
  const onFile = Object.entries(run.view.unit?.nameplate ?? {}).filter(([, v]) => unitQuantity(v.unit, node.quantity) === node.quantity);
  const value = composeReading(text, unit);
  const parsed = value ? parseReading(value, node.quantity, node.unit) : null;

  function save() {
    if (!value) return setError("Type the value from the nameplate first.");
    setError(run.submit({ type: "nameplate", node: node.id, value }));
  }

  return (
    <form className="space-y-4" onSubmit={(e) => (e.preventDefault(), save())}>
      {onFile.length > 0 && (
        <div>
          <p className="field-label">On file for this unit</p>
          <div className="flex flex-wrap gap-2">
            {onFile.map(([k, v]) => (
              <button key={k} type="button" className="btn-quiet min-h-14" onClick={() => (setText(String(v.value)), setUnit(v.unit), setError(null))}>
                Use {v.value} {v.unit}
              </button>
            ))}
          </div>
        </div>
      )}
      <div>
        <label htmlFor={id} className="field-label text-lg">
          Rated value
        </label>
        <BigInput id={id} value={text} onChange={(v) => (setText(v), setError(null))} unit={unit} invalid={Boolean(error || (parsed && !parsed.ok))} />
      </div>
      <UnitButtons units={unitsFor(node.quantity, node.unit)} value={unit} onChange={setUnit} label="Unit of the rating" />
      {parsed && !parsed.ok && <p className="field-error">{parsed.message}</p>}
      {parsed?.ok && (
        <p className="text-lg" role="status">
          Recorded as <strong>{parsed.display} {node.unit}</strong>
        </p>
      )}
      {error && (
        <p className="field-error" role="alert">
          {error}
        </p>
      )}
      <button type="submit" className="btn-primary min-h-16 w-full text-xl">
        Save rating
      </button>
    </form>
  );
}
