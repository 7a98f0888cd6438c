// Limits of a measurement, computed for a run: fixed min/max, one-sided, nominal ± tolerance
// (percent, absolute or an IEC 60062 letter) and derived values from formulas over the run's
// variables. Everything comes out in the node's display unit.
import type { Limits, LimitValue, Quantity, Tolerance, ToleranceLetter } from "./types";
import { compileFormula } from "./formula";
import { belowAbsoluteZero, convertQty, resolveUnit } from "./units";
import { formatCompact, formatExact } from "./format";

/** IEC 60062:2016 clause 5 tolerance letters, in percent of the nominal value. */
export const LETTER_PERCENT: Readonly<Record<ToleranceLetter, { plus: number; minus: number }>> = {
  B: { plus: 0.1, minus: 0.1 },
  C: { plus: 0.25, minus: 0.25 },
  D: { plus: 0.5, minus: 0.5 },
  F: { plus: 1, minus: 1 },
  G: { plus: 2, minus: 2 },
  J: { plus: 5, minus: 5 },
  K: { plus: 10, minus: 10 },
  M: { plus: 20, minus: 20 },
  Z: { plus: 80, minus: 20 },
};
/** Below 10 pF, B, C and D are absolute: ±0.1, ±0.25, ±0.5 pF (IEC 60062). */
export const LETTER_SMALL_CAP_PF: Readonly<Partial<Record<ToleranceLetter, number>>> = { B: 0.1, C: 0.25, D: 0.5 };

export interface LimitsNode {
  quantity: Quantity;
  unit: string;
  limits: Limits;
}

export interface FormulaUse {
  source: string;
  /** Result in the node's display unit. */
  value: number;
  inputs: Record<string, number>;
}

export interface ComputedLimits {
  /** Lower limit in the display unit (absent for "at most"), exact: verdicts are judged against it. */
  lo?: number;
  /** Upper limit in the display unit (absent for "at least"), exact. */
  hi?: number;
  /** The nominal in the display unit, when the limits have one (unrounded). */
  nominal?: number;
  /** The display unit, as the author wrote it. */
  unit: string;
  /** "1.41–1.59 µF", "at least 135 °F", "at most 41 °F". */
  text: string;
  /** Each limit as shown: "1.41 µF". */
  loText?: string;
  hiText?: string;
  /** How they came about: "1.5 µF ± 6 %", "10.91 Ω ± 10 %, from volts^2 / watts", "191 V to 218 V". */
  derivation: string;
  /** True when the limits are plain numbers in the display unit (then the derivation adds nothing). */
  fixed: boolean;
  formulas: FormulaUse[];
  /** Decimal places of the limits as shown in `text` (lo and hi are exact; only the text is rounded). */
  decimals: number;
}

export type LimitsResult =
  | { ok: true; limits: ComputedLimits }
  | { ok: false; code: "unknown-unit" | "wrong-dimension" | "formula" | "missing-variable" | "inverted" | "impossible"; message: string };

class LimitsError extends Error {
  constructor(
    readonly code: Exclude<LimitsResult, { ok: true }>["code"],
    message: string,
  ) {
    super(message);
  }
}

/** The display text of a unit suffix: "µF" → " µF", "%" → " %". */
const withUnit = (n: string, unit: string) => `${n} ${unit}`;

function trimZeros(s: string): string {
  return s.includes(".") ? s.replace(/0+$/, "").replace(/\.$/, "") : s;
}

function fmt(x: number): string {
  return formatCompact(x, 4);
}

interface Ctx {
  node: LimitsNode;
  displayQty: string;
  vars: Readonly<Record<string, number>>;
  formulas: FormulaUse[];
  exact: boolean;
}

/** A limit value in the display unit, and how to write it. */
function valueOf(v: LimitValue, ctx: Ctx): { x: number; text: string; bare?: string } {
  const unit = v.unit ?? ctx.node.unit;
  const r = resolveUnit(unit, ctx.node.quantity);
  if (!r) throw new LimitsError("unknown-unit", `‘${unit}’ isn't a unit Cluepath knows`);
  const display = resolveUnit(ctx.node.unit, ctx.node.quantity);
  if (!display) throw new LimitsError("unknown-unit", `‘${ctx.node.unit}’ isn't a unit Cluepath knows`);
  if (r.kind !== display.kind || r.absoluteTemperature !== display.absoluteTemperature) {
    throw new LimitsError("wrong-dimension", `a limit in ${unit} can't apply to a reading in ${ctx.node.unit}`);
  }
  let raw: number;
  let text: string;
  let bare: string | undefined;
  if ("formula" in v) {
    const c = compileFormula(v.formula);
    if (!c.ok) throw new LimitsError("formula", `the formula ‘${v.formula}’ can't be used: ${c.message}`);
    const inputs: Record<string, number> = {};
    for (const name of c.formula.variables) {
      const val = Object.hasOwn(ctx.vars, name) ? ctx.vars[name] : undefined;
      if (val === undefined) {
        throw new LimitsError("missing-variable", `the limits need ‘${name}’, which this run hasn't recorded yet`);
      }
      inputs[name] = val;
    }
    try {
      raw = c.formula.evaluate(ctx.vars);
    } catch (e) {
      throw new LimitsError("formula", e instanceof Error ? e.message : String(e));
    }
    ctx.exact = false;
    const value = convertQty(raw, r.qty, display.qty);
    ctx.formulas.push({ source: v.formula, value, inputs });
    text = withUnit(fmt(raw), unit);
    if (!/^[A-Za-z][A-Za-z0-9_]*$/.test(v.formula)) bare = v.formula;
    return { x: value, text, bare };
  }
  raw = v.value;
  text = withUnit(formatExact(raw), unit);
  if (r.qty !== display.qty) ctx.exact = false;
  return { x: convertQty(raw, r.qty, display.qty), text };
}

function toleranceSpan(t: Tolerance, nominal: number, ctx: Ctx): { plus: number; minus: number; text: string } {
  if (t.kind === "percent") {
    const text = t.plus === t.minus ? `± ${formatExact(t.plus)} %` : `+${formatExact(t.plus)} % / −${formatExact(t.minus)} %`;
    return { plus: (Math.abs(nominal) * t.plus) / 100, minus: (Math.abs(nominal) * t.minus) / 100, text };
  }
  if (t.kind === "absolute") {
    const unit = t.unit ?? ctx.node.unit;
    const r = resolveUnit(unit, ctx.node.quantity, true);
    const d = resolveUnit(ctx.node.unit, ctx.node.quantity, true);
    if (!r || !d) throw new LimitsError("unknown-unit", `‘${unit}’ isn't a unit Cluepath knows`);
    if (r.kind !== d.kind) throw new LimitsError("wrong-dimension", `a tolerance in ${unit} can't apply to a reading in ${ctx.node.unit}`);
    const text =
      t.plus === t.minus
        ? `± ${withUnit(formatExact(t.plus), unit)}`
        : `+${withUnit(formatExact(t.plus), unit)} / −${withUnit(formatExact(t.minus), unit)}`;
    if (r.qty !== d.qty) ctx.exact = false;
    return { plus: convertQty(t.plus, r.qty, d.qty), minus: convertQty(t.minus, r.qty, d.qty), text };
  }
  // IEC 60062 letter.
  const small = LETTER_SMALL_CAP_PF[t.letter];
  if (small !== undefined && ctx.node.quantity === "capacitance") {
    const d = resolveUnit(ctx.node.unit, "capacitance");
    if (d && Math.abs(convertQty(nominal, d.qty, "pF")) < 10) {
      const span = convertQty(small, "pF", d.qty);
      return { plus: span, minus: span, text: `letter ${t.letter} (± ${small} pF)` };
    }
  }
  const p = LETTER_PERCENT[t.letter];
  const text = p.plus === p.minus ? `letter ${t.letter} (± ${p.plus} %)` : `letter ${t.letter} (+${p.plus} % / −${p.minus} %)`;
  return { plus: (Math.abs(nominal) * p.plus) / 100, minus: (Math.abs(nominal) * p.minus) / 100, text };
}

function joinFrom(base: string, parts: { bare?: string | undefined }[]): string {
  let from = "";
  for (const p of parts) if (p.bare) from += (from ? " and " : "") + p.bare;
  return from ? `${base}, from ${from}` : base;
}

/** A limit to `decimals` places, trailing zeros dropped: 1.41, 1102.83, 191. */
export function showAt(x: number, decimals: number): string {
  return trimZeros(x.toFixed(Math.min(20, Math.max(0, decimals))));
}

/** The decimals a plain number needs to be shown exactly (at most 12): 191 → 0, 1.41 → 2. */
function exactDecimals(x: number): number {
  for (let d = 0; d < 12; d++) if (Number(x.toFixed(d)) === x) return d;
  return 12;
}

/** The text of limits at `decimals` places: "1.41–1.59 µF", "at least 135 °F". */
export function showLimits(
  lo: number | undefined,
  hi: number | undefined,
  unit: string,
  decimals: number,
): { text: string; loText?: string; hiText?: string } {
  const loText = lo !== undefined ? `${showAt(lo, decimals)} ${unit}` : undefined;
  const hiText = hi !== undefined ? `${showAt(hi, decimals)} ${unit}` : undefined;
  const text =
    lo !== undefined && hi !== undefined
      ? `${showAt(lo, decimals)}–${hiText}`
      : loText !== undefined
        ? `at least ${loText}`
        : `at most ${hiText}`;
  const out: { text: string; loText?: string; hiText?: string } = { text };
  if (loText !== undefined) out.loText = loText;
  if (hiText !== undefined) out.hiText = hiText;
  return out;
}

/** Limits for a node given the run's variables (name → value in the recording node's unit). */
export function computeLimits(node: LimitsNode, vars: Readonly<Record<string, number>> = {}): LimitsResult {
  const display = resolveUnit(node.unit, node.quantity);
  if (!display) return { ok: false, code: "unknown-unit", message: `‘${node.unit}’ isn't a unit Cluepath knows` };
  const ctx: Ctx = { node, displayQty: display.qty, vars, formulas: [], exact: true };
  try {
    const L = node.limits;
    let lo: number | undefined;
    let hi: number | undefined;
    let nominal: number | undefined;
    let derivation: string;
    switch (L.kind) {
      case "range": {
        const a = valueOf(L.min, ctx);
        const b = valueOf(L.max, ctx);
        lo = a.x;
        hi = b.x;
        derivation = joinFrom(`${a.text} to ${b.text}`, [a, b]);
        break;
      }
      case "atLeast": {
        const a = valueOf(L.min, ctx);
        lo = a.x;
        derivation = joinFrom(`at least ${a.text}`, [a]);
        break;
      }
      case "atMost": {
        const b = valueOf(L.max, ctx);
        hi = b.x;
        derivation = joinFrom(`at most ${b.text}`, [b]);
        break;
      }
      case "nominal": {
        const n = valueOf(L.nominal, ctx);
        nominal = n.x;
        const span = toleranceSpan(L.tolerance, n.x, ctx);
        lo = n.x - span.minus;
        hi = n.x + span.plus;
        ctx.exact = false;
        derivation = joinFrom(`${n.text} ${span.text}`, [n]);
        break;
      }
    }
    if (lo !== undefined && hi !== undefined && lo > hi) {
      throw new LimitsError("inverted", `the lower limit ${fmt(lo)} ${node.unit} is above the upper limit ${fmt(hi)} ${node.unit}`);
    }
    for (const x of [lo, hi]) {
      if (x === undefined) continue;
      if (!Number.isFinite(x)) throw new LimitsError("impossible", "a limit comes out as no finite number");
      if (belowAbsoluteZero(x, display)) throw new LimitsError("impossible", `the limit ${fmt(x)} ${node.unit} is below absolute zero`);
    }
    // Verdicts are judged against these exact limits; only the text is rounded: to a step of
    // at most 1 % of the span between them (1.41–1.59 µF, 4695.3–4704.7 Ω), or to 4
    // significant figures for a lone computed limit. Limits given as plain numbers in the
    // display unit show as written. A verdict may show more digits (see showLimits).
    let decimals: number;
    if (ctx.exact) decimals = Math.max(lo === undefined ? 0 : exactDecimals(lo), hi === undefined ? 0 : exactDecimals(hi));
    else {
      const span = lo !== undefined && hi !== undefined ? hi - lo : 0;
      if (span > 0) decimals = Math.min(12, Math.max(0, -Math.floor(Math.log10(span / 100))));
      else {
        const x = Math.abs(lo ?? hi ?? 0);
        decimals = x === 0 ? 0 : Math.min(12, Math.max(0, 3 - Math.floor(Math.log10(x))));
      }
    }
    const shown = showLimits(lo, hi, node.unit, decimals);
    const limits: ComputedLimits = {
      unit: node.unit,
      text: shown.text,
      derivation,
      fixed: ctx.exact && ctx.formulas.length === 0,
      formulas: ctx.formulas,
      decimals,
    };
    if (lo !== undefined) limits.lo = lo;
    if (hi !== undefined) limits.hi = hi;
    if (shown.loText !== undefined) limits.loText = shown.loText;
    if (shown.hiText !== undefined) limits.hiText = shown.hiText;
    if (nominal !== undefined) limits.nominal = nominal;
    return { ok: true, limits };
  } catch (e) {
    if (e instanceof LimitsError) return { ok: false, code: e.code, message: e.message };
    return { ok: false, code: "impossible", message: e instanceof Error ? e.message.toLowerCase() : String(e) };
  }
}

/** Every formula in a set of limits (for validation and data-flow). */
export function limitFormulas(limits: Limits): string[] {
  const vals: LimitValue[] =
    limits.kind === "range"
      ? [limits.min, limits.max]
      : limits.kind === "atLeast"
        ? [limits.min]
        : limits.kind === "atMost"
          ? [limits.max]
          : [limits.nominal];
  const out: string[] = [];
  for (const v of vals) if ("formula" in v) out.push(v.formula);
  return out;
}

/** Which verdict branches these limits can produce (marginal only under guarded acceptance). */
export function possibleVerdicts(limits: Limits, guarded: boolean): ("low" | "within" | "high" | "marginal")[] {
  const out: ("low" | "within" | "high" | "marginal")[] = [];
  if (limits.kind !== "atMost") out.push("low");
  out.push("within");
  if (limits.kind !== "atLeast") out.push("high");
  if (guarded) out.push("marginal");
  return out;
}
