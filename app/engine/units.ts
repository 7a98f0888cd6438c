// Units: readings such as "1.47 µF", "1470nF", "208V", "350 °F", "3.5 inWC", "1.1 kΩ".
// Parsing and conversion are js-quantities' job; this file only maps the field's everyday
// spellings (µ, Ω, °F, inWC, MFD, VAC…) onto the names js-quantities knows, per quantity,
// and names dimensions in words for error messages.
import Qty from "js-quantities";
import type { Quantity } from "./types";
import { countSigFigs, formatSig } from "./format";

export interface QuantityInfo {
  /** js-quantities kind for this dimension. */
  kind: string;
  /** "a capacitance", for messages. */
  noun: string;
  /** SI unit label. */
  si: string;
  /** Units an editor can offer, as displayed. */
  units: readonly string[];
}

export const QUANTITY_INFO: Readonly<Record<Quantity, QuantityInfo>> = {
  voltage: { kind: "potential", noun: "a voltage", si: "V", units: ["V", "mV", "kV"] },
  current: { kind: "current", noun: "a current", si: "A", units: ["A", "mA", "µA"] },
  resistance: { kind: "resistance", noun: "a resistance", si: "Ω", units: ["Ω", "kΩ", "MΩ", "mΩ"] },
  capacitance: { kind: "capacitance", noun: "a capacitance", si: "F", units: ["µF", "nF", "pF", "F"] },
  temperature: { kind: "temperature", noun: "a temperature", si: "K", units: ["°F", "°C", "K"] },
  pressure: { kind: "pressure", noun: "a pressure", si: "Pa", units: ["inWC", "Pa", "kPa", "mbar", "psi"] },
  power: { kind: "power", noun: "a power", si: "W", units: ["W", "kW", "BTU/h"] },
  frequency: { kind: "frequency", noun: "a frequency", si: "Hz", units: ["Hz", "kHz"] },
  time: { kind: "time", noun: "a time", si: "s", units: ["s", "ms", "min", "h"] },
  rotation: { kind: "angular_velocity", noun: "a rotational speed", si: "rad/s", units: ["rpm"] },
};

const KIND_TO_QUANTITY = new Map<string, Quantity>(
  (Object.keys(QUANTITY_INFO) as Quantity[]).map((q) => [QUANTITY_INFO[q].kind, q]),
);

/** "a capacitance" for one of ours, else a readable name of the js-quantities kind ("a length"). */
export function kindNoun(kind: string): string {
  const q = KIND_TO_QUANTITY.get(kind);
  if (q) return QUANTITY_INFO[q].noun;
  if (kind === "unitless") return "a plain number";
  if (!kind) return "a combination of units";
  const words = kind.replace(/_/g, " ");
  return (/^[aeiou]/.test(words) ? "an " : "a ") + words;
}

// --- spelling normalisation --------------------------------------------------------------------

const PRESSURE_WATER = /^(?:in\.?\s?(?:wc|w\.c\.?|h2o|aq|water)|iwc|"\s?wc|inches?\s?(?:wc|w\.c\.?|of\s?water|water))$/i;
const DEGREE = /^(?:°|º|˚|deg\.?\s?|degrees?\s)\s?(f|c|k)$|^(fahrenheit|celsius|kelvin)$/i;

function temperatureUnit(letter: string, difference: boolean): string {
  const l = letter[0]!.toUpperCase();
  return (difference ? "deg" : "temp") + l;
}

/**
 * Map an everyday spelling to a js-quantities unit name. `quantity` gives context for bare
 * letters ("F" is °F on a thermometer, a farad elsewhere; "k" is kΩ on an ohmmeter).
 * `difference` says the value is a span (a tolerance, a meter's resolution), not a reading:
 * temperatures then become degF/degC/degK instead of the absolute tempF/tempC/tempK.
 */
export function normaliseUnit(raw: string, quantity?: Quantity, difference = false): string {
  let u = raw.trim().replace(/\s+/g, " ");
  u = u.replace(/[\u00b5\u03bc]/g, "u").replace(/[\u03a9\u2126]/g, "Ohm");
  const lower = u.toLowerCase();

  const deg = DEGREE.exec(u);
  if (deg) return temperatureUnit(deg[1] ?? deg[2]!, difference);
  if (quantity === "temperature") {
    if (/^[fck]$/i.test(u)) return temperatureUnit(u, difference);
    if (/^(?:temp|deg)[FCK]$/.test(u)) return temperatureUnit(u.slice(4), difference);
  }
  if (PRESSURE_WATER.test(u)) return "inH2O";

  const ohm = /^(k|K|kilo|m|milli|M|meg|mega|Meg|MEG)?\s?(?:ohms?|Ohms?|OHMS?)$/.exec(u);
  if (ohm) return ohmPrefix(ohm[1]) + "Ohm";
  if (quantity === "resistance" && /^(?:k|K|M|meg|Meg|MEG)$/.test(u)) return ohmPrefix(u) + "Ohm";

  const volt = /^([mkuMK]?)(?:v|volts?)(?:\s?(?:ac|dc|rms))?$/i.exec(u);
  if (volt) return siPrefix(volt[1]!) + "V";

  if (quantity === "current") {
    const amp = /^([mu]?)(?:a|amps?|amperes?)$/i.exec(u);
    if (amp) return siPrefix(amp[1]!) + "A";
  }
  if (quantity === "capacitance") {
    if (/^(?:u?fd|mfd|uf|mf)$/i.test(u) && u !== "mF") return "uF";
    const far = /^([unp])f$/i.exec(u);
    if (far) return far[1]!.toLowerCase() + "F";
  }
  if (quantity === "power") {
    const watt = /^([km]?)(?:w|watts?)$/i.exec(u);
    if (watt) return siPrefix(watt[1]!) + "W";
  }
  if (/^btu\s?\/?\s?(?:h|hr|hour)$|^btuh$/i.test(u)) return "BTU/h";
  if (/^k?hz$/i.test(u)) return lower === "khz" ? "kHz" : "Hz";
  if (/^(?:rpm|r\/min)$/i.test(u)) return "rpm";
  if (quantity === "pressure") {
    if (/^(?:k|h)?pa$/i.test(u)) return lower === "pa" ? "Pa" : lower[0] + "Pa";
    if (/^psig?$/i.test(u)) return "psi";
    if (/^m?bar$/i.test(u)) return lower;
    if (/^inhg$/i.test(u)) return "inHg";
  }
  if (quantity === "time") {
    if (/^(?:s|sec|secs|seconds?)$/i.test(u)) return "s";
    if (/^(?:min|mins|minutes?)$/i.test(u)) return "min";
    if (/^(?:h|hr|hrs|hours?)$/i.test(u)) return "h";
  }
  return u;
}

function siPrefix(p: string): string {
  if (p === "") return "";
  if (p === "K") return "k";
  if (p === "M" || p === "m") return "m"; // "MV", "MA" typed on a field meter mean milli
  return p;
}

function ohmPrefix(p: string | undefined): string {
  if (!p) return "";
  if (p === "k" || p === "K" || p === "kilo") return "k";
  if (p === "m" || p === "milli") return "m";
  return "M";
}

/** How a js-quantities unit name reads on screen. */
export function unitLabel(qtyUnit: string): string {
  if (/^temp[FCK]$/.test(qtyUnit) || /^deg[FC]$/.test(qtyUnit)) {
    const l = qtyUnit.slice(4);
    return l === "K" ? "K" : "°" + l;
  }
  if (qtyUnit === "degK") return "K";
  if (qtyUnit === "inH2O") return "inWC";
  return qtyUnit.replace(/^u/, "µ").replace(/Ohm$/, "Ω");
}

// --- resolution (memoised: trees reuse a handful of units) -------------------------------------

export interface ResolvedUnit {
  /** js-quantities unit name. */
  qty: string;
  /** js-quantities kind ("capacitance"), "" when the unit combines into no named kind. */
  kind: string;
  /** True for tempF/tempC/tempK (absolute temperatures). */
  absoluteTemperature: boolean;
}

// One cache per (quantity, absolute/difference) context, keyed by the unit as written.
const resolved = new Map<string, Map<string, ResolvedUnit | null>>();

/** Resolve a unit as written; null when js-quantities doesn't know it. */
export function resolveUnit(raw: string, quantity?: Quantity, difference = false): ResolvedUnit | null {
  const ctx = difference ? `${quantity ?? ""}~` : (quantity ?? "");
  let cache = resolved.get(ctx);
  if (!cache) resolved.set(ctx, (cache = new Map()));
  const hit = cache.get(raw);
  if (hit !== undefined) return hit;
  let out: ResolvedUnit | null = null;
  const name = normaliseUnit(raw, quantity, difference);
  if (name !== "" && !/^[\d.+-]/.test(name)) {
    try {
      const q = Qty.parse("1 " + name);
      if (q) {
        const canonical = q.units();
        out = { qty: canonical, kind: q.kind() ?? "", absoluteTemperature: /^temp[FCKR]$/.test(canonical) };
      }
    } catch {
      out = null;
    }
  }
  if (cache.size < 2000) cache.set(raw, out);
  return out;
}

/** The quantity a unit measures, if it is one of ours. */
export function unitQuantity(raw: string, context?: Quantity): Quantity | null {
  const r = resolveUnit(raw, context);
  return r ? (KIND_TO_QUANTITY.get(r.kind) ?? null) : null;
}

const converters = new Map<string, (x: number) => number>();

/** Convert between two js-quantities unit names of the same kind. */
export function convertQty(value: number, from: string, to: string): number {
  if (from === to) return value;
  const key = from + ">" + to;
  let c = converters.get(key);
  if (!c) {
    const swift = Qty.swiftConverter(from, to);
    // js-quantities' "safe" multiply counts decimal places and returns NaN for values below
    // about 1e-290 (found by the property tests). Every unit conversion is affine, so fall back
    // to offset + factor × value, both taken from the library at 0 and 1.
    const at0 = swift(0) as number;
    const factor = (swift(1) as number) - at0;
    c = (x: number) => {
      const y = swift(x) as number;
      return Number.isNaN(y) && Number.isFinite(x) ? at0 + factor * x : y;
    };
    converters.set(key, c);
  }
  return c(value);
}

/**
 * Convert a value between units as written ("1470", "nF" → "µF"). Throws when either unit is
 * unknown or the dimensions differ; use parseReading for user input.
 */
export function convert(value: number, from: string, to: string, quantity?: Quantity, difference = false): number {
  const a = resolveUnit(from, quantity, difference);
  const b = resolveUnit(to, quantity, difference);
  if (!a) throw new Error(`unknown unit ‘${from}’`);
  if (!b) throw new Error(`unknown unit ‘${to}’`);
  if (a.kind !== b.kind || a.absoluteTemperature !== b.absoluteTemperature) {
    throw new Error(`can't convert ${unitLabel(a.qty)} to ${unitLabel(b.qty)}`);
  }
  return convertQty(value, a.qty, b.qty);
}

const SI_QTY: Record<Quantity, string> = {
  voltage: "V",
  current: "A",
  resistance: "Ohm",
  capacitance: "F",
  temperature: "tempK",
  pressure: "Pa",
  power: "W",
  frequency: "Hz",
  time: "s",
  rotation: "rad/s",
};

/** A value in a resolved unit, in SI (kelvin for temperatures). */
export function toSI(value: number, unit: ResolvedUnit, quantity: Quantity): number {
  return convertQty(value, unit.qty, SI_QTY[quantity]);
}

// --- readings --------------------------------------------------------------------------------

export interface ParsedReading {
  /** The value in the node's display unit. */
  value: number;
  /** The value in SI (K for temperatures). */
  si: number;
  siUnit: string;
  /** The number as typed (decimal comma turned into a point) and the unit as typed, resolved. */
  typedNumber: string;
  typedValue: number;
  typedUnit: string;
  /** Significant figures typed; used to show the converted value sensibly. */
  sigFigs: number;
  /** The reading in the display unit, formatted to suit what was typed: "1.47", "120.0". */
  display: string;
}

export type ReadingError = {
  code: "empty" | "not-a-number" | "ambiguous-comma" | "unknown-unit" | "wrong-dimension" | "not-finite" | "below-absolute-zero";
  message: string;
};

export type ParseReadingResult = ({ ok: true } & ParsedReading) | ({ ok: false } & ReadingError);

const NUMBER = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)(?![\d.,])\s*(.*)$/;

/**
 * Split "1,47 µF" / "1470nF" / "-5 °C" into number text and unit text.
 * Decimal comma: "1,47" is 1.47 (one comma, no point, not followed by exactly three digits);
 * "1,470" is refused as ambiguous; "1,470.5" reads commas as thousands separators.
 */
function splitNumber(text: string): { number: string; unit: string } | ReadingError {
  let t = text.trim().replace(/\u2212/g, "-").replace(/\u00a0/g, " ");
  const lead = /^[+-]?[\d.,]+/.exec(t)?.[0] ?? "";
  if (lead.includes(",")) {
    const commas = (lead.match(/,/g) ?? []).length;
    if (lead.includes(".")) {
      if (!/^[+-]?\d{1,3}(?:,\d{3})+\.\d*$/.test(lead)) {
        return { code: "not-a-number", message: `‘${lead}’ mixes commas and points: write it like 1470.5.` };
      }
      t = lead.replace(/,/g, "") + t.slice(lead.length);
    } else if (commas === 1 && !/,\d{3}$/.test(lead) && /\d,\d/.test(lead)) {
      t = lead.replace(",", ".") + t.slice(lead.length);
    } else {
      return {
        code: "ambiguous-comma",
        message: `‘${lead}’ could be read two ways: write ${lead.replace(/,/g, "")} or ${lead.replace(",", ".")}.`,
      };
    }
  }
  const m = NUMBER.exec(t);
  if (!m) return { code: "not-a-number", message: `‘${text.trim()}’ doesn't start with a number: type it like 1.47 µF.` };
  return { number: m[1]!.replace(/^\+/, ""), unit: m[2]!.trim() };
}

function suggestion(quantity: Quantity): string {
  const u = QUANTITY_INFO[quantity].units;
  return u.length > 1 ? `${u.slice(0, -1).join(", ")} or ${u[u.length - 1]}` : (u[0] ?? "");
}

/**
 * Parse a typed reading for a node measuring `quantity` shown in `displayUnit`. A bare number
 * is taken in the display unit. A reading of another dimension is an error, never a value.
 */
export function parseReading(text: string, quantity: Quantity, displayUnit: string): ParseReadingResult {
  if (text.trim() === "") return { ok: false, code: "empty", message: `Type a reading, like 1.47 ${displayUnit}.` };
  const split = splitNumber(text);
  if ("code" in split) return { ok: false, ...split };
  const display = resolveUnit(displayUnit, quantity);
  if (!display) {
    return { ok: false, code: "unknown-unit", message: `This step's unit ‘${displayUnit}’ isn't one Cluepath knows.` };
  }
  const typed = split.unit === "" ? display : resolveUnit(split.unit, quantity);
  if (!typed) {
    return {
      ok: false,
      code: "unknown-unit",
      message: `‘${split.unit}’ isn't a unit Cluepath knows: for ${QUANTITY_INFO[quantity].noun} try ${suggestion(quantity)}.`,
    };
  }
  const expected = QUANTITY_INFO[quantity];
  if (typed.kind !== expected.kind) {
    return {
      ok: false,
      code: "wrong-dimension",
      message: `Expected ${expected.noun}, got ${kindNoun(typed.kind)} (‘${text.trim()}’): type it in ${suggestion(quantity)}.`,
    };
  }
  const typedValue = Number(split.number);
  let value: number;
  try {
    value = convertQty(typedValue, typed.qty, display.qty);
  } catch {
    return { ok: false, code: "below-absolute-zero", message: `‘${text.trim()}’ is below absolute zero: check the reading and its unit.` };
  }
  if (!Number.isFinite(typedValue) || !Number.isFinite(value)) {
    return { ok: false, code: "not-finite", message: `‘${text.trim()}’ is too large to be a reading.` };
  }
  const sigFigs = countSigFigs(split.number);
  const sameUnit = typed.qty === display.qty;
  const shown =
    sameUnit && !/e/i.test(split.number)
      ? split.number.replace(/^(-?)\./, "$10.").replace(/\.$/, "")
      : formatSig(value, Math.max(3, sigFigs));
  return {
    ok: true,
    value,
    si: toSI(value, display, quantity),
    siUnit: expected.si,
    typedNumber: split.number,
    typedValue,
    typedUnit: unitLabel(typed.qty),
    sigFigs,
    display: shown,
  };
}
