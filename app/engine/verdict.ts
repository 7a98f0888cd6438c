// Verdicts: is a reading low, within or high against its limits? With a meter's stated
// accuracy and guarded acceptance (ILAC-G8:09/2019 §4.1–4.2, guard band w = U), a reading
// inside the limits but within U of one is *marginal*: re-measure or use a better meter.
// Simple acceptance (w = 0) is the default.
import type { Acceptance, MeasurementNode, Meter, Quantity, VerdictKind } from "./types";
import { computeLimits, type ComputedLimits } from "./limits";
import { convertQty, parseReading, resolveUnit, type ReadingError } from "./units";
import { formatCompact, formatExact } from "./format";

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

export interface Verdict {
  verdict: VerdictKind;
  /** For marginal: which limit the reading is close to. */
  side?: "low" | "high";
  acceptance: Acceptance;
  reading: {
    /** In the display unit. */
    value: number;
    unit: string;
    /** "1.47" — formatted to suit what was typed. */
    display: string;
    /** "1.47 µF" */
    text: string;
    /** What the technician typed. */
    typed: string;
    si: number;
    siUnit: string;
  };
  limits: ComputedLimits;
  uncertainty?: Uncertainty;
  /** Under guarded acceptance: the acceptance zone in the display unit. */
  acceptanceZone?: { lo?: number; hi?: number };
  /** "1.47 µF — within 1.41–1.59 µF (1.5 µF ± 6 %)" */
  message: string;
  /** "1.40 µF → low: below 1.41 µF" for the live preview under the input. */
  preview: string;
}

export type VerdictError = ReadingError | { code: "limits"; message: string };
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
  return Math.abs(convertQty(u, meterDiff.qty, dispDiff.qty));
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
  /** The technician's own meter, overriding the node's. */
  meter?: Meter;
}

/** Judge a typed reading at a measurement node. Unparseable or wrong-dimension input is an error, never a verdict. */
export function evaluateReading(
  node: Pick<MeasurementNode, "quantity" | "unit" | "limits" | "meter" | "acceptance">,
  text: string,
  opts: EvaluateOptions = {},
): VerdictResult {
  const parsed = parseReading(text, node.quantity, node.unit);
  if (!parsed.ok) return { ok: false, code: parsed.code, message: parsed.message };
  const lim = computeLimits(node, opts.variables ?? {});
  if (!lim.ok) return { ok: false, code: "limits", message: `Can't judge this reading: ${lim.message}.` };
  const limits = lim.limits;
  const acceptance: Acceptance = node.acceptance ?? "simple";
  const meter = opts.meter ?? node.meter;
  let uncertainty: Uncertainty | undefined;
  if (meter) {
    const u = meterUncertainty(meter, parsed.value, node.quantity, node.unit);
    if (u !== null) {
      uncertainty = {
        value: u,
        unit: node.unit,
        text: `±${formatCompact(u, 2)} ${node.unit}`,
        meter,
        meterText: describeMeter(meter, node.unit),
      };
    }
  }
  const guardU = acceptance === "guarded" && uncertainty ? uncertainty.value : 0;
  const { verdict, side } = judge(parsed.value, limits.lo, limits.hi, guardU);

  const r = `${parsed.display} ${node.unit}`;
  const notes: string[] = [];
  if (!limits.fixed) notes.push(limits.derivation);
  if (uncertainty) notes.push(`meter ${uncertainty.text}`);
  const paren = notes.length ? ` (${notes.join("; ")})` : "";
  const loText = limits.loText ?? "";
  const hiText = limits.hiText ?? "";
  let message: string;
  let preview: string;
  switch (verdict) {
    case "low":
      message = `${r} — low: below ${loText}${paren}`;
      preview = `${r} → low: below ${loText}`;
      break;
    case "high":
      message = `${r} — high: above ${hiText}${paren}`;
      preview = `${r} → high: above ${hiText}`;
      break;
    case "marginal": {
      const limitText = side === "low" ? loText : hiText;
      const why = limits.fixed ? "" : ` (${limits.derivation})`;
      message = `${r} — marginal: inside ${limits.text} but within the meter's ${uncertainty!.text} of the ${side} limit; re-measure or use a better meter${why}`;
      preview = `${r} → marginal: within ${uncertainty!.text} of the ${side} limit ${limitText}`;
      break;
    }
    default:
      {
        const sep = limits.lo !== undefined && limits.hi !== undefined ? " " : ": ";
        message = `${r} — within${sep}${limits.text}${paren}`;
        preview = `${r} → within${sep}${limits.text}`;
      }
  }
  const result: Verdict = {
    verdict,
    acceptance,
    reading: {
      value: parsed.value,
      unit: node.unit,
      display: parsed.display,
      text: r,
      typed: text,
      si: parsed.si,
      siUnit: parsed.siUnit,
    },
    limits,
    message,
    preview,
  };
  if (side) result.side = side;
  if (uncertainty) result.uncertainty = uncertainty;
  if (guardU > 0) {
    result.acceptanceZone = {};
    if (limits.lo !== undefined) result.acceptanceZone.lo = limits.lo + guardU;
    if (limits.hi !== undefined) result.acceptanceZone.hi = limits.hi - guardU;
  }
  return { ok: true, verdict: result };
}
