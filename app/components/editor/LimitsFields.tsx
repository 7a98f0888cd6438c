// A measurement's limits, meter accuracy and acceptance rule, as form fields. Every change is
// checked against the engine's schema for a measurement before it reaches the draft.
import { LETTER_PERCENT } from "~/engine/limits";
import { QUANTITY_INFO } from "~/engine/units";
import {
  TOLERANCE_LETTERS,
  type LimitValue,
  type Limits,
  type MeasurementNode,
  type Meter,
  type Tolerance,
  type ToleranceLetter,
} from "~/engine/types";
import { Check, parseNumber, SelectField, TextField } from "./fields";

type Try = (node: MeasurementNode) => string | null;

const LIMIT_KINDS = [
  { value: "range", label: "Between a lowest and a highest value" },
  { value: "atLeast", label: "At least a value" },
  { value: "atMost", label: "At most a value" },
  { value: "nominal", label: "A rated value with a tolerance" },
] as const;

function valuesOf(l: Limits): LimitValue[] {
  return l.kind === "range" ? [l.min, l.max] : l.kind === "atLeast" ? [l.min] : l.kind === "atMost" ? [l.max] : [l.nominal];
}

/** New limits of another kind, carrying over the values already typed. */
export function switchLimits(l: Limits, kind: Limits["kind"]): Limits {
  const [a, b] = valuesOf(l);
  const first = a ?? { value: 0 };
  switch (kind) {
    case "range":
      return { kind, min: first, max: b ?? first };
    case "atLeast":
      return { kind, min: first };
    case "atMost":
      return { kind, max: b ?? first };
    case "nominal":
      return { kind, nominal: first, tolerance: { kind: "percent", plus: 0, minus: 0 } };
  }
}

/** `v` with its optional unit set, or removed when blank. */
function withUnit<T extends { unit?: string }>(v: T, unit: string): T {
  const u = unit.trim();
  const { unit: _drop, ...rest } = v;
  return (u ? { ...rest, unit: u } : rest) as T;
}

/** The optional unit of a value, a tolerance or a meter's resolution; blank means the reading's. */
function UnitField<T extends { unit?: string }>({
  label,
  of,
  readingUnit,
  suggestions,
  onValue,
}: {
  label: string;
  of: T;
  readingUnit: string;
  suggestions: readonly string[];
  onValue: (v: T) => string | null;
}) {
  // Blank means the reading's own unit, which the placeholder shows.
  return (
    <TextField
      label={label}
      initial={of.unit ?? ""}
      placeholder={readingUnit}
      suggestions={suggestions}
      onText={(raw) => onValue(withUnit(of, raw))}
    />
  );
}

function LimitValueField({
  label,
  value,
  readingUnit,
  unitSuggestions,
  onValue,
}: {
  label: string;
  value: LimitValue;
  readingUnit: string;
  unitSuggestions: readonly string[];
  onValue: (v: LimitValue) => string | null;
}) {
  const mode = "formula" in value ? "formula" : "number";
  return (
    <fieldset className="space-y-2 rounded-lg border border-rule p-3">
      <legend className="px-1 font-semibold">{label}</legend>
      <SelectField
        label={`${label}: given as`}
        value={mode}
        options={[
          { value: "number", label: "A number" },
          { value: "formula", label: "A formula over values recorded earlier" },
        ]}
        onChange={(m) =>
          onValue(
            withUnit<LimitValue>(
              m === "formula" ? { formula: "formula" in value ? value.formula : "rated_value" } : { value: 0 },
              value.unit ?? "",
            ),
          )
        }
      />
      <div className="grid gap-2 sm:grid-cols-[1fr_7rem]" key={mode}>
        {mode === "number" ? (
          <TextField
            label={`${label} (number)`}
            initial={"value" in value ? String(value.value) : ""}
            inputMode="decimal"
            onText={(raw) => {
              const n = parseNumber(raw);
              return typeof n === "number" ? onValue(withUnit<LimitValue>({ value: n }, value.unit ?? "")) : n.error;
            }}
          />
        ) : (
          <TextField
            label={`${label} (formula)`}
            hint="Names of recorded values with + − × ÷, like rated_uf or volts^2 / watts."
            initial={"formula" in value ? value.formula : ""}
            onText={(raw) => onValue(withUnit<LimitValue>({ formula: raw.trim() }, value.unit ?? ""))}
          />
        )}
        <UnitField label={`${label}: unit`} of={value} readingUnit={readingUnit} suggestions={unitSuggestions} onValue={onValue} />
      </div>
    </fieldset>
  );
}

function ToleranceFields({
  tolerance,
  unit,
  unitSuggestions,
  onTolerance,
}: {
  tolerance: Tolerance;
  unit: string;
  unitSuggestions: readonly string[];
  onTolerance: (t: Tolerance) => string | null;
}) {
  const side = (which: "plus" | "minus") => (
    <TextField
      label={which === "plus" ? "Above the rated value by" : "Below the rated value by"}
      initial={tolerance.kind === "letter" ? "" : String(tolerance[which])}
      inputMode="decimal"
      onText={(raw) => {
        const n = parseNumber(raw);
        if (typeof n !== "number") return n.error;
        if (tolerance.kind === "letter") return null;
        return onTolerance({ ...tolerance, [which]: n });
      }}
    />
  );
  return (
    <fieldset className="space-y-2 rounded-lg border border-rule p-3">
      <legend className="px-1 font-semibold">Tolerance</legend>
      <SelectField
        label="Tolerance given as"
        value={tolerance.kind}
        options={[
          { value: "percent", label: "Percent of the rated value" },
          { value: "absolute", label: `An amount (in ${unit} unless you say)` },
          { value: "letter", label: "A tolerance letter (IEC 60062)" },
        ]}
        onChange={(k) =>
          onTolerance(
            k === "letter"
              ? { kind: "letter", letter: "J" }
              : {
                  kind: k,
                  plus: tolerance.kind === "letter" ? 0 : tolerance.plus,
                  minus: tolerance.kind === "letter" ? 0 : tolerance.minus,
                },
          )
        }
      />
      {tolerance.kind === "letter" ? (
        <SelectField<ToleranceLetter>
          label="Letter"
          value={tolerance.letter}
          options={TOLERANCE_LETTERS.map((l) => {
            const p = LETTER_PERCENT[l];
            return { value: l, label: p.plus === p.minus ? `${l}: ± ${p.plus} %` : `${l}: +${p.plus} % / −${p.minus} %` };
          })}
          onChange={(letter) => onTolerance({ kind: "letter", letter })}
        />
      ) : (
        <div className="grid gap-2 sm:grid-cols-2" key={tolerance.kind}>
          {side("plus")}
          {side("minus")}
          {tolerance.kind === "absolute" && (
            <UnitField label="Unit of the amount" of={tolerance} readingUnit={unit} suggestions={unitSuggestions} onValue={onTolerance} />
          )}
        </div>
      )}
      <p className="text-sm text-ink-soft">{tolerance.kind === "letter" ? "" : "Write sizes, not signs: 6 and 6 for ± 6 %."}</p>
    </fieldset>
  );
}

function MeterFields({
  meter,
  unit,
  unitSuggestions,
  onMeter,
}: {
  meter: Meter;
  unit: string;
  unitSuggestions: readonly string[];
  onMeter: (m: Meter) => string | null;
}) {
  const num = (key: "percent" | "counts" | "resolution", label: string, hint?: string) => (
    <TextField
      label={label}
      hint={hint}
      initial={String(meter[key])}
      inputMode="decimal"
      onText={(raw) => {
        const n = parseNumber(raw);
        return typeof n === "number" ? onMeter({ ...meter, [key]: n }) : n.error;
      }}
    />
  );
  return (
    <div className="grid gap-2 sm:grid-cols-2">
      {num("percent", "± percent of the reading")}
      {num("counts", "Plus counts", "Counts of the last digit.")}
      {num("resolution", "Resolution (one count)", `Like 0.1 for a 0.1 ${unit} display.`)}
      <UnitField label="Unit of the resolution" of={meter} readingUnit={unit} suggestions={unitSuggestions} onValue={onMeter} />
    </div>
  );
}

/** Limits, meter and acceptance of a measurement. */
export function LimitsFields({ node, tryNode }: { node: MeasurementNode; tryNode: Try }) {
  const L = node.limits;
  const units = QUANTITY_INFO[node.quantity].units;
  const setLimits = (limits: Limits) => tryNode({ ...node, limits });
  const valueField = (label: string, v: LimitValue, put: (v: LimitValue) => Limits) => (
    <LimitValueField label={label} value={v} readingUnit={node.unit} unitSuggestions={units} onValue={(nv) => setLimits(put(nv))} />
  );
  const withoutMeter = () => {
    const { meter: _drop, ...rest } = node;
    return rest as MeasurementNode;
  };
  return (
    <div className="space-y-3">
      <SelectField label="Limits" value={L.kind} options={LIMIT_KINDS} onChange={(k) => setLimits(switchLimits(L, k))} />
      <div className="space-y-3" key={L.kind}>
        {L.kind === "range" && (
          <>
            {valueField("Lowest good reading", L.min, (min) => ({ ...L, min }))}
            {valueField("Highest good reading", L.max, (max) => ({ ...L, max }))}
          </>
        )}
        {L.kind === "atLeast" && valueField("Lowest good reading", L.min, (min) => ({ ...L, min }))}
        {L.kind === "atMost" && valueField("Highest good reading", L.max, (max) => ({ ...L, max }))}
        {L.kind === "nominal" && (
          <>
            {valueField("Rated value", L.nominal, (nominal) => ({ ...L, nominal }))}
            <ToleranceFields
              tolerance={L.tolerance}
              unit={node.unit}
              unitSuggestions={units}
              onTolerance={(tolerance) => setLimits({ ...L, tolerance })}
            />
          </>
        )}
      </div>
      <Check
        label="Take the meter's accuracy into account"
        hint="Its stated accuracy, ±(percent of reading + counts)."
        checked={Boolean(node.meter)}
        onChange={(on) => tryNode(on ? { ...node, meter: { percent: 1, counts: 2, resolution: 0.1 } } : withoutMeter())}
      />
      {node.meter && (
        <MeterFields meter={node.meter} unit={node.unit} unitSuggestions={units} onMeter={(meter) => tryNode({ ...node, meter })} />
      )}
      <SelectField
        label="Judging readings near a limit"
        value={node.acceptance ?? "simple"}
        options={[
          { value: "simple", label: "Simple: inside the limits counts as within" },
          { value: "guarded", label: "Guarded: within the meter's accuracy of a limit is marginal" },
        ]}
        onChange={(a) => {
          const { acceptance: _drop, ...rest } = node;
          tryNode(a === "guarded" ? { ...rest, acceptance: "guarded" } : (rest as MeasurementNode));
        }}
      />
    </div>
  );
}
