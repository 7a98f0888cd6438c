// Typing a value with its unit: measurements (judged live by the engine, with the meter chosen)
// and nameplate ratings. Big input; right under it, in view above the phone's keyboard, the
// verdict (or what is wrong with what was typed) as it is typed; then the unit and the meter.
import { useId, useMemo, useRef, useState, type ReactNode } from "react";
import { announce } from "~/components/Announcer";
import { Labelled } from "~/components/Field";
import { computeLimits } from "~/engine/limits";
import type { MeasurementNode, NameplateNode, Quantity, VerdictKind } from "~/engine/types";
import { parseRating, QUANTITY_INFO, unitQuantity, type ParseReadingResult } from "~/engine/units";
import { describeMeter, evaluateReading, type Confirmation, type Verdict } from "~/engine/verdict";
import { meterAccuracy, type MeterView } from "~/lib/run-log";
import { useKeepInView } from "./inView";
import type { RunHandle } from "./useRun";

/** "1,47" → "1.47"; a bare number gets the chosen unit, a typed unit wins. */
export function composeReading(text: string, unit: string): string {
  let t = text.trim();
  if (/^[+-]?\d+,\d+$/.test(t.split(/\s+/)[0] ?? "")) t = t.replace(",", ".");
  if (!t) return "";
  return /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t) ? `${t} ${unit}` : t;
}

/**
 * What a suggestion ("208 V", "1.47 µF") puts back in the form: the number in the field and its
 * unit among the step's unit buttons when it is one of them; otherwise the whole text in the field.
 */
export function fillFrom(suggestion: string, units: readonly string[]): { text: string; unit: string | null } {
  const m = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s+(\S.*)$/.exec(suggestion.trim());
  return m && units.includes(m[2]!) ? { text: m[1]!, unit: m[2]! } : { text: suggestion.trim(), unit: null };
}

/** What a typed-value form keeps: the text, the unit button chosen and the last refusal on Save. */
export function useTypedValue(quantity: Quantity, own: string) {
  const units = unitsFor(quantity, own);
  const [text, setText] = useState("");
  const [unit, setUnit] = useState(own);
  const [error, setError] = useState<string | null>(null);
  /** A value (and its unit, when given) in the form; any change clears the last refusal. */
  const put = (value: string, u?: string | null) => {
    setText(value);
    if (u) setUnit(u);
    setError(null);
  };
  /** A suggestion back in the form: the number in the field, its unit on the buttons. */
  const fill = (suggestion: string) => {
    const f = fillFrom(suggestion, units);
    put(f.text, f.unit);
  };
  return { text, unit, units, error, setError, put, fill, pickUnit: (u: string) => (setUnit(u), setError(null)) };
}
export type TypedValue = ReturnType<typeof useTypedValue>;

/** What a nameplate value was understood as: "1.5 µF", or "1500 nF = 1.5 µF" when it was converted. */
export function ratingEcho(p: Extract<ParseReadingResult, { ok: true }>, unit: string): string {
  return p.converted ? `${p.typedNumber} ${p.typedUnit} = ${p.display} ${unit}` : `${p.display} ${unit}`;
}

export const VERDICT_STYLE: Record<VerdictKind, { word: string; box: string }> = {
  within: { word: "Within limits", box: "border-within bg-within-soft text-within" },
  low: { word: "Low — out of limits", box: "border-out bg-out-soft text-out" },
  high: { word: "High — out of limits", box: "border-out bg-out-soft text-out" },
  marginal: { word: "Marginal — re-measure", box: "border-marginal bg-marginal-soft text-marginal" },
};

export function VerdictBox({ verdict, message }: { verdict: VerdictKind; message: string }) {
  const s = VERDICT_STYLE[verdict];
  return (
    <div className={`rounded-xl border-2 p-3 ${s.box}`}>
      <p className="text-xl font-bold">{s.word}</p>
      <p className="text-lg font-semibold text-ink">{message}</p>
      {verdict === "marginal" && (
        <p className="mt-1 text-base text-ink">Too close to a limit to call: check the leads and measure again.</p>
      )}
    </div>
  );
}

/**
 * The typed value and, right under it, what Cluepath makes of it. The part under the field is a
 * live region that is always there (so screen readers read each new verdict); a refusal on Save
 * is also said aloud at once. Kept in view while the field has focus. What was probably meant
 * shows as buttons with the problem (not with a refusal on Save); the unit buttons follow.
 */
export function ValueField({
  label,
  unitLabel,
  value,
  problem,
  suggestions,
  children,
}: {
  label: string;
  unitLabel: string;
  value: TypedValue;
  problem: string | null;
  suggestions?: readonly string[];
  children: ReactNode;
}) {
  const group = useRef<HTMLDivElement>(null);
  const id = useId();
  useKeepInView(group);
  return (
    <>
      <div ref={group} className="space-y-2">
        <Labelled id={id} label={label} labelClassName="text-lg">
          {(control) => (
            <input
              {...control}
              aria-invalid={problem ? true : undefined}
              aria-describedby={`${id}-said`}
              value={value.text}
              onChange={(e) => value.put(e.target.value)}
              inputMode="decimal"
              autoComplete="off"
              autoCorrect="off"
              spellCheck={false}
              enterKeyHint="done"
              placeholder={`e.g. in ${value.unit}`}
              className="block h-16 w-full rounded-xl border-2 border-ink bg-card px-4 text-3xl font-bold text-ink placeholder:text-lg placeholder:font-normal placeholder:text-ink-soft"
            />
          )}
        </Labelled>
        <div id={`${id}-said`} role="status" aria-live="polite" aria-atomic="true">
          {problem ? <p className="field-error">{problem}</p> : children}
        </div>
        {problem && !value.error && <Suggestions list={suggestions} onPick={value.fill} />}
      </div>
      {/* Outside the group kept in view: the field and its verdict must fit above the keyboard. */}
      <UnitButtons units={value.units} value={value.unit} onChange={value.pickUnit} label={unitLabel} />
    </>
  );
}

/** What was probably meant, as buttons that fill the field ("Use 208 V"). */
export function Suggestions({ list, onPick }: { list: readonly string[] | undefined; onPick: (s: string) => void }) {
  if (!list?.length) return null;
  return (
    <div className="flex flex-wrap gap-2" role="group" aria-label="Did you mean">
      {list.map((x) => (
        <button key={x} type="button" className="btn-quiet min-h-14 text-lg" onClick={() => onPick(x)}>
          Use {x}
        </button>
      ))}
    </div>
  );
}

/**
 * An implausible reading (decision 0103): the engine's question beside the field, what was probably
 * meant as a button that fills the field, and "Yes, … is right" to save it as typed, confirmed.
 * What it would count as stays visible, so confirming is an informed choice (not in practice, where
 * the trainee makes their own call first).
 */
export function ConfirmBox({
  confirm,
  verdict,
  typed,
  onPick,
  onConfirm,
}: {
  confirm: Confirmation;
  verdict?: Verdict;
  typed: string;
  onPick: (s: string) => void;
  onConfirm: () => void;
}) {
  return (
    <div className="space-y-3 rounded-xl border-2 border-marginal bg-marginal-soft p-3" role="group" aria-label="Check this reading">
      <p className="text-xl font-bold text-marginal">Check this reading</p>
      <p className="text-lg font-semibold text-ink">{confirm.message}</p>
      <Suggestions list={confirm.suggestion ? [confirm.suggestion] : undefined} onPick={onPick} />
      <button type="button" className="btn-primary min-h-14 w-full text-lg" onClick={onConfirm}>
        Yes, {typed} is right
      </button>
      {verdict && <p className="text-base text-ink">If it is right, it counts as: {verdict.message}</p>}
    </div>
  );
}

/** One radio group (one Tab stop, arrow keys move) drawn as big buttons. */
export function UnitButtons({
  units,
  value,
  onChange,
  label,
}: {
  units: readonly string[];
  value: string;
  onChange: (u: string) => void;
  label: string;
}) {
  const name = useId();
  return (
    <fieldset>
      <legend className="sr-only">{label}</legend>
      <div className="flex flex-wrap gap-2">
        {units.map((u) => (
          <label key={u} className="relative">
            <input
              type="radio"
              name={name}
              value={u}
              checked={u === value}
              onChange={() => onChange(u)}
              className="peer absolute inset-0 h-full w-full cursor-pointer opacity-0"
            />
            <span className="flex min-h-14 min-w-16 items-center justify-center rounded-lg border-2 border-rule bg-card px-4 text-xl font-bold text-ink peer-checked:border-ink peer-checked:bg-ink peer-checked:text-white peer-focus-visible:outline-3 peer-focus-visible:outline-offset-2 peer-focus-visible:outline-focus">
              {u}
            </span>
          </label>
        ))}
      </div>
    </fieldset>
  );
}

/** The meters a reading can be judged with, each with its whole name and accuracy (nothing cut off). */
function MeterChoice({
  node,
  offered,
  value,
  onChange,
}: {
  node: MeasurementNode;
  offered: MeterView[];
  value: string;
  onChange: (id: string) => void;
}) {
  const name = useId();
  const options = [
    node.meter
      ? { id: "", title: "As the procedure assumes", detail: `Accuracy ${describeMeter(node.meter, node.unit)}` }
      : { id: "", title: "Not listed", detail: "The reading is judged as read." },
    ...offered.map((m) => ({
      id: m.id,
      title: m.name,
      detail: `Accuracy ${describeMeter(meterAccuracy(m), m.unit)}, range up to ${m.rangeMax} ${m.unit}`,
    })),
  ];
  return (
    <fieldset className="space-y-2">
      <legend className="field-label">Meter</legend>
      {options.map((o) => (
        <label key={o.id || "own"} className="relative block">
          <input
            type="radio"
            name={name}
            value={o.id}
            checked={o.id === value}
            onChange={() => onChange(o.id)}
            className="peer absolute left-4 top-4 size-6 cursor-pointer accent-copper"
          />
          <span className="block min-h-14 cursor-pointer rounded-lg border-2 border-rule bg-card py-2 pl-14 pr-3 peer-checked:border-ink peer-focus-visible:outline-3 peer-focus-visible:outline-offset-2 peer-focus-visible:outline-focus">
            <span className="block text-lg font-semibold leading-snug">{o.title}</span>
            <span className="block text-base text-ink-soft">{o.detail}</span>
          </span>
        </label>
      ))}
    </fieldset>
  );
}

export function unitsFor(quantity: keyof typeof QUANTITY_INFO, own: string): string[] {
  const list = [...QUANTITY_INFO[quantity].units];
  return list.includes(own) ? list : [own, ...list];
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

/** Save: the engine's refusal (or a missing value) is shown under the field and said aloud. */
function refuse(setError: (e: string | null) => void, message: string | null) {
  setError(message);
  if (message) announce(message, "assertive");
}

export function MeasurementInput({ node, run }: { node: MeasurementNode; run: RunHandle }) {
  const typed = useTypedValue(node.quantity, node.unit);
  const { error, setError } = typed;
  const offered = run.view.meters.filter((m) => m.quantity === node.quantity);
  const [meterId, setMeterId] = useState(() => defaultMeter(run, node, offered));
  const chosen = offered.find((m) => m.id === meterId);
  const meter = chosen ? meterAccuracy(chosen) : node.meter;
  const variables = useMemo(
    () => Object.fromEntries(Object.entries(run.state.variables).map(([k, v]) => [k, v.value])),
    [run.state.variables],
  );
  const limits = computeLimits(node, variables);
  const reading = composeReading(typed.text, typed.unit);
  // The meter's range goes with its accuracy: a reading above it is refused, "OL" judged against it.
  const preview = reading ? evaluateReading(node, reading, meter ? { variables, meter } : { variables }) : null;
  const confirm = preview?.ok ? preview.verdict.confirm : undefined;
  // One message at a time: a refusal on Save, else what is wrong with what is typed.
  const problem = error ?? (preview && !preview.ok ? preview.message : null);

  function save(confirmed = false) {
    if (!reading) return refuse(setError, "Type the reading first.");
    // Asked, not refused: the question is already beside the field; say it aloud again.
    if (confirm && !confirmed) return announce(confirm.message, "assertive");
    refuse(
      setError,
      run.submit(
        confirmed ? { type: "reading", node: node.id, reading, confirmed: true } : { type: "reading", node: node.id, reading },
        chosen?.id ?? null,
      ),
    );
  }

  return (
    <form className="space-y-4" onSubmit={(e) => (e.preventDefault(), save())}>
      <div className="rounded-xl bg-card p-3 ring-1 ring-rule">
        <p className="text-base text-ink-soft">Expected</p>
        <p className="text-2xl font-bold">{limits.ok ? limits.limits.text : "—"}</p>
        {limits.ok && !limits.limits.fixed && <p className="text-base text-ink-soft">{limits.limits.derivation}</p>}
        {!limits.ok && <p className="field-error">{limits.message}</p>}
      </div>
      <ValueField
        label="Reading"
        unitLabel="Unit of the reading"
        value={typed}
        problem={problem}
        suggestions={preview && !preview.ok ? preview.suggestions : undefined}
      >
        {preview?.ok &&
          (confirm ? (
            <ConfirmBox confirm={confirm} verdict={preview.verdict} typed={reading} onPick={typed.fill} onConfirm={() => save(true)} />
          ) : (
            <VerdictBox verdict={preview.verdict.verdict} message={preview.verdict.message} />
          ))}
      </ValueField>
      <MeterChoice node={node} offered={offered} value={meterId} onChange={setMeterId} />
      <button type="submit" className="btn-primary min-h-16 w-full text-xl">
        Save reading
      </button>
    </form>
  );
}

export function NameplateInput({ node, run }: { node: NameplateNode; run: RunHandle }) {
  const typed = useTypedValue(node.quantity, node.unit);
  const { error, setError } = typed;
  const onFile = Object.entries(run.view.unit?.nameplate ?? {}).filter(([, v]) => unitQuantity(v.unit, node.quantity) === node.quantity);
  const value = composeReading(typed.text, typed.unit);
  // Read as the server will (a rating is above zero), so what it understood shows before Save.
  const parsed = value ? parseRating(value, node.quantity, node.unit) : null;
  const problem = error ?? (parsed && !parsed.ok ? parsed.message : null);

  function save() {
    if (!value) return refuse(setError, "Type the value from the nameplate first.");
    refuse(setError, run.submit({ type: "nameplate", node: node.id, value }));
  }

  return (
    <form className="space-y-4" onSubmit={(e) => (e.preventDefault(), save())}>
      {onFile.length > 0 && (
        <div>
          <p className="field-label">On file for this unit</p>
          <div className="flex flex-wrap gap-2">
            {onFile.map(([k, v]) => (
              <button key={k} type="button" className="btn-quiet min-h-14" onClick={() => typed.put(String(v.value), v.unit)}>
                Use {v.value} {v.unit}
              </button>
            ))}
          </div>
        </div>
      )}
      <ValueField
        label="Rated value"
        unitLabel="Unit of the rating"
        value={typed}
        problem={problem}
        suggestions={parsed && !parsed.ok ? parsed.suggestions : undefined}
      >
        {parsed?.ok && (
          <p className="text-lg">
            Understood as <strong>{ratingEcho(parsed, node.unit)}</strong>
          </p>
        )}
      </ValueField>
      <button type="submit" className="btn-primary min-h-16 w-full text-xl">
        Save rating
      </button>
    </form>
  );
}
