// Verdicts: is a reading low, within or high against its limits? With a meter's stated
// accuracy and guarded acceptance (ILAC-G8:09/2019 §4.1–4.2, guard band w = U), a reading
// inside the limits but within U of one is *marginal*: re-measure or use a better meter.
// Simple acceptance (w = 0) is the default.
import type { Acceptance, MeasurementNode, Meter, Quantity, VerdictKind } from "./types";
import { computeLimits, showAt, showLimits, type ComputedLimits } from "./limits";
import { convertQty, isOverload, parseReading, resolveUnit, toSI, QUANTITY_INFO, type ParsedReading, type ReadingError } from "./units";
import { countDecimals, formatCompact, formatExact } from "./format";

export interface Uncertainty {
  /** Expanded uncertainty U in the display unit. */
  value: number;
  unit: string;
  /** "±1.5 V" */
  text: string;
  meter: Meter;
  /** "±(1 % + 3 counts) at 0.1 V" */
  meterText: string;
}

/**
 * A reading that parses and is judged, but is implausible enough that the technician must
 * confirm it before it counts (the run refuses it until the log entry says `confirmed: true`).
 * The rule is in docs/decisions/0103-impossible-and-implausible-readings.md.
 */
export interface Confirmation {
  /** "unit-slip": the same number in another unit of the step lands within the limits; "far-above": more than a thousand times the limits. */
  reason: "unit-slip" | "far-above";
  /** "That is 0.208 V — did you mean 208 V?" */
  message: string;
  /** What to enter instead, when a slip is likely: "208 V". */
  suggestion?: string;
}

export interface Verdict {
  verdict: VerdictKind;
  /** For marginal: which limit the reading is close to. */
  side?: "low" | "high";
  acceptance: Acceptance;
  reading: {
    /** In the display unit (for an overload: the least value the display implies — see `overload`). */
    value: number;
    unit: string;
    /** "1.47", "134.96", "OL" — what was typed, or the converted value with enough digits to tell it from its limit. */
    display: string;
    /** "1.47 µF", "57.2 °C = 134.96 °F", "OL" */
    text: string;
    /** What the technician typed. */
    typed: string;
    si: number;
    siUnit: string;
    /** True when typed in another unit than the step's own. */
    converted: boolean;
    /**
     * The meter showed overload ("OL"): there is no value. `value` then holds the top of the
     * meter's stated range, else the limit the reading is judged beyond — a lower bound.
     */
    overload?: true;
  };
  /** The limits applied (exact lo/hi) with their text at the digits this verdict shows. */
  limits: ComputedLimits;
  uncertainty?: Uncertainty;
  /** Under guarded acceptance: the acceptance limits (limit ∓ U, ILAC-G8 w = U) in the display unit, exact. */
  acceptanceZone?: { lo?: number; hi?: number };
  /** Under guarded acceptance: the acceptance limits and U as the message shows them. */
  acceptanceText?: { lo?: string; hi?: string; u: string };
  /** Set when the technician must confirm the reading before it counts. */
  confirm?: Confirmation;
  /** "1.47 µF — within 1.41–1.59 µF (1.5 µF ± 6 %)" */
  message: string;
  /** "1.40 µF → low: below 1.41 µF" for the live preview under the input. */
  preview: string;
}

export type VerdictError = ReadingError | { code: "limits"; message: string; suggestions?: string[] };
export type VerdictResult = { ok: true; verdict: Verdict } | ({ ok: false } & VerdictError);

export function describeMeter(m: Meter, unit: string): string {
  return `±(${formatExact(m.percent)} % + ${formatExact(m.counts)} count${m.counts === 1 ? "" : "s"}) at ${formatExact(m.resolution)} ${m.unit ?? unit}`;
}

/**
 * U = p/100 · |reading| + n · resolution, in the meter's own scale (its resolution unit), then
 * expressed as a span in the display unit. 120.0 V with ±(1.0 % + 3 counts) at 0.1 V → 1.5 V.
 */
export function meterUncertainty(meter: Meter, reading: number, quantity: Quantity, displayUnit: string): number | null {
  const scale = meter.unit ?? displayUnit;
  const dispAbs = resolveUnit(displayUnit, quantity);
  const meterAbs = resolveUnit(scale, quantity);
  const dispDiff = resolveUnit(displayUnit, quantity, true);
  const meterDiff = resolveUnit(scale, quantity, true);
  if (!dispAbs || !meterAbs || !dispDiff || !meterDiff || meterAbs.kind !== dispAbs.kind) return null;
  const r = convertQty(reading, dispAbs.qty, meterAbs.qty);
  const u = (Math.abs(meter.percent) / 100) * Math.abs(r) + Math.abs(meter.counts) * Math.abs(meter.resolution);
  const out = Math.abs(convertQty(u, meterDiff.qty, dispDiff.qty));
  return Number.isFinite(out) ? out : null;
}

/** The top of a meter's stated range in the display unit, when it states one. */
function rangeTop(meter: Meter | undefined, quantity: Quantity, displayUnit: string): number | undefined {
  if (!meter || meter.range === undefined || !(meter.range > 0)) return undefined;
  const from = resolveUnit(meter.unit ?? displayUnit, quantity);
  const to = resolveUnit(displayUnit, quantity);
  if (!from || !to || from.kind !== to.kind || from.absoluteTemperature !== to.absoluteTemperature) return undefined;
  const x = convertQty(meter.range, from.qty, to.qty);
  return Number.isFinite(x) ? x : undefined;
}

function eps(...xs: (number | undefined)[]): number {
  let m = 0;
  for (const x of xs) if (x !== undefined && Number.isFinite(x)) m = Math.max(m, Math.abs(x));
  return m * 1e-9 || 1e-300;
}

/**
 * The decision rule. Limits are inclusive. With u > 0 (guarded acceptance) the acceptance zone
 * is [lo + u, hi − u]; readings between a limit and its acceptance limit are marginal.
 */
export function judge(x: number, lo: number | undefined, hi: number | undefined, u = 0): { verdict: VerdictKind; side?: "low" | "high" } {
  const e = eps(x, lo, hi);
  if (lo !== undefined && x < lo - e) return { verdict: "low" };
  if (hi !== undefined && x > hi + e) return { verdict: "high" };
  if (u > 0) {
    const nearLo = lo !== undefined && x < lo + u - e;
    const nearHi = hi !== undefined && x > hi - u + e;
    if (nearLo && nearHi) return { verdict: "marginal", side: x - lo! <= hi! - x ? "low" : "high" };
    if (nearLo) return { verdict: "marginal", side: "low" };
    if (nearHi) return { verdict: "marginal", side: "high" };
  }
  return { verdict: "within" };
}

export interface EvaluateOptions {
  /** The run's variables (name → value in the recording step's unit). */
  variables?: Readonly<Record<string, number>>;
  /** The technician's own meter, overriding the node's (with its range, when the shop lists one). */
  meter?: Meter;
}

type JudgedNode = Pick<MeasurementNode, "quantity" | "unit" | "limits" | "meter" | "acceptance">;

/**
 * Judge a typed reading at a measurement node. Unparseable, wrong-dimension or impossible input
 * is an error, never a verdict; an implausible one is judged but carries `confirm`. Never throws.
 */
export function evaluateReading(node: JudgedNode, text: string, opts: EvaluateOptions = {}): VerdictResult {
  const overload = isOverload(text);
  const parsed = overload ? null : parseReading(text, node.quantity, node.unit);
  if (parsed && !parsed.ok) return parsed;
  const lim = computeLimits(node, opts.variables ?? {});
  if (!lim.ok) return { ok: false, code: "limits", message: `Can't judge this reading: ${lim.message}.` };
  const limits = lim.limits;
  const meter = opts.meter ?? node.meter;
  const top = rangeTop(meter, node.quantity, node.unit);
  if (!parsed) return judgeOverload(node, text, limits, meter, top);

  if (top !== undefined && Math.abs(parsed.value) > top + eps(top)) {
    return {
      ok: false,
      code: "over-range",
      message: `${readingEcho(parsed, node.unit, parsed.display)} is above the top of this meter's ${formatExact(meter!.range!)} ${meter!.unit ?? node.unit} range, so the meter can't have shown it: check the reading and the range setting.`,
    };
  }
  const acceptance: Acceptance = node.acceptance ?? "simple";
  let uncertainty: Uncertainty | undefined;
  if (meter) {
    const u = meterUncertainty(meter, parsed.value, node.quantity, node.unit);
    if (u !== null)
      uncertainty = {
        value: u,
        unit: node.unit,
        text: `±${formatCompact(u, 2)} ${node.unit}`,
        meter,
        meterText: describeMeter(meter, node.unit),
      };
  }
  const guardU = acceptance === "guarded" && uncertainty ? uncertainty.value : 0;
  const { verdict, side } = judge(parsed.value, limits.lo, limits.hi, guardU);
  const shown = showConsistently(parsed, limits, verdict, side, guardU);

  const unit = node.unit;
  const r = readingEcho(parsed, unit, shown.reading);
  const notes: string[] = [];
  if (!limits.fixed) notes.push(limits.derivation);
  if (uncertainty) notes.push(`meter ±${shown.u ?? formatCompact(uncertainty.value, 2)} ${unit}`);
  if (guardU > 0 && verdict === "within") {
    const { alLo, alHi } = shown;
    notes.push(
      `acceptance limits ${alLo !== undefined && alHi !== undefined ? `${alLo}–${alHi} ${unit}` : alLo !== undefined ? `from ${alLo} ${unit}` : `up to ${alHi} ${unit}`}`,
    );
  }
  const paren = notes.length ? ` (${notes.join("; ")})` : "";
  const L = shown.limits;
  const sep = limits.lo !== undefined && limits.hi !== undefined ? " " : ": ";
  let message: string;
  let preview: string;
  switch (verdict) {
    case "low":
      message = `${r} — low: below ${L.loText}${paren}`;
      preview = `${r} → low: below ${L.loText}`;
      break;
    case "high":
      message = `${r} — high: above ${L.hiText}${paren}`;
      preview = `${r} → high: above ${L.hiText}`;
      break;
    case "marginal": {
      // ILAC-G8:09/2019 §4.2.2 guarded acceptance, w = U: the acceptance limit is the limit moved in by U.
      const al = side === "low" ? shown.alLo! : shown.alHi!;
      const lim = side === "low" ? L.loText! : L.hiText!;
      const how = `${side === "low" ? "below" : "above"} the acceptance limit ${al} ${unit} (the ${side} limit ${lim} ${side === "low" ? "+" : "−"} the meter's ${shown.u} ${unit})`;
      const why = limits.fixed ? "" : ` (${limits.derivation})`;
      message = `${r} — marginal: inside ${L.text} but ${how}; re-measure or use a better meter${why}`;
      preview = `${r} → marginal: ${how}`;
      break;
    }
    default:
      message = `${r} — within${sep}${L.text}${paren}`;
      preview = `${r} → within${sep}${L.text}`;
  }
  const result: Verdict = {
    verdict,
    acceptance,
    reading: {
      value: parsed.value,
      unit,
      display: shown.reading,
      text: r,
      typed: text,
      si: parsed.si,
      siUnit: parsed.siUnit,
      converted: parsed.converted,
    },
    limits: { ...limits, ...L, decimals: shown.decimals },
    message,
    preview,
  };
  if (side) result.side = side;
  if (uncertainty) result.uncertainty = uncertainty;
  if (guardU > 0) {
    result.acceptanceZone = {};
    if (limits.lo !== undefined) result.acceptanceZone.lo = limits.lo + guardU;
    if (limits.hi !== undefined) result.acceptanceZone.hi = limits.hi - guardU;
    result.acceptanceText = { u: `${shown.u} ${unit}` };
    if (shown.alLo !== undefined) result.acceptanceText.lo = `${shown.alLo} ${unit}`;
    if (shown.alHi !== undefined) result.acceptanceText.hi = `${shown.alHi} ${unit}`;
  }
  const confirm = plausibility(node, parsed, limits, verdict, shown.reading, L);
  if (confirm) result.confirm = confirm;
  return { ok: true, verdict: result };
}

/** "57.2 °C = 134.96 °F" for a converted reading, "1.47 µF" otherwise. */
function readingEcho(p: ParsedReading, unit: string, shown: string): string {
  return p.converted ? `${p.typedNumber} ${p.typedUnit} = ${shown} ${unit}` : `${shown} ${unit}`;
}

interface Shown {
  reading: string;
  limits: { text: string; loText?: string; hiText?: string };
  decimals: number;
  alLo?: string;
  alHi?: string;
  /** U as shown, consistent with the acceptance limits shown (limit ∓ U = acceptance limit, digit for digit). */
  u?: string;
}

/**
 * Digits for the message: start from what was typed and the limits' own rounding, and add digits
 * (to a converted reading, to computed limits, to the acceptance limits) until the numbers shown
 * say what the verdict says — a low reading shows below its limit, a within one between them, a
 * marginal one between its limit and the acceptance limit. Judging is always on exact values.
 */
function showConsistently(
  p: ParsedReading,
  limits: ComputedLimits,
  verdict: VerdictKind,
  side: "low" | "high" | undefined,
  u: number,
): Shown {
  const { lo, hi } = limits;
  // U with at least two significant figures.
  const uDecimals = u > 0 ? Math.max(0, 1 - Math.floor(Math.log10(u))) : 0;
  let out!: Shown;
  // More digits for the limits first; a converted reading gains digits only when that isn't enough.
  const tries: [number, number][] = [];
  for (let k = 0; k <= 12; k++) {
    tries.push([k, 0]);
    if (k > 0 && p.converted && !/e/i.test(p.display)) tries.push([k, k]);
  }
  for (const [k, j] of tries) {
    const reading = j > 0 ? p.value.toFixed(Math.min(20, countDecimals(p.display) + j)) : p.display;
    const d = limits.decimals + k;
    const s: Shown = { reading, limits: showLimits(lo, hi, limits.unit, d), decimals: d };
    out = s;
    const x = Number(reading);
    let loS = lo === undefined ? undefined : Number(showAt(lo, d));
    let hiS = hi === undefined ? undefined : Number(showAt(hi, d));
    let ok: boolean;
    if (u > 0) {
      // Limits, U and acceptance limits at one number of decimals; the acceptance limits shown
      // are the limits shown ∓ the U shown, so the printed arithmetic holds digit for digit.
      const dA = Math.max(d, uDecimals);
      s.limits = showLimits(lo, hi, limits.unit, dA);
      s.decimals = dA;
      s.u = showAt(u, dA);
      const uS = Number(s.u);
      loS = lo === undefined ? undefined : Number(showAt(lo, dA));
      hiS = hi === undefined ? undefined : Number(showAt(hi, dA));
      if (loS !== undefined) s.alLo = showAt(loS + uS, dA);
      if (hiS !== undefined) s.alHi = showAt(hiS - uS, dA);
      const aLo = s.alLo === undefined ? undefined : Number(s.alLo);
      const aHi = s.alHi === undefined ? undefined : Number(s.alHi);
      if (verdict === "marginal") ok = side === "low" ? loS! <= x && x < aLo! : aHi! < x && x <= hiS!;
      else if (verdict === "within") ok = (aLo === undefined || aLo <= x) && (aHi === undefined || x <= aHi);
      else ok = verdict === "low" ? x < loS! : x > hiS!;
    } else if (verdict === "low") ok = x < loS!;
    else if (verdict === "high") ok = x > hiS!;
    else ok = (loS === undefined || loS <= x) && (hiS === undefined || x <= hiS);
    if (ok) break;
  }
  return out;
}

/**
 * A meter's overload display ("OL"): no value, only that it is above the meter's range — on an
 * ohmmeter, the open circuit. It counts as high when the step has an upper limit and either the
 * step measures resistance (open is as high as resistance goes) or the meter's stated range top
 * is at or above that limit; on a resistance step with only a lower limit it counts as within.
 * Otherwise the step can't judge it and the technician is asked to change range. Decision record
 * 0102; the tree branches on it as on any high (or within) reading.
 */
function judgeOverload(
  node: JudgedNode,
  text: string,
  limits: ComputedLimits,
  meter: Meter | undefined,
  top: number | undefined,
): VerdictResult {
  const { lo, hi } = limits;
  const resistance = node.quantity === "resistance";
  let verdict: "high" | "within" | null = null;
  if (hi !== undefined) {
    if (top !== undefined ? top >= hi - eps(hi) : resistance) verdict = "high";
  } else if (resistance && lo !== undefined && (top === undefined || top >= lo - eps(lo))) verdict = "within";
  const range =
    top !== undefined
      ? `above its ${formatExact(meter!.range!)} ${meter!.unit ?? node.unit} range`
      : resistance
        ? "an open circuit, or above its range"
        : "above its range";
  if (!verdict) {
    return {
      ok: false,
      code: "overload",
      message: `The meter shows overload (${range}), which doesn't say whether the reading is ${limits.text}: switch to a higher range and measure again.`,
    };
  }
  const bound = top ?? (verdict === "high" ? hi! : lo!);
  const display = resolveUnit(node.unit, node.quantity)!;
  const L = showLimits(lo, hi, limits.unit, limits.decimals);
  const paren = limits.fixed ? "" : ` (${limits.derivation})`;
  const judged = verdict === "high" ? `high, above ${L.hiText}` : `within: ${L.text}`;
  const why = top === undefined && resistance ? "open circuit" : range;
  return {
    ok: true,
    verdict: {
      verdict,
      acceptance: node.acceptance ?? "simple",
      reading: {
        value: bound,
        unit: node.unit,
        display: "OL",
        text: "OL",
        typed: text,
        si: toSI(bound, display, node.quantity),
        siUnit: QUANTITY_INFO[node.quantity].si,
        converted: false,
        overload: true,
      },
      limits,
      message: `OL — the meter shows overload (${why}): ${judged}${paren}`,
      preview: `OL (${why}) → ${judged}`,
    },
  };
}

/** Above this many times every limit, a reading needs confirming (not on resistance steps, where opens read far above). */
const FAR_ABOVE = 1000;

/**
 * Implausible readings, judged but to be confirmed before they count (decision record 0103):
 * - unit slip: out of the limits, while the same number in another of the step's units is
 *   within them ("208 mV" on a 191–218 V step → 208 V; a bare "1470" on a 1.41–1.59 µF step →
 *   1470 nF) — for a one-sided limit, within ten times of it on its good side; a reading in the
 *   step's own unit only against two-sided limits; never between temperature scales;
 * - far above: more than a thousand times the largest limit (not on resistance steps, and on
 *   temperature steps more than 1000 K (1800 °F) above the highest limit).
 * Readings far below the limits are never questioned: dead circuits, shorts and open capacitors
 * read near zero, and that is what the tree is there to find.
 */
function plausibility(
  node: JudgedNode,
  p: ParsedReading,
  limits: ComputedLimits,
  verdict: VerdictKind,
  shown: string,
  L: { loText?: string; hiText?: string; text: string },
): Confirmation | undefined {
  if (verdict !== "low" && verdict !== "high") return undefined;
  const { lo, hi } = limits;
  const display = resolveUnit(node.unit, node.quantity);
  const typed = resolveUnit(p.typedUnit, node.quantity);
  if (!display || !typed) return undefined;
  const that = `That is ${shown} ${node.unit}`;
  // Where the reading would have to land to count as a slip: inside two-sided limits; within a
  // factor of ten on the good side of a one-sided limit (anything below "at most 1 Ω" is within,
  // but 2 mΩ is no likelier a meaning of "2 kΩ" than the open contact it reads as).
  const band: [number, number] | null =
    lo !== undefined && hi !== undefined ? [lo, hi] : lo !== undefined ? (lo > 0 ? [lo, 10 * lo] : null) : hi! > 0 ? [hi! / 10, hi!] : null;
  // Temperature scales overlap in everyday ranges (60 °F and 60 °C are both real readings), so a
  // scale is never taken for a slip; units that differ by a factor are. A reading in the step's
  // own unit is taken as meant, unless the limits are two-sided (a bare 1470 on a 1.41–1.59 µF step).
  const slips =
    node.quantity === "temperature" || !band || (!p.converted && (lo === undefined || hi === undefined))
      ? []
      : [node.unit, ...QUANTITY_INFO[node.quantity].units];
  for (const label of slips) {
    const alt = resolveUnit(label, node.quantity);
    if (!alt || alt.qty === typed.qty || alt.kind !== display.kind || alt.absoluteTemperature !== display.absoluteTemperature) continue;
    const x = convertQty(p.typedValue, alt.qty, display.qty);
    if (Number.isFinite(x) && judge(x, band![0], band![1]).verdict === "within") {
      const suggestion = `${p.typedNumber} ${label}`;
      return { reason: "unit-slip", message: `${that} — did you mean ${suggestion}?`, suggestion };
    }
  }
  if (verdict !== "high" || node.quantity === "resistance") return undefined;
  const top = hi ?? lo!;
  if (node.quantity === "temperature") {
    const span = convertQty(1000, "degK", resolveUnit(node.unit, "temperature", true)?.qty ?? "degK");
    if (p.value - top > span)
      return {
        reason: "far-above",
        message: `${that}, more than ${formatCompact(span, 4)} ${node.unit} above ${hi !== undefined ? `the upper limit ${L.hiText}` : `the limit ${L.loText}`}: is that right?`,
      };
    return undefined;
  }
  const biggest = Math.max(Math.abs(lo ?? 0), Math.abs(hi ?? 0));
  if (biggest > 0 && Math.abs(p.value) > FAR_ABOVE * biggest) {
    return {
      reason: "far-above",
      message: `${that}, more than a thousand times ${hi !== undefined ? `the upper limit ${L.hiText}` : `the limit ${L.loText}`}: is that right?`,
    };
  }
  return undefined;
}
