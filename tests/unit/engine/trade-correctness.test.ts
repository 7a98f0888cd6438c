// Issue 10, engine items 1–8: readings as technicians really type them, exact conventional
// factors, limits that never reject a good part, impossible values refused and implausible ones
// confirmed. Each check names its source (REFERENCES.md marks: read / from memory / common practice).
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { unit as mathUnit } from "mathjs";
import {
  convert,
  EXACT_FACTORS,
  isOverload,
  parseRating,
  parseReading,
  QUANTITY_INFO,
  resolveUnit,
  unitQuantity,
  normaliseUnit,
} from "../../../app/engine/units";
import { evaluateReading, type Verdict } from "../../../app/engine/verdict";
import { computeLimits } from "../../../app/engine/limits";
import { compileFormula, evaluateFormula } from "../../../app/engine/formula";
import { replay, tryEntry, type LogEntry } from "../../../app/engine/traversal";
import { rotisserie, TO_AMBIENT, TO_ELEMENT, TO_SUPPLY } from "./rotisserie";
import { parseTree } from "../../../app/engine/markdown/parse";
import { validateTree, validateTreeData } from "../../../app/engine/validate";
import { QUANTITIES, type Limits, type MeasurementNode, type Meter, type Quantity, type Tree } from "../../../app/engine/types";

type Node = Pick<MeasurementNode, "quantity" | "unit" | "limits" | "meter" | "acceptance">;
const node = (quantity: Quantity, unit: string, limits: Limits, extra: Partial<Node> = {}): Node => ({ quantity, unit, limits, ...extra });
const range = (min: number, max: number): Limits => ({ kind: "range", min: { value: min }, max: { value: max } });
function judged(n: Node, text: string, opts: { variables?: Record<string, number>; meter?: Meter } = {}): Verdict {
  const r = evaluateReading(n, text, opts);
  if (!r.ok) throw new Error(`${text}: ${r.message}`);
  return r.verdict;
}
function refused(n: Node, text: string, opts: { variables?: Record<string, number>; meter?: Meter } = {}) {
  const r = evaluateReading(n, text, opts);
  if (r.ok) throw new Error(`${text} was judged: ${r.verdict.message}`);
  return r;
}
const hotHoldingF = node("temperature", "°F", { kind: "atLeast", min: { value: 135 } }); // FDA Food Code 2022 §3-501.16(A) (read)
const supply208 = node("voltage", "V", range(191, 218)); // ANSI C84.1-2016 Table 1, 208 V utilisation (from memory)
const meter1pc3 = { percent: 1, counts: 3, resolution: 0.1 }; // ±(1 % + 3 counts) at 0.1 V — meter makers' convention (read, secondary)

// ------------------------------------------------------------------------------------------------
describe("item 1: no typed string makes the engine throw", () => {
  it("a temperature below absolute zero in the step's own unit is an error, not a throw (NIST SP 811 B.9: 0 K = −459.67 °F)", () => {
    for (const text of ["-500 °F", "-500", "-460 °F", "-274 °C"]) {
      const r = parseReading(text, "temperature", "°F");
      expect(r.ok).toBe(false);
      expect(!r.ok && r.code).toBe("below-absolute-zero");
      expect(refused(hotHoldingF, text).code).toBe("below-absolute-zero");
    }
    expect(parseReading("-459.67 °F", "temperature", "°F").ok).toBe(true); // absolute zero itself
    expect(parseReading("-500", "temperature", "°F")).toMatchObject({
      message: "‘-500’ is below absolute zero (−459.67 °F): check the reading and its unit.",
    });
  });
  it("a tree with a limit below absolute zero validates (with an error) and its limits compute to an error", () => {
    const cold = node("temperature", "°C", { kind: "atLeast", min: { value: -500, unit: "°F" } });
    const t: Tree = {
      title: "T",
      category: "other",
      symptom: "s",
      start: "m",
      nodes: [
        { id: "m", kind: "measurement", title: "Cavity", ...cold, branches: { low: { to: "e" }, within: { to: "e" } } } as MeasurementNode,
        { id: "e", kind: "outcome", title: "Done", remedy: "r", parts: [] },
      ],
    };
    expect(validateTree(t).findings.map((f) => f.code)).toEqual(["below-absolute-zero"]);
    expect(computeLimits(cold)).toMatchObject({ ok: false, code: "impossible" });
  });
  it("the run refuses the entry with a message and stays where it was", () => {
    const r = tryEntry(rotisserie, TO_AMBIENT, { type: "reading", node: "ambient", reading: "-300 °C" });
    expect(r.ok).toBe(false);
    expect(!r.ok && r.rejection).toMatchObject({
      code: "reading",
      message: "‘-300 °C’ is below absolute zero (−273.15 °C): check the reading and its unit.",
    });
    expect(r.state.current).toBe("ambient");
  });

  // Strings of every shape: arbitrary text, and text built from the pieces technicians and
  // meters produce (numbers, units, signs, commas, spaces, overload displays).
  const PIECES = [
    "-",
    "+",
    "−",
    "1",
    "0",
    "9",
    "500",
    "1e400",
    "1e-320",
    ".",
    ",",
    " ",
    "  ",
    "e",
    "E",
    "NaN",
    "Infinity",
    "µ",
    "u",
    "F",
    "°",
    "°F",
    "°C",
    "K",
    "deg",
    "V",
    "mV",
    "k",
    "M",
    "Ω",
    "ohm",
    "nF",
    "µF",
    "mb",
    "mbar",
    "inWC",
    '"WC',
    "psi",
    "W",
    "BTU/h",
    "rpm",
    "OL",
    "O.L",
    "0.L",
    "L",
    "/",
    "(",
    ")",
    "\u00a0",
    "\u202f",
    "`",
    "\n",
    "%",
  ];
  const textArb = fc.oneof(
    fc.string({ maxLength: 30 }),
    fc.string({ unit: "binary", maxLength: 20 }),
    fc.array(fc.constantFrom(...PIECES), { maxLength: 8 }).map((xs) => xs.join("")),
    fc.double().map((x) => `${x}`),
    fc.tuple(fc.double(), fc.constantFrom(...PIECES)).map(([x, u]) => `${x} ${u}`),
  );
  const nodeArb = fc.constantFrom(...QUANTITIES).chain((q) =>
    fc.record({
      quantity: fc.constant(q),
      unit: fc.constantFrom(...QUANTITY_INFO[q].units),
      limits: fc.constantFrom<Limits>(
        range(-5, 5),
        range(1, 2),
        { kind: "atLeast", min: { value: 0 } },
        { kind: "nominal", nominal: { formula: "x" }, tolerance: { kind: "percent", plus: 6, minus: 6 } },
        { kind: "atMost", max: { formula: "x / y" } },
      ),
      acceptance: fc.constantFrom("simple" as const, "guarded" as const),
      meter: fc.option(fc.record({ percent: fc.double(), counts: fc.double(), resolution: fc.double(), range: fc.double() }), {
        nil: undefined,
      }),
    }),
  );
  it("property: every parse and evaluate function returns a result for any string", () => {
    fc.assert(
      fc.property(textArb, nodeArb, fc.double(), fc.double(), (text, n, x, y) => {
        const m = { ...n, meter: n.meter } as Node;
        expect(typeof parseReading(text, n.quantity, n.unit).ok).toBe("boolean");
        expect(typeof parseRating(text, n.quantity, n.unit).ok).toBe("boolean");
        expect(typeof evaluateReading(m, text, { variables: { x, y } }).ok).toBe("boolean");
        expect(typeof evaluateReading(m, text).ok).toBe("boolean");
        expect(typeof isOverload(text)).toBe("boolean");
        expect(typeof compileFormula(text).ok).toBe("boolean");
        expect(typeof evaluateFormula(text, { x, y }).ok).toBe("boolean");
        expect(
          typeof computeLimits({ ...n, limits: { kind: "range", min: { value: x, unit: text }, max: { formula: text } } }, { x, y }).ok,
        ).toBe("boolean");
        expect(typeof computeLimits({ ...n, unit: text }, { x, y }).ok).toBe("boolean");
        resolveUnit(text, n.quantity);
        resolveUnit(text, n.quantity, true);
        unitQuantity(text, n.quantity);
        normaliseUnit(text, n.quantity);
        expect(typeof parseTree(text).ok).toBe("boolean");
        expect(
          typeof parseTree(
            `# T\n- category: oven\n- symptom: s\n- start: a\n\n## Measurement \`a\`: M\n- unit: ${text}\n- limits: ${text}\n- meter: ${text}\n- low → a\n`,
          ).ok,
        ).toBe("boolean");
        expect(
          typeof validateTreeData({
            title: "T",
            category: "oven",
            symptom: "s",
            start: "a",
            nodes: [{ id: "a", kind: "measurement", title: "M", ...n, unit: text, branches: {} }],
          }).result.ok,
        ).toBe("boolean");
      }),
      { numRuns: 3000 },
    );
  }, 60_000);
  it("property: the run takes any typed reading or rating as an entry (applied or refused), never a throw", () => {
    const atSupply = TO_SUPPLY;
    const atRating: LogEntry[] = [
      ...TO_SUPPLY,
      { type: "reading", node: "supply-voltage", reading: "208 V" },
      { type: "answer", node: "fans", answer: "one slow" },
      { type: "acknowledge", node: "cap-lockout" },
    ];
    fc.assert(
      fc.property(textArb, fc.boolean(), (text, confirmed) => {
        expect(typeof tryEntry(rotisserie, atSupply, { type: "reading", node: "supply-voltage", reading: text, confirmed }).ok).toBe(
          "boolean",
        );
        expect(typeof tryEntry(rotisserie, atRating, { type: "nameplate", node: "cap-rating", value: text }).ok).toBe("boolean");
        expect(typeof tryEntry(rotisserie, TO_AMBIENT, { type: "reading", node: "ambient", reading: text }).ok).toBe("boolean"); // a °C step
      }),
      { numRuns: 1000 },
    );
  }, 60_000);
});

// ------------------------------------------------------------------------------------------------
describe("item 2: the trade's units with NIST SP 811 (2008) Appendix B factors", () => {
  it("1 inch of water (conventional) = 249.0889 Pa, not the 4 °C water of the library (NIST SP 811 B.8, read)", () => {
    // NIST prints 2.490 889 E+02: the engine must agree to half a unit in that last digit.
    expect(Math.abs(convert(1, "inWC", "Pa", "pressure") - 249.0889)).toBeLessThanOrEqual(0.00005);
    expect(convert(3.5, "inWC", "Pa", "pressure")).toBeCloseTo(871.8, 1); // NIST SP 811 B.8 (read)
  });
  it("1 psi = 6894.757293 Pa: one pound-force (0.45359237 kg × 9.80665 m/s²) per square inch (NIST SP 811 B.8 prints 6.894 757 E+03, read)", () => {
    expect(Math.abs(convert(1, "psi", "Pa", "pressure") - 6894.757293)).toBeLessThanOrEqual(5e-7);
    expect(convert(1, "psi", "kPa", "pressure")).toBeCloseTo(6.894757, 6);
  });
  it("the other conventional factors (NIST SP 811 B.8, from memory): inch of mercury 3.386 389 E+03 Pa, Btu_IT/h 2.930 711 E-01 W", () => {
    expect(Math.abs(convert(1, "inHg", "Pa", "pressure") - 3386.389)).toBeLessThanOrEqual(0.0005);
    expect(Math.abs(convert(1, "BTU/h", "W", "power") - 0.2930711)).toBeLessThanOrEqual(5e-8);
  });
  it("°C = (°F − 32) / 1.8 exactly at the Food Code's holding temperatures (NIST SP 811 B.9, read)", () => {
    expect(convert(135, "°F", "°C", "temperature")).toBeCloseTo(57.2222222222, 9);
    expect(convert(41, "°F", "°C", "temperature")).toBeCloseTo(5, 12);
  });

  // Every unit the engine converts exactly, against mathjs (a general-purpose reference library),
  // with the tolerance its definition allows: exact definitions (SI prefixes, minutes, bar, the
  // temperature scales, conventional water and mercury columns, the IT Btu) agree to rounding
  // (1e-12); the psi rests on mathjs's own lbf/in² constant, which carries 1e-10.
  const EXACT = 1e-12;
  const REF: Record<string, [mathjs: string | ((x: number) => number), si: string, relTol: number]> = {
    V: ["V", "V", EXACT],
    mV: ["mV", "V", EXACT],
    kV: ["kV", "V", EXACT],
    uV: ["uV", "V", EXACT],
    A: ["A", "A", EXACT],
    mA: ["mA", "A", EXACT],
    uA: ["uA", "A", EXACT],
    kA: ["kA", "A", EXACT],
    Ohm: ["ohm", "ohm", EXACT],
    mOhm: ["mohm", "ohm", EXACT],
    kOhm: ["kohm", "ohm", EXACT],
    MOhm: ["Mohm", "ohm", EXACT],
    GOhm: ["Gohm", "ohm", EXACT],
    F: ["F", "F", EXACT],
    mF: ["mF", "F", EXACT],
    uF: ["uF", "F", EXACT],
    nF: ["nF", "F", EXACT],
    pF: ["pF", "F", EXACT],
    W: ["W", "W", EXACT],
    kW: ["kW", "W", EXACT],
    mW: ["mW", "W", EXACT],
    MW: ["MW", "W", EXACT],
    Hz: ["Hz", "Hz", EXACT],
    kHz: ["kHz", "Hz", EXACT],
    MHz: ["MHz", "Hz", EXACT],
    s: ["s", "s", EXACT],
    ms: ["ms", "s", EXACT],
    us: ["us", "s", EXACT],
    min: ["min", "s", EXACT],
    h: ["h", "s", EXACT],
    d: ["day", "s", EXACT],
    Pa: ["Pa", "Pa", EXACT],
    hPa: ["hPa", "Pa", EXACT],
    kPa: ["kPa", "Pa", EXACT],
    MPa: ["MPa", "Pa", EXACT],
    mbar: ["mbar", "Pa", EXACT],
    bar: ["bar", "Pa", EXACT],
    atm: ["atm", "Pa", EXACT],
    psi: ["psi", "Pa", 1e-10],
    inH2O: [(x) => mathUnit(25.4 * x, "mmH2O").toNumber("Pa"), "Pa", EXACT], // 25.4 mm of water, conventional
    cmH2O: [(x) => mathUnit(10 * x, "mmH2O").toNumber("Pa"), "Pa", EXACT],
    // mathjs gives the millimetre of mercury to six figures (133.322 Pa; conventional 133.3224 Pa):
    // its definition allows half a unit in that last place, 0.0005 / 133.322.
    inHg: [(x) => mathUnit(25.4 * x, "mmHg").toNumber("Pa"), "Pa", 0.0005 / 133.322],
    mmHg: ["mmHg", "Pa", 0.0005 / 133.322],
    "BTU/h": [(x) => mathUnit(x, "BTU").toNumber("J") / 3600, "W", EXACT],
    rpm: [(x) => mathUnit(2 * Math.PI * x, "rad/minute").toNumber("rad/s"), "rad/s", EXACT],
    "rad/s": ["rad/s", "rad/s", EXACT],
    tempK: ["K", "K", EXACT],
    tempC: ["degC", "K", EXACT],
    tempF: ["degF", "K", EXACT],
    degK: [(x) => x, "K", EXACT],
    degC: [(x) => mathUnit(x, "degC").toNumber("K") - mathUnit(0, "degC").toNumber("K"), "K", EXACT],
    degF: [(x) => mathUnit(x, "degF").toNumber("K") - mathUnit(0, "degF").toNumber("K"), "K", 1e-11],
  };
  it("the cross-check lists every unit the engine converts exactly", () => {
    expect(Object.keys(REF).sort()).toEqual(Object.keys(EXACT_FACTORS).sort());
  });
  it.each(Object.keys(REF))(
    "%s agrees with mathjs within its definition's tolerance",
    (name) => {
      const [ref, si, tol] = REF[name]!;
      const [factor, offset = 0] = EXACT_FACTORS[name]!;
      fc.assert(
        fc.property(fc.double({ min: name.startsWith("temp") ? 0 : -1e6, max: 1e6, noNaN: true }), (x) => {
          const ours = x * factor + offset;
          const theirs = typeof ref === "function" ? ref(x) : mathUnit(x, ref).toNumber(si);
          expect(Math.abs(ours - theirs)).toBeLessThanOrEqual(tol * Math.max(1, Math.abs(theirs)) * 4);
        }),
        { numRuns: 100 },
      );
    },
    60_000,
  );
});

// ------------------------------------------------------------------------------------------------
describe("item 3: a converted reading shows what was typed, its conversion, and enough digits to tell it from its limit", () => {
  it("57.2 °C on an at-least-135 °F step (FDA Food Code 2022 §3-501.16(A), read; NIST SP 811 B.9): 134.96 °F is low, and reads so", () => {
    const v = judged(hotHoldingF, "57.2 °C");
    expect(v.verdict).toBe("low");
    expect(v.message).toBe("57.2 °C = 134.96 °F — low: below 135 °F");
    expect(v.preview).toBe("57.2 °C = 134.96 °F → low: below 135 °F");
  });
  it("57.5 °C is 135.5 °F: within, and never shown as 135 °F", () => {
    expect(judged(hotHoldingF, "57.5 °C").message).toBe("57.5 °C = 135.5 °F — within: at least 135 °F");
  });
  it("a reading in the step's own unit reads as typed", () => {
    expect(judged(hotHoldingF, "134.9 °F").message).toBe("134.9 °F — low: below 135 °F");
    expect(judged(node("capacitance", "µF", range(1.41, 1.59)), "1470 nF").message).toBe("1470 nF = 1.47 µF — within 1.41–1.59 µF");
  });
});

// ------------------------------------------------------------------------------------------------
describe("item 4: judged against the exact limits; rounded only for display, never against the verdict", () => {
  // IEC 60751:2008 platinum RTD R(t) = R0 (1 + A t + B t²), A = 3.9083e-3, B = −5.775e-7 (from memory).
  const pt1000 = node("resistance", "Ω", {
    kind: "nominal",
    nominal: { formula: "1000 * (1 + 3.9083e-3 * t - 5.775e-7 * t^2)" },
    tolerance: { kind: "percent", plus: 0.5, minus: 0.5 },
  });
  it("a Pt1000 at 25 °C ± 0.5 % is 1091.86–1102.83 Ω; 1102.83 Ω is within, and the limits shown say so", () => {
    const l = computeLimits(pt1000, { t: 25 });
    if (!l.ok) throw new Error(l.message);
    const r25 = 1000 * (1 + 3.9083e-3 * 25 - 5.775e-7 * 625);
    expect(l.limits.hi).toBeCloseTo(r25 * 1.005, 10); // exact, not the 1102.8 shown
    expect(l.limits.lo).toBeCloseTo(r25 * 0.995, 10);
    const v = judged(pt1000, "1102.83 Ω", { variables: { t: 25 } });
    expect(v.verdict).toBe("within");
    expect(v.message).toMatch(/^1102\.83 Ω — within 1091\.86–1102\.83 Ω /);
    expect(v.limits.text).toBe("1091.86–1102.83 Ω");
  });
  it("just outside the exact limits is out (the limit's usual rounding already shows it so)", () => {
    expect(judged(pt1000, "1102.84 Ω", { variables: { t: 25 } }).message).toMatch(/^1102\.84 Ω — high: above 1102\.8 Ω/);
    expect(judged(pt1000, "1102.835 Ω", { variables: { t: 25 } }).message).toMatch(/^1102\.835 Ω — high: above 1102\.8 Ω/);
    expect(judged(pt1000, "1091.85 Ω", { variables: { t: 25 } }).message).toMatch(/^1091\.85 Ω — low: below 1091\.9 Ω/);
    // a converted reading gains digits until it shows on the right side: 1.10283 kΩ is within, 1.102835 kΩ high
    expect(judged(pt1000, "1.10283 kΩ", { variables: { t: 25 } }).message).toMatch(
      /^1\.10283 kΩ = 1102\.83 Ω — within 1091\.86–1102\.83 Ω/,
    );
    expect(judged(pt1000, "1.102835 kΩ", { variables: { t: 25 } }).message).toMatch(/^1\.102835 kΩ = 1102\.835 Ω — high: above 1102\.8 Ω/);
  });
  it("property: the numbers a message shows never contradict its verdict", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 5000, noNaN: true }),
        fc.double({ min: 0.05, max: 20, noNaN: true }),
        fc.double({ min: -0.3, max: 0.3, noNaN: true }),
        fc.integer({ min: 0, max: 4 }),
        fc.boolean(),
        (nominal, pct, offset, dec, converted) => {
          const n = node("resistance", "Ω", {
            kind: "nominal",
            nominal: { formula: "r" },
            tolerance: { kind: "percent", plus: pct, minus: pct },
          });
          const x = nominal * (1 + ((1 + Math.sign(offset)) * pct) / 100 - pct / 100 + offset / 100);
          const text = converted ? `${(x / 1000).toFixed(dec + 3)} kΩ` : `${x.toFixed(dec)} Ω`;
          const r = evaluateReading(n, text, { variables: { r: nominal } });
          if (!r.ok) return;
          const v = r.verdict;
          const shown = Number(v.reading.display);
          const lo = Number(v.limits.loText!.split(" ")[0]);
          const hi = Number(v.limits.hiText!.split(" ")[0]);
          if (v.verdict === "low") expect(shown).toBeLessThan(lo);
          if (v.verdict === "high") expect(shown).toBeGreaterThan(hi);
          if (v.verdict === "within") expect(lo <= shown && shown <= hi).toBe(true);
          // and the verdict is the exact one (to the engine's float tolerance, 1e-9 of the largest magnitude)
          const exactLo = nominal * (1 - pct / 100);
          const exactHi = nominal * (1 + pct / 100);
          const e = 1e-9 * Math.max(exactHi, Math.abs(v.reading.value));
          if (v.reading.value < exactLo - e) expect(v.verdict).toBe("low");
          if (v.reading.value > exactHi + e) expect(v.verdict).toBe("high");
          if (v.reading.value >= exactLo + e && v.reading.value <= exactHi - e) expect(v.verdict).toBe("within");
        },
      ),
      { numRuns: 2000 },
    );
  }, 60_000);
});

// ------------------------------------------------------------------------------------------------
describe("item 5: guarded acceptance states the acceptance limit it used (ILAC-G8:09/2019 §4.2.2, w = U, read)", () => {
  const guarded = node("voltage", "V", range(114, 126), { meter: meter1pc3, acceptance: "guarded" }); // ANSI C84.1 Range A, 120 V (read, secondary)
  it("124.46 V: U = 1.2446 + 0.3 = 1.5446 V, acceptance limit 126 − U = 124.455 V, and the printed arithmetic holds", () => {
    const v = judged(guarded, "124.46 V");
    expect(v.verdict).toBe("marginal");
    expect(v.message).toBe(
      "124.46 V — marginal: inside 114–126 V but above the acceptance limit 124.455 V (the high limit 126 V − the meter's 1.545 V); re-measure or use a better meter",
    );
    expect(v.acceptanceZone?.hi).toBeCloseTo(126 - 1.5446, 12);
  });
  it("the low side: 114.5 V, U = 1.445 V, acceptance limit 115.445 V", () => {
    const v = judged(guarded, "114.5 V");
    expect(v.verdict).toBe("marginal");
    expect(v.message).toMatch(/below the acceptance limit 115\.4 V \(the low limit 114 V \+ the meter's 1\.4 V\)/);
  });
  it("a within reading under guarded acceptance names the acceptance limits it cleared", () => {
    expect(judged(guarded, "120.0 V").message).toBe("120.0 V — within 114–126 V (meter ±1.5 V; acceptance limits 115.5–124.5 V)");
  });
  it("property: shown limit ∓ shown U = shown acceptance limit, and the reading sits on the side the verdict says", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 10, max: 500, noNaN: true }),
        fc.double({ min: 0.5, max: 30, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.constantFrom(1, 2),
        (lo, width, t, dec) => {
          const n = node("voltage", "V", range(Number(lo.toFixed(1)), Number((lo + width).toFixed(1))), {
            meter: meter1pc3,
            acceptance: "guarded",
          });
          const L = n.limits as { min: { value: number }; max: { value: number } };
          const x = (L.min.value + t * (L.max.value - L.min.value)).toFixed(dec);
          const v = judged(n, `${x} V`);
          expect(v.acceptanceText).toBeDefined();
          if (!v.acceptanceText) return;
          const num = (s: string) => Number(s.split(" ")[0]);
          const u = num(v.acceptanceText.u);
          const places = (s: string) => (s.split(" ")[0]!.split(".")[1] ?? "").length;
          const dA = Math.max(
            places(v.acceptanceText.u),
            places(v.acceptanceText.lo ?? "0"),
            places(v.acceptanceText.hi ?? "0"),
            places(v.limits.loText!),
            places(v.limits.hiText!),
          );
          if (v.acceptanceText.lo) expect((num(v.limits.loText!) + u).toFixed(dA)).toBe(num(v.acceptanceText.lo).toFixed(dA));
          if (v.acceptanceText.hi) expect((num(v.limits.hiText!) - u).toFixed(dA)).toBe(num(v.acceptanceText.hi).toFixed(dA));
          const r = Number(v.reading.display);
          if (v.verdict === "marginal" && v.side === "high") expect(r).toBeGreaterThan(num(v.acceptanceText.hi!));
          if (v.verdict === "marginal" && v.side === "low") expect(r).toBeLessThan(num(v.acceptanceText.lo!));
          if (v.verdict === "within") expect(r >= num(v.acceptanceText.lo!) && r <= num(v.acceptanceText.hi!)).toBe(true);
        },
      ),
      { numRuns: 2000 },
    );
  }, 60_000);
});

// ------------------------------------------------------------------------------------------------
describe("item 6: a meter's overload display (common practice: OL, O.L, 0.L)", () => {
  const element = node("resistance", "Ω", {
    kind: "nominal",
    nominal: { value: 10.9 },
    tolerance: { kind: "percent", plus: 10, minus: 10 },
  });
  it.each(["OL", "O.L", "0.L", "-OL", "ol", "OL.", "O.L MΩ"])("‘%s’ on an element's resistance is an open circuit: high", (text) => {
    const v = judged(element, text);
    expect(v.verdict).toBe("high");
    expect(v.reading.overload).toBe(true);
    expect(v.message).toBe("OL — the meter shows overload (open circuit): high, above 11.99 Ω (10.9 Ω ± 10 %)");
  });
  it("‘0.L’ is no longer read as 0 litres, and ‘0 L’ is still a volume", () => {
    expect(isOverload("0.L")).toBe(true);
    expect(isOverload("0 L")).toBe(false);
    expect(isOverload("0L")).toBe(false);
  });
  it("on a resistance step with only a lower limit (insulation), open is within", () => {
    expect(judged(node("resistance", "MΩ", { kind: "atLeast", min: { value: 1 } }), "OL").verdict).toBe("within");
  });
  it("elsewhere it counts as high only when the meter's range top is at or above the upper limit; otherwise: change range", () => {
    expect(refused(supply208, "OL")).toMatchObject({
      code: "overload",
      message:
        "The meter shows overload (above its range), which doesn't say whether the reading is 191–218 V: switch to a higher range and measure again.",
    });
    expect(judged(supply208, "OL", { meter: { ...meter1pc3, range: 600 } }).message).toBe(
      "OL — the meter shows overload (above its 600 V range): high, above 218 V",
    );
    expect(refused(supply208, "OL", { meter: { ...meter1pc3, range: 200 } }).code).toBe("overload");
    expect(refused(hotHoldingF, "OL").code).toBe("overload"); // an open probe must never pass a hot-holding check
  });
  it("the rotisserie tree's element check takes OL to the open element; a rating can't be OL", () => {
    const r = tryEntry(rotisserie, TO_ELEMENT, { type: "reading", node: "element-ohms", reading: "O.L" });
    expect(r.ok && r.state.finished).toEqual({ kind: "outcome", node: "element-open" });
    const rating = tryEntry(rotisserie, TO_ELEMENT.slice(0, -1), { type: "nameplate", node: "element-watts", value: "OL" });
    expect(!rating.ok && rating.rejection.message).toMatch(/type the rating printed on the nameplate/);
  });
});

// ------------------------------------------------------------------------------------------------
describe("item 7: messages speak of the step's quantity and suggest what was meant", () => {
  const cap = node("capacitance", "µF", { kind: "nominal", nominal: { value: 1.5 }, tolerance: { kind: "percent", plus: 6, minus: 6 } }); // fan run capacitor (common practice)
  const gas = node("pressure", "inWC", range(3.2, 3.8)); // natural-gas manifold about 3.5 inWC (common practice)
  const oven = node("temperature", "°F", {
    kind: "nominal",
    nominal: { value: 350 },
    tolerance: { kind: "absolute", plus: 15, minus: 15 },
  });
  const ohms = node("resistance", "Ω", range(1000, 1200));
  it.each([
    [cap, "1.47µ", "‘µ’ alone isn't a unit of capacitance: did you mean 1.47 µF?", ["1.47 µF"]],
    [gas, "25 mb", "‘mb’ isn't a unit of pressure: did you mean 25 mbar?", ["25 mbar"]],
    [oven, "350 deg", "‘deg’ doesn't say which scale: did you mean 350 °F or 350 °C?", ["350 °F", "350 °C"]],
    [ohms, "1 100 Ω", "Type the number without spaces: did you mean 1100 Ω?", ["1100 Ω"]],
  ] as const)("%#: ‘%s’", (n, text, message, suggestions) => {
    const r = refused(n, text);
    expect(r.message).toBe(message);
    expect(r.suggestions).toEqual(suggestions);
    // and the suggestion reads
    expect(evaluateReading(n, suggestions[0]).ok).toBe(true);
  });
  it("the not-a-number hint gives an example in the step's own quantity and unit", () => {
    expect(refused(supply208, "abc").message).toBe("‘abc’ doesn't start with a number: type the reading like 120 V.");
    expect(refused(cap, "abc").message).toBe("‘abc’ doesn't start with a number: type the reading like 1.47 µF.");
    expect(refused(node("capacitance", "nF", range(1, 2)), "?").message).toMatch(/like 1470 nF\.$/);
    expect(refused(ohms, "open").message).toMatch(/like 10\.9 Ω \(or OL when the meter shows overload\)\.$/);
    expect(refused(supply208, "").message).toBe("Type a reading, like 120 V.");
  });
  it("a unit of another quantity still says which quantity the step wants", () => {
    expect(refused(cap, "208 V").message).toBe("Expected a capacitance, got a voltage (‘208 V’): type it in µF, nF, pF or F.");
    expect(refused(cap, "1.5 uFF").message).toBe("‘uFF’ isn't a unit of capacitance Cluepath knows: type it in µF, nF, pF or F.");
  });
});

// ------------------------------------------------------------------------------------------------
describe("item 8: impossible values refused; implausible ones confirmed before they count", () => {
  it("a negative capacitance or resistance is impossible", () => {
    expect(refused(node("capacitance", "µF", range(1.41, 1.59)), "-1.47 µF")).toMatchObject({
      code: "impossible",
      message: "A capacitance can't be below zero (‘-1.47 µF’): check the reading, and zero the meter's leads if it shows a minus sign.",
    });
    expect(refused(node("resistance", "Ω", range(9, 12)), "-5 Ω").code).toBe("impossible");
    // a negative DC voltage or a vacuum is a real reading
    expect(evaluateReading(node("voltage", "V", range(-15, 15)), "-12 V").ok).toBe(true);
    expect(evaluateReading(node("pressure", "inWC", range(-0.5, 0.5)), "-0.1 inWC").ok).toBe(true);
  });
  it("a rating of 0 or below is impossible (a temperature rating may be below 0 °C)", () => {
    for (const v of ["0 µF", "-1.5 µF", "0"]) expect(parseRating(v, "capacitance", "µF")).toMatchObject({ ok: false, code: "impossible" });
    expect(parseRating("0 W", "power", "W")).toMatchObject({
      ok: false,
      message: "A rated power of 0 W can't be right: a rating is above zero. Check the nameplate.",
    });
    expect(parseRating("-18 °C", "temperature", "°C").ok).toBe(true);
  });
  it("non-finite input is refused", () => {
    expect(refused(supply208, "1e400 V").code).toBe("not-finite");
  });
  it("a reading above the chosen meter's stated range is refused", () => {
    expect(refused(supply208, "750 V", { meter: { ...meter1pc3, range: 600 } })).toMatchObject({
      code: "over-range",
      message:
        "750 V is above the top of this meter's 600 V range, so the meter can't have shown it: check the reading and the range setting.",
    });
    expect(refused(supply208, "0.75 kV", { meter: { ...meter1pc3, range: 600 } }).code).toBe("over-range");
    expect(evaluateReading(supply208, "600 V", { meter: { ...meter1pc3, range: 600 } }).ok).toBe(true);
  });
  it("‘208’ with mV chosen on a volts step: judged, but to be confirmed — did you mean 208 V?", () => {
    const v = judged(supply208, "208 mV");
    expect(v.verdict).toBe("low");
    expect(v.confirm).toEqual({ reason: "unit-slip", message: "That is 0.208 V — did you mean 208 V?", suggestion: "208 V" });
  });
  it("a bare 1470 on a 1.5 µF step is probably nanofarads", () => {
    expect(judged(node("capacitance", "µF", range(1.41, 1.59)), "1470").confirm?.message).toBe("That is 1470 µF — did you mean 1470 nF?");
  });
  it("1e9 V on a 208 V supply is more than a thousand times the limit", () => {
    expect(judged(supply208, "1e9 V").confirm).toEqual({
      reason: "far-above",
      message: "That is 1000000000 V, more than a thousand times the upper limit 218 V: is that right?",
    });
  });
  it("what the trade finds is never questioned: a dead supply, a shorted or open part, a hot cavity", () => {
    expect(judged(supply208, "0 V").confirm).toBeUndefined();
    expect(judged(supply208, "0.5 V").confirm).toBeUndefined();
    expect(judged(node("resistance", "Ω", { kind: "atMost", max: { value: 1 } }), "2 kΩ").confirm).toBeUndefined(); // a burnt contact
    expect(judged(node("capacitance", "µF", range(1.41, 1.59)), "0.01 µF").confirm).toBeUndefined(); // an open capacitor
    expect(judged(node("temperature", "°C", { kind: "atMost", max: { value: 40 } }), "60 °C").confirm).toBeUndefined();
    expect(judged(node("temperature", "°F", { kind: "atMost", max: { value: 104 } }), "60 °C").confirm).toBeUndefined(); // °C for °F is not a slip
  });
  it("the run refuses an implausible reading until it is confirmed, and records the confirmation", () => {
    const refusedEntry = tryEntry(rotisserie, TO_SUPPLY, { type: "reading", node: "supply-voltage", reading: "208 mV" });
    expect(refusedEntry.ok).toBe(false);
    if (refusedEntry.ok) return;
    expect(refusedEntry.rejection).toMatchObject({
      code: "needs-confirmation",
      message: "That is 0.208 V — did you mean 208 V?",
      confirm: { suggestion: "208 V" },
    });
    expect(refusedEntry.state.current).toBe("supply-voltage");
    const confirmed = tryEntry(rotisserie, TO_SUPPLY, { type: "reading", node: "supply-voltage", reading: "208 mV", confirmed: true });
    expect(confirmed.ok && confirmed.step).toMatchObject({ confirmed: true, branch: "low", to: "low-supply" });
  });
});

describe("item 8: a confirmation gates a new entry; a stored log replays as it was accepted", () => {
  it("replay does not ask again (the step was confirmed when it was stored), and records the flag when the log keeps it", () => {
    const log: LogEntry[] = [...TO_SUPPLY, { type: "reading", node: "supply-voltage", reading: "208 mV" }];
    expect(replay(rotisserie, log).finished).toEqual({ kind: "escalate", node: "low-supply", reason: expect.any(String) });
    const kept: LogEntry[] = [...TO_SUPPLY, { type: "reading", node: "supply-voltage", reading: "208 mV", confirmed: true }];
    expect(replay(rotisserie, kept).steps.at(-1)?.confirmed).toBe(true);
    expect(replay(rotisserie, log).steps.at(-1)?.confirmed).toBeUndefined();
  });
});
