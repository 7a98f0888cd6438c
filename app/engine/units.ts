// Units: readings such as "1.47 µF", "1470nF", "208V", "350 °F", "3.5 inWC", "1.1 kΩ".
// Parsing and conversion are js-quantities' job; this file only maps the field's everyday
// spellings (µ, Ω, °F, inWC, MFD, VAC…) onto the names js-quantities knows, per quantity,
// and names dimensions in words for error messages.
import Qty from "js-quantities";
import type { Quantity } from "./types";
import { countDecimals, countSigFigs, formatCompact, formatSig } from "./format";

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

const KIND_TO_QUANTITY = new Map<string, Quantity>((Object.keys(QUANTITY_INFO) as Quantity[]).map((q) => [QUANTITY_INFO[q].kind, q]));

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

/**
 * What may reach js-quantities' parser: letters, digits, spaces and the few signs units use. Its
 * parser substitutes unit text into replacement strings, so "$&2" makes it loop for ever (found
 * by the property test of issue 10 item 1: a typed "208 $&2" hung the process).
 */
const SAFE_UNIT = /^[\p{L}\p{N} ./^*°º˚"'·-]{1,40}$/u;

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
  if (name !== "" && !/^[\d.+-]/.test(name) && SAFE_UNIT.test(name)) {
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

// --- conversion ------------------------------------------------------------------------------

const G_N = 9.80665; // standard acceleration of gravity, m/s² (exact; NIST SP 811 (2008) B.8 note)
const INCH = 0.0254; // m (exact)

/**
 * Exact factors to SI (and the offset, for absolute temperatures) for every unit the engine
 * offers, so the trade's conventional units are not the library's defaults: NIST SP 811 (2008)
 * Appendix B.8 gives the inch of water (conventional) as 2.490 889 E+02 Pa — 25.4 mm of water
 * at 1000 kg/m³ under standard gravity — where js-quantities uses water at 4 °C (249.082 Pa),
 * and the psi as 6.894 757 E+03 Pa — one pound-force (0.45359237 kg × g_n) per square inch —
 * where js-quantities rounds to 6894.76 Pa. Units outside this table convert through
 * js-quantities. Keys are js-quantities unit names; values: [factor, offset] with
 * SI = value × factor + offset.
 */
export const EXACT_FACTORS: Readonly<Record<string, readonly [number, number?]>> = {
  // SI prefixes (exact)
  V: [1],
  mV: [1e-3],
  kV: [1e3],
  uV: [1e-6],
  A: [1],
  mA: [1e-3],
  uA: [1e-6],
  kA: [1e3],
  Ohm: [1],
  mOhm: [1e-3],
  kOhm: [1e3],
  MOhm: [1e6],
  GOhm: [1e9],
  F: [1],
  mF: [1e-3],
  uF: [1e-6],
  nF: [1e-9],
  pF: [1e-12],
  W: [1],
  kW: [1e3],
  mW: [1e-3],
  MW: [1e6],
  Hz: [1],
  kHz: [1e3],
  MHz: [1e6],
  s: [1],
  ms: [1e-3],
  us: [1e-6],
  min: [60],
  h: [3600],
  d: [86400],
  Pa: [1],
  hPa: [100],
  kPa: [1e3],
  MPa: [1e6],
  mbar: [100],
  bar: [1e5],
  // Pressure units of the trade, conventional (NIST SP 811 (2008) B.8)
  psi: [(0.45359237 * G_N) / (INCH * INCH)], // 6894.757 Pa
  inH2O: [INCH * 1000 * G_N], // 249.0889 Pa, inch of water (conventional)
  cmH2O: [0.01 * 1000 * G_N], // 98.0665 Pa, centimetre of water (conventional)
  inHg: [INCH * 13595.1 * G_N], // 3386.389 Pa, inch of mercury (conventional)
  mmHg: [0.001 * 13595.1 * G_N], // 133.3224 Pa, millimetre of mercury (conventional)
  atm: [101325], // standard atmosphere (exact)
  // British thermal unit (International Table) per hour: 1055.05585262 J / 3600 s (NIST SP 811 B.8: 2.930 711 E-01 W)
  "BTU/h": [1055.05585262 / 3600],
  // Revolutions per minute: 2π rad / 60 s
  rpm: [(2 * Math.PI) / 60],
  "rad/s": [1],
  // Temperatures: kelvin = (°F + 459.67) × 5/9 (NIST SP 811 B.9), °C + 273.15; spans without the offset
  tempK: [1, 0],
  tempC: [1, 273.15],
  tempF: [5 / 9, (459.67 * 5) / 9],
  degK: [1],
  degC: [1],
  degF: [5 / 9],
};

/** The ratio of two exact factors, cleaned of binary noise (1e-9 / 1e-6 is 0.001, not 0.0010000000000000002). */
function ratio(a: number, b: number): number {
  return Number((a / b).toPrecision(15));
}

const converters = new Map<string, (x: number) => number>();

/**
 * Convert between two js-quantities unit names of the same kind. Never throws: NaN when the
 * library refuses (a temperature below absolute zero, units of different kinds). The engine's own
 * units convert with the exact factors above.
 */
export function convertQty(value: number, from: string, to: string): number {
  if (from === to) return value;
  const key = from + ">" + to;
  let c = converters.get(key);
  if (!c) c = makeConverter(from, to);
  converters.set(key, c);
  return c(value);
}

function makeConverter(from: string, to: string): (x: number) => number {
  const a = EXACT_FACTORS[from];
  const b = EXACT_FACTORS[to];
  if (a && b) {
    const k = ratio(a[0], b[0]);
    const c = ((a[1] ?? 0) - (b[1] ?? 0)) / b[0];
    return c === 0 ? (x) => x * k : (x) => x * k + c;
  }
  let swift: (x: number) => number;
  try {
    const f = Qty.swiftConverter(from, to) as (x: number) => number;
    swift = (x) => {
      try {
        return f(x);
      } catch {
        return NaN;
      }
    };
  } catch {
    return () => NaN;
  }
  // js-quantities' "safe" multiply counts decimal places and returns NaN for values below
  // about 1e-290 (found by the property tests). Every unit conversion is affine, so fall back
  // to offset + factor × value, both taken from the library at 0 and 1.
  const at0 = swift(0);
  const factor = swift(1) - at0;
  return (x) => {
    const y = swift(x);
    return Number.isNaN(y) && Number.isFinite(x) ? at0 + factor * x : y;
  };
}

/** Kelvin of an absolute temperature in a resolved unit (NaN when the unit isn't one). */
function kelvin(value: number, unit: ResolvedUnit): number {
  return unit.absoluteTemperature ? convertQty(value, unit.qty, "tempK") : NaN;
}

/** True when an absolute temperature lies below 0 K. */
export function belowAbsoluteZero(value: number, unit: ResolvedUnit): boolean {
  return unit.absoluteTemperature && kelvin(value, unit) < -1e-9;
}

/**
 * Convert a value between units as written ("1470", "nF" → "µF"), for code (tests, seeds): throws
 * when either unit is unknown or the dimensions differ, and gives NaN below absolute zero. Typed
 * input goes through parseReading, which never throws.
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
  /** True when the reading was typed in another unit than the step's own (so it was converted). */
  converted: boolean;
  /** Significant figures typed; used to show the converted value sensibly. */
  sigFigs: number;
  /** The reading in the display unit, formatted to suit what was typed: "1.47", "120.0". */
  display: string;
}

export type ReadingErrorCode =
  | "empty"
  | "not-a-number"
  | "ambiguous-comma"
  | "unknown-unit"
  | "wrong-dimension"
  | "not-finite"
  | "below-absolute-zero"
  /** Physically impossible for this quantity: a negative resistance, a rating of 0 or below. */
  | "impossible"
  /** Above the top of the meter's stated range: the meter can't have shown it. */
  | "over-range"
  /** The meter's overload display ("OL", "O.L", "0.L"): no value (see evaluateReading). */
  | "overload";

export type ReadingError = {
  code: ReadingErrorCode;
  message: string;
  /** What the technician probably meant, ready to put back in the field: ["1.47 µF"], ["350 °F", "350 °C"]. */
  suggestions?: string[];
};

export type ParseReadingResult = ({ ok: true } & ParsedReading) | ({ ok: false } & ReadingError);

const NUMBER = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)(?![\d.,])\s*([\s\S]*)$/;

/** A meter's overload display as technicians copy it: OL, O.L, 0.L, -OL, OL. — optionally with the unit shown beside it. */
const OVERLOAD = /^[-+]?\s*(?:o\.?\s?l|0\.\s?l)\.?(?:\s+\S.*)?$/i;

/** True when the text is a meter's overload display rather than a number ("OL", "O.L", "0.L"). */
export function isOverload(text: string): boolean {
  return OVERLOAD.test(text.trim());
}

/** A quantity's noun without its article: "capacitance", "rotational speed". */
export function quantityWord(q: Quantity): string {
  return QUANTITY_INFO[q].noun.replace(/^an? /, "");
}

/** Quantities that can't go below zero (a meter that shows a minus sign there needs its leads zeroed). */
const NON_NEGATIVE: ReadonlySet<Quantity> = new Set(["resistance", "capacitance", "frequency", "time", "rotation"]);

/** A typical kitchen-equipment value per quantity, for "type it like …" hints. */
const EXAMPLE: Readonly<Record<Quantity, readonly [number, string]>> = {
  voltage: [120, "V"],
  current: [4.2, "A"],
  resistance: [10.9, "Ω"],
  capacitance: [1.47, "µF"],
  temperature: [350, "°F"],
  pressure: [3.5, "inWC"],
  power: [1320, "W"],
  frequency: [60, "Hz"],
  time: [30, "s"],
  rotation: [1140, "rpm"],
};

/** An example reading in the step's own unit: "120 V", "1470 nF", "177 °C". */
export function exampleReading(quantity: Quantity, displayUnit: string): string {
  const [x, u] = EXAMPLE[quantity];
  const from = resolveUnit(u, quantity);
  const to = resolveUnit(displayUnit, quantity);
  const y =
    from && to && from.kind === to.kind && from.absoluteTemperature === to.absoluteTemperature ? convertQty(x, from.qty, to.qty) : NaN;
  return Number.isFinite(y) ? `${formatCompact(y, 3)} ${displayUnit}` : `${x} ${u}`;
}

/**
 * Split "1,47 µF" / "1470nF" / "-5 °C" into number text and unit text.
 * Decimal comma: "1,47" is 1.47 (one comma, no point, not followed by exactly three digits);
 * "1,470" is refused as ambiguous; "1,470.5" reads commas as thousands separators.
 */
function splitNumber(text: string, example: string): { number: string; unit: string } | ReadingError {
  let t = text
    .trim()
    .replace(/\u2212/g, "-")
    .replace(/[\u00a0\u202f]/g, " ");
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
        suggestions: [lead.replace(/,/g, ""), lead.replace(",", ".")],
      };
    }
  }
  const m = NUMBER.exec(t);
  if (!m) return { code: "not-a-number", message: `‘${text.trim()}’ doesn't start with a number: type the reading like ${example}.` };
  if (/^\d/.test(m[2]!)) {
    // "1 100 Ω": digits after a space — a thousands gap, or a slip. Numbers go without spaces.
    const spaced = /^([+-]?\d+(?: \d+)+(?:\.\d+)?)(?![\d.,eE])\s*([^\d\s][\s\S]*)?$/.exec(t);
    if (!spaced)
      return { code: "not-a-number", message: `‘${text.trim()}’ holds more than one number: type one reading, like ${example}.` };
    const joined = spaced[1]!.replace(/ /g, "");
    const meant = spaced[2] ? `${joined} ${spaced[2].trim()}` : joined;
    return { code: "not-a-number", message: `Type the number without spaces: did you mean ${meant}?`, suggestions: [meant] };
  }
  return { number: m[1]!.replace(/^\+/, ""), unit: m[2]!.trim() };
}

function listUnits(quantity: Quantity): string {
  const u = QUANTITY_INFO[quantity].units;
  return u.length > 1 ? `${u.slice(0, -1).join(", ")} or ${u[u.length - 1]}` : (u[0] ?? "");
}

const SI_SYMBOL: Partial<Record<Quantity, string>> = {
  voltage: "V",
  current: "A",
  resistance: "Ω",
  capacitance: "F",
  power: "W",
  frequency: "Hz",
  time: "s",
  pressure: "Pa",
};
const PREFIX_ONLY = /^(?:[µμu]|n|p|m|k|K|M)$/;
const DEGREES_ONLY = /^(?:°|º|˚|deg\.?|degs|degrees?)$/i;
/** Spellings that aren't units of the quantity but mean one (per quantity). */
const MEANT: Partial<Record<Quantity, readonly (readonly [RegExp, string])[]>> = {
  pressure: [
    [/^(?:mb|mbr|mbars|millibars?)$/i, "mbar"],
    [/^(?:in\.?|inch(?:es)?|"|wc|w\.c\.?|h2o|iwc|in\.?\s?h2o|water)$/i, "inWC"],
  ],
  capacitance: [
    [/^micro\s?farads?$/i, "µF"],
    [/^nano\s?farads?$/i, "nF"],
    [/^pico\s?farads?$/i, "pF"],
  ],
  resistance: [[/^(?:o|ohmios?)$/i, "Ω"]],
  rotation: [[/^(?:rev\/min|rpms|revs?)$/i, "rpm"]],
};

/** Units of `quantity` the technician probably meant by `unit`, as labels ("µF"; "°F", "°C"). */
function meantUnits(unit: string, quantity: Quantity, displayUnit: string): string[] {
  const u = unit.trim();
  if (quantity === "temperature" && DEGREES_ONLY.test(u)) {
    const own = resolveUnit(displayUnit, "temperature");
    return own?.qty === "tempC" ? ["°C", "°F"] : ["°F", "°C"];
  }
  const base = SI_SYMBOL[quantity];
  if (base && PREFIX_ONLY.test(u)) {
    const label = (/^[µμu]$/.test(u) ? "µ" : u === "K" ? "k" : u) + base;
    if (resolveUnit(label, quantity)?.kind === QUANTITY_INFO[quantity].kind) return [label];
  }
  for (const [re, label] of MEANT[quantity] ?? []) if (re.test(u)) return [label];
  for (const label of QUANTITY_INFO[quantity].units) if (label.toLowerCase() === u.toLowerCase()) return [label];
  return [];
}

const ABSOLUTE_ZERO: Record<string, string> = { tempF: "−459.67 °F", tempC: "−273.15 °C", tempK: "0 K" };

/**
 * Parse a typed reading for a node measuring `quantity` shown in `displayUnit`. A bare number
 * is taken in the display unit. A reading of another dimension is an error, never a value, and
 * so is what can't physically be (a negative resistance, a temperature below absolute zero).
 * Never throws, whatever the text.
 */
export function parseReading(text: string, quantity: Quantity, displayUnit: string): ParseReadingResult {
  const example = exampleReading(quantity, displayUnit);
  const t = text.trim();
  if (t === "") return { ok: false, code: "empty", message: `Type a reading, like ${example}.` };
  if (isOverload(t)) {
    return {
      ok: false,
      code: "overload",
      message: `‘${t}’ is the meter's overload display (open circuit or above its range): there is no value to record.`,
    };
  }
  const split = splitNumber(text, quantity === "resistance" ? `${example} (or OL when the meter shows overload)` : example);
  if ("code" in split) return { ok: false, ...split };
  const display = resolveUnit(displayUnit, quantity);
  const expected = QUANTITY_INFO[quantity];
  if (!display || display.kind !== expected.kind) {
    const why = display ? `isn't a unit of ${quantityWord(quantity)}` : "isn't one Cluepath knows";
    return { ok: false, code: "unknown-unit", message: `This step's unit ‘${displayUnit}’ ${why}: the procedure needs fixing.` };
  }
  const typed = split.unit === "" ? display : resolveUnit(split.unit, quantity);
  if (!typed || typed.kind !== expected.kind) {
    const meant = meantUnits(split.unit, quantity, displayUnit);
    if (meant.length) {
      const suggestions = meant.map((u) => `${split.number} ${u}`);
      const why = DEGREES_ONLY.test(split.unit)
        ? `‘${split.unit}’ doesn't say which scale`
        : PREFIX_ONLY.test(split.unit)
          ? `‘${split.unit}’ alone isn't a unit of ${quantityWord(quantity)}`
          : `‘${split.unit}’ isn't a unit of ${quantityWord(quantity)}`;
      return {
        ok: false,
        code: typed ? "wrong-dimension" : "unknown-unit",
        message: `${why}: did you mean ${suggestions.join(" or ")}?`,
        suggestions,
      };
    }
    if (!typed) {
      return {
        ok: false,
        code: "unknown-unit",
        message: `‘${split.unit}’ isn't a unit of ${quantityWord(quantity)} Cluepath knows: type it in ${listUnits(quantity)}.`,
      };
    }
    return {
      ok: false,
      code: "wrong-dimension",
      message: `Expected ${expected.noun}, got ${kindNoun(typed.kind)} (‘${t}’): type it in ${listUnits(quantity)}.`,
    };
  }
  if (typed.absoluteTemperature !== display.absoluteTemperature) {
    return {
      ok: false,
      code: "wrong-dimension",
      message: `‘${t}’ is a temperature difference: type the temperature in ${listUnits(quantity)}.`,
    };
  }
  const typedValue = Number(split.number);
  if (!Number.isFinite(typedValue)) return { ok: false, code: "not-finite", message: `‘${t}’ is too large to be a reading.` };
  if (belowAbsoluteZero(typedValue, typed)) {
    return {
      ok: false,
      code: "below-absolute-zero",
      message: `‘${t}’ is below absolute zero (${ABSOLUTE_ZERO[typed.qty] ?? "0 K"}): check the reading and its unit.`,
    };
  }
  if (typedValue < 0 && NON_NEGATIVE.has(quantity)) {
    return {
      ok: false,
      code: "impossible",
      message: `A ${quantityWord(quantity)} can't be below zero (‘${t}’): check the reading, and zero the meter's leads if it shows a minus sign.`,
    };
  }
  const value = convertQty(typedValue, typed.qty, display.qty);
  const si = Number.isFinite(value) ? toSI(value, display, quantity) : NaN;
  if (!Number.isFinite(value) || !Number.isFinite(si)) {
    return { ok: false, code: "not-finite", message: `‘${t}’ is too large to be a reading.` };
  }
  const sigFigs = countSigFigs(split.number);
  const converted = typed.qty !== display.qty;
  // As typed when in the step's own unit; converted, to the typed significant figures (at least
  // 3) — temperatures, whose scales are offset, to the typed decimals (at least 1).
  const shown =
    !converted && !/e/i.test(split.number)
      ? split.number.replace(/^(-?)\./, "$10.").replace(/\.$/, "")
      : converted && quantity === "temperature"
        ? value.toFixed(Math.min(12, Math.max(1, countDecimals(split.number))))
        : formatSig(value, Math.max(3, sigFigs));
  return {
    ok: true,
    value,
    si,
    siUnit: expected.si,
    typedNumber: split.number,
    typedValue,
    typedUnit: unitLabel(typed.qty),
    converted,
    sigFigs,
    display: shown,
  };
}

/**
 * Parse a rating read off a nameplate: as parseReading, and a rating must be above zero (a
 * temperature rating may be any temperature above absolute zero). Never throws.
 */
export function parseRating(text: string, quantity: Quantity, unit: string): ParseReadingResult {
  const example = exampleReading(quantity, unit);
  const r = parseReading(text, quantity, unit);
  if (r.ok) {
    if (quantity !== "temperature" && r.value <= 0) {
      return {
        ok: false,
        code: "impossible",
        message: `A rated ${quantityWord(quantity)} of ${r.display} ${unit} can't be right: a rating is above zero. Check the nameplate.`,
      };
    }
    return r;
  }
  if (r.code === "empty") return { ...r, message: `Type the rating from the nameplate, like ${example}.` };
  if (r.code === "overload")
    return {
      ...r,
      message: `‘${text.trim()}’ is what a meter shows on overload: type the rating printed on the nameplate, like ${example}.`,
    };
  return r;
}
