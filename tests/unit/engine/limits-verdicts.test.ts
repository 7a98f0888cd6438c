import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { computeLimits, LETTER_PERCENT } from "../../../app/engine/limits";
import { evaluateReading, judge, meterUncertainty } from "../../../app/engine/verdict";
import type { Limits, MeasurementNode, Meter, Quantity, ToleranceLetter } from "../../../app/engine/types";

type Node = Pick<MeasurementNode, "quantity" | "unit" | "limits" | "meter" | "acceptance">;
const node = (quantity: Quantity, unit: string, limits: Limits, extra: Partial<Node> = {}): Node => ({ quantity, unit, limits, ...extra });
const range = (min: number, max: number, unit?: string): Limits =>
  unit
    ? { kind: "range", min: { value: min, unit }, max: { value: max, unit } }
    : { kind: "range", min: { value: min }, max: { value: max } };
const pct = (nominal: number, p: number): Limits => ({
  kind: "nominal",
  nominal: { value: nominal },
  tolerance: { kind: "percent", plus: p, minus: p },
});

function verdictOf(n: Node, text: string, variables: Record<string, number> = {}, meter?: Meter) {
  const r = evaluateReading(n, text, meter ? { variables, meter } : { variables });
  if (!r.ok) throw new Error(r.message);
  return r.verdict;
}
function limitsOf(n: Node, vars: Record<string, number> = {}) {
  const r = computeLimits(n, vars);
  if (!r.ok) throw new Error(r.message);
  return r.limits;
}

describe("IEC 60062:2016+A1:2019 clause 5 tolerance letters (read, secondary copies)", () => {
  const expected: Record<ToleranceLetter, [number, number]> = {
    B: [0.1, 0.1],
    C: [0.25, 0.25],
    D: [0.5, 0.5],
    F: [1, 1],
    G: [2, 2],
    J: [5, 5],
    K: [10, 10],
    M: [20, 20],
    Z: [80, 20], // +80 / −20 %
  };
  it.each(Object.entries(expected).map(([l, [p, m]]) => [l, p, m] as const))(
    "letter %s on 4.7 kΩ gives +%s % / −%s %",
    (letter, plus, minus) => {
      const l = limitsOf(
        node("resistance", "Ω", {
          kind: "nominal",
          nominal: { value: 4.7, unit: "kΩ" },
          tolerance: { kind: "letter", letter: letter as ToleranceLetter },
        }),
      );
      const lo = 4700 * (1 - minus / 100);
      const hi = 4700 * (1 + plus / 100);
      // Computed limits are rounded to a step of at most 1 % of the span, so within half a step.
      expect(Math.abs(l.lo! - lo)).toBeLessThanOrEqual(0.005 * (hi - lo));
      expect(Math.abs(l.hi! - hi)).toBeLessThanOrEqual(0.005 * (hi - lo));
    },
  );
  it("the engine's letter table is exactly the standard's", () => {
    for (const [letter, [plus, minus]] of Object.entries(expected)) {
      expect(LETTER_PERCENT[letter as ToleranceLetter]).toEqual({ plus, minus });
    }
  });
  it.each([
    ["B", 0.1],
    ["C", 0.25],
    ["D", 0.5],
  ] as const)("below 10 pF, letter %s is ±%s pF absolute", (letter, pf) => {
    const l = limitsOf(node("capacitance", "pF", { kind: "nominal", nominal: { value: 4.7 }, tolerance: { kind: "letter", letter } }));
    expect(l.lo).toBeCloseTo(4.7 - pf, 9);
    expect(l.hi).toBeCloseTo(4.7 + pf, 9);
  });
  it("at 10 pF and above, B is a percentage again", () => {
    const l = limitsOf(node("capacitance", "pF", { kind: "nominal", nominal: { value: 100 }, tolerance: { kind: "letter", letter: "B" } }));
    expect(l.lo).toBeCloseTo(99.9, 9);
  });
  it("Z on a 10 µF part: 8–18 µF", () => {
    const v = verdictOf(
      node("capacitance", "µF", { kind: "nominal", nominal: { value: 10 }, tolerance: { kind: "letter", letter: "Z" } }),
      "17.9 µF",
    );
    expect(v.limits.text).toBe("8–18 µF");
    expect(v.verdict).toBe("within");
  });
});

describe("ANSI C84.1-2016 Table 1 voltage ranges", () => {
  it("120 V Range A service is 114–126 V, i.e. 120 V ± 5 % (read, secondary)", () => {
    const l = limitsOf(node("voltage", "V", pct(120, 5)));
    expect(l.lo).toBeCloseTo(114, 9);
    expect(l.hi).toBeCloseTo(126, 9);
  });
  it.each([
    ["114 V", "within"],
    ["113.9 V", "low"],
    ["126 V", "within"],
    ["126.1 V", "high"],
    ["0.1205 kV", "within"],
  ])("120 V Range A (114–126 V): %s is %s (read, secondary)", (text, v) => {
    expect(verdictOf(node("voltage", "V", range(114, 126)), text).verdict).toBe(v);
  });
  it.each([
    ["110 V", "within"],
    ["109.9 V", "low"],
    ["127 V", "within"],
    ["127.2 V", "high"],
  ])("120 V Range B (110–127 V): %s is %s (read, secondary)", (text, v) => {
    expect(verdictOf(node("voltage", "V", range(110, 127)), text).verdict).toBe(v);
  });
  it.each([
    ["197 V", "within"],
    ["196 V", "low"],
    ["218 V", "within"],
    ["219 V", "high"],
  ])("208Y/120 V Range A service (197–218 V): %s is %s (from memory)", (text, v) => {
    expect(verdictOf(node("voltage", "V", range(197, 218)), text).verdict).toBe(v);
  });
  it("240 V Range A is 228–252 V, i.e. 240 V ± 5 % (from memory)", () => {
    const l = limitsOf(node("voltage", "V", pct(240, 5)));
    expect([l.lo, l.hi]).toEqual([228, 252]);
  });
  it("a 208 V unit reading about 208 V across L1–L2 is within Range A (common practice)", () => {
    expect(verdictOf(node("voltage", "V", range(197, 218)), "208 V").verdict).toBe("within");
  });
});

describe("meter accuracy and ILAC-G8:09/2019 §4.1–4.2 decision rules (read)", () => {
  const meter: Meter = { percent: 1.0, counts: 3, resolution: 0.1 };
  it("±(1.0 % of reading + 3 counts) at 120.0 V on a 0.1 V range = ±1.5 V (meter makers' convention, read secondary)", () => {
    expect(meterUncertainty(meter, 120.0, "voltage", "V")).toBeCloseTo(1.5, 12);
    const v = verdictOf(node("voltage", "V", range(114, 126), { meter }), "120.0 V");
    expect(v.uncertainty?.value).toBeCloseTo(1.5, 12);
    expect(v.uncertainty?.text).toBe("±1.5 V");
    // so the true value lies in 118.5–121.5 V
    expect(v.reading.value - v.uncertainty!.value).toBeCloseTo(118.5, 9);
    expect(v.reading.value + v.uncertainty!.value).toBeCloseTo(121.5, 9);
  });
  it("the same meter read in mV gives the same span in V (uncertainty follows the meter's scale)", () => {
    const u = meterUncertainty({ percent: 1, counts: 3, resolution: 100, unit: "mV" }, 120, "voltage", "V");
    expect(u).toBeCloseTo(1.5, 9);
  });

  const guarded = node("voltage", "V", range(114, 126), { meter, acceptance: "guarded" });
  const simple = node("voltage", "V", range(114, 126), { meter });
  it("simple acceptance (w = 0) is the default: inside the limits is within, however close", () => {
    expect(verdictOf(simple, "114.5 V").verdict).toBe("within");
  });
  it("guarded acceptance (w = U): inside the limits but within U of one is marginal, with its side", () => {
    const low = verdictOf(guarded, "114.5 V"); // U = 1.145 + 0.3 = 1.445 V, acceptance limit 115.445 V
    expect(low.verdict).toBe("marginal");
    expect(low.side).toBe("low");
    expect(low.acceptanceZone?.lo).toBeCloseTo(114 + 1.445, 9);
    const high = verdictOf(guarded, "125.0 V");
    expect(high.verdict).toBe("marginal");
    expect(high.side).toBe("high");
  });
  it("guarded acceptance: beyond the guard band is within again", () => {
    expect(verdictOf(guarded, "115.5 V").verdict).toBe("within"); // U = 1.455 V → 115.455 V
    expect(verdictOf(guarded, "120.0 V").verdict).toBe("within");
  });
  it("outside the limits is low or high under either rule", () => {
    expect(verdictOf(guarded, "113.9 V").verdict).toBe("low");
    expect(verdictOf(guarded, "126.2 V").verdict).toBe("high");
  });
  it("the technician's own meter overrides the node's", () => {
    const fine: Meter = { percent: 0.1, counts: 1, resolution: 0.1 };
    expect(verdictOf(guarded, "114.5 V", {}, fine).verdict).toBe("within");
  });
  it("property: guarded never passes what simple fails, and agrees outside the limits", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -1e3, max: 1e3, noNaN: true }),
        fc.double({ min: 0, max: 1e3, noNaN: true }),
        fc.double({ min: -2e3, max: 2e3, noNaN: true }),
        fc.double({ min: 0, max: 100, noNaN: true }),
        (lo, width, x, u) => {
          const hi = lo + width;
          const s = judge(x, lo, hi, 0).verdict;
          const g = judge(x, lo, hi, u).verdict;
          if (s !== "within") expect(g).toBe(s);
          else expect(["within", "marginal"]).toContain(g);
          if (g === "within" && u > 0)
            expect(x >= lo + u - 1e-6 * Math.max(1, Math.abs(x)) && x <= hi - u + 1e-6 * Math.max(1, Math.abs(x))).toBe(true);
        },
      ),
    );
  });
  it("property: verdicts are ordered along the axis (low < within < high)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -1e3, max: 1e3, noNaN: true }),
        fc.double({ min: 0, max: 1e3, noNaN: true }),
        fc.double({ min: -2e3, max: 2e3, noNaN: true }),
        (lo, width, x) => {
          const hi = lo + width;
          const v = judge(x, lo, hi).verdict;
          if (x < lo - 1e-6 * Math.max(1, Math.abs(lo))) expect(v).toBe("low");
          if (x > hi + 1e-6 * Math.max(1, Math.abs(hi))) expect(v).toBe("high");
          if (x >= lo && x <= hi) expect(v).toBe("within");
        },
      ),
    );
  });
});

describe("motor-run capacitors (IEC 60252-1 marking; trade practice)", () => {
  it("40 µF ± 6 % → 37.6–42.4 µF (memory / common practice)", () => {
    const l = limitsOf(node("capacitance", "µF", pct(40, 6)));
    expect(l.lo).toBeCloseTo(37.6, 9);
    expect(l.hi).toBeCloseTo(42.4, 9);
    expect(l.text).toBe("37.6–42.4 µF");
  });
  const cap = node("capacitance", "µF", {
    kind: "nominal",
    nominal: { formula: "rated_uf" },
    tolerance: { kind: "percent", plus: 6, minus: 6 },
  });
  it.each(["1.47 µF", "1.48 µF", "1.49 µF", "1470 nF", "1.47uF", "1,48 µF"])(
    "a fan-motor run capacitor rated 1.5 µF reading %s is good (common practice)",
    (text) => {
      expect(verdictOf(cap, text, { rated_uf: 1.5 }).verdict).toBe("within");
    },
  );
  it("…and stays good under guarded acceptance with a ±(1 % + 2 counts) at 0.01 µF meter", () => {
    const g = { ...cap, meter: { percent: 1, counts: 2, resolution: 0.01 }, acceptance: "guarded" as const };
    for (const t of ["1.47 µF", "1.48 µF", "1.49 µF", "1470 nF"]) expect(verdictOf(g, t, { rated_uf: 1.5 }).verdict).toBe("within");
    expect(verdictOf(g, "1.42 µF", { rated_uf: 1.5 }).verdict).toBe("marginal");
  });
  it("the verdict reads as the screens show it", () => {
    const v = verdictOf(cap, "1.47 µF", { rated_uf: 1.5 });
    expect(v.message).toBe("1.47 µF — within 1.41–1.59 µF (1.5 µF ± 6 %)");
    expect(v.limits.derivation).toBe("1.5 µF ± 6 %");
    expect(v.limits.lo).toBeCloseTo(1.41, 12);
    expect(v.reading.si).toBeCloseTo(1.47e-6, 15);
    expect(verdictOf(cap, "1.40 µF", { rated_uf: 1.5 }).preview).toBe("1.40 µF → low: below 1.41 µF");
    expect(verdictOf(cap, "1.62 µF", { rated_uf: 1.5 }).preview).toBe("1.62 µF → high: above 1.59 µF");
  });
  it("a voltage typed at the capacitor step is an error, not a verdict", () => {
    const r = evaluateReading(cap, "208 V", { variables: { rated_uf: 1.5 } });
    expect(r.ok).toBe(false);
    expect(!r.ok && r.message).toMatch(/expected a capacitance, got a voltage/i);
  });
  it("without the rating recorded, the limits can't be computed (error, not a guess)", () => {
    const r = evaluateReading(cap, "1.47 µF", { variables: {} });
    expect(!r.ok && r.code).toBe("limits");
  });
});

describe("element resistance R = V²/P (physics; textbook worked example, read secondary)", () => {
  const element = node("resistance", "Ω", {
    kind: "nominal",
    nominal: { formula: "volts^2 / watts" },
    tolerance: { kind: "percent", plus: 10, minus: 10 },
  });
  it("1320 W at 120 V → 10.9 Ω", () => {
    const l = limitsOf(element, { volts: 120, watts: 1320 });
    expect(l.nominal).toBeCloseTo(10.9, 1);
    expect(l.nominal).toBeCloseTo((120 * 120) / 1320, 12);
    expect(l.derivation).toMatch(/^10\.91 Ω ± 10 %, from volts\^2 \/ watts$/);
  });
  it("a 10.9 Ω reading on that element is within; an open one (10 MΩ) is high", () => {
    expect(verdictOf(element, "10.9 Ω", { volts: 120, watts: 1320 }).verdict).toBe("within");
    expect(verdictOf(element, "10 MΩ", { volts: 120, watts: 1320 }).verdict).toBe("high");
  });
  it("a wattage entered in kW is a different number: formulas use each step's own unit", () => {
    const l = limitsOf(element, { volts: 120, watts: 1.32 });
    expect(l.nominal).toBeCloseTo(10909.09, 1);
  });
});

describe("IEC 60751:2008 platinum RTD via a derived-limit formula (from memory)", () => {
  const rtd = (r0: number) =>
    node("resistance", "Ω", {
      kind: "nominal",
      nominal: { formula: `${r0} * (1 + 3.9083e-3 * t - 5.775e-7 * t^2)` },
      tolerance: { kind: "percent", plus: 0.1, minus: 0.1 },
    });
  it("Pt100: 100.00 Ω at 0 °C", () => {
    expect(limitsOf(rtd(100), { t: 0 }).nominal).toBeCloseTo(100.0, 2);
  });
  it("Pt100: 138.51 Ω at 100 °C", () => {
    expect(limitsOf(rtd(100), { t: 100 }).nominal).toBeCloseTo(138.51, 2);
    expect(verdictOf(rtd(100), "138.51 Ω", { t: 100 }).verdict).toBe("within");
    expect(verdictOf(rtd(100), "139.5 Ω", { t: 100 }).verdict).toBe("high");
  });
  it("Pt1000 = 10 × Pt100", () => {
    expect(limitsOf(rtd(1000), { t: 100 }).nominal).toBeCloseTo(1385.1, 1);
  });
});

describe("FDA Food Code 2022 temperatures (read)", () => {
  const hotF = node("temperature", "°F", { kind: "atLeast", min: { value: 135 } });
  const hotC = node("temperature", "°C", { kind: "atLeast", min: { value: 57 } });
  it("hot holding at 135 °F or above (§3-501.16(A)): 135 °F within, 134 °F low", () => {
    expect(verdictOf(hotF, "135 °F").verdict).toBe("within");
    expect(verdictOf(hotF, "134 °F").verdict).toBe("low");
    expect(verdictOf(hotF, "134 °F").preview).toBe("134 °F → low: below 135 °F");
  });
  it("hot holding at 57 °C or above (§3-501.16(A)): a 135 °F reading on a °C step is 57.2 °C, within", () => {
    const v = verdictOf(hotC, "135 °F");
    expect(v.reading.value).toBeCloseTo((135 - 32) / 1.8, 9);
    expect(v.verdict).toBe("within");
  });
  it("57 °C is 134.6 °F: on a 135 °F step it is (just) low", () => {
    expect(verdictOf(hotF, "57 °C").verdict).toBe("low");
  });
  it("cold holding at 5 °C (41 °F) or below (§3-501.16(A)(2)): 41 °F on a ≤ 5 °C step is within", () => {
    const cold = node("temperature", "°C", { kind: "atMost", max: { value: 5 } });
    expect(verdictOf(cold, "41 °F").verdict).toBe("within");
    expect(verdictOf(cold, "42 °F").verdict).toBe("high");
  });
  it("poultry to 74 °C (165 °F) (§3-401.11(A)(3)): 74 °C on a ≥ 165 °F step is within", () => {
    const poultry = node("temperature", "°F", { kind: "atLeast", min: { value: 165 } });
    expect(verdictOf(poultry, "74 °C").verdict).toBe("within");
    expect(verdictOf(poultry, "73 °C").verdict).toBe("low");
  });
  it("a limit written in °C on a °F step converts as an absolute temperature", () => {
    const l = limitsOf(node("temperature", "°F", { kind: "atLeast", min: { value: 57, unit: "°C" } }));
    expect(l.lo).toBeCloseTo(57 * 1.8 + 32, 1);
  });
});

describe("gas manifold pressure (trade practice; the rating plate governs — common practice)", () => {
  const manifold = node("pressure", "inWC", {
    kind: "nominal",
    nominal: { formula: "rated" },
    tolerance: { kind: "absolute", plus: 0.3, minus: 0.3, unit: "inWC" },
  });
  it("natural gas about 3.5 inWC: a 3.5 inWC reading against a 3.5 rating is within", () => {
    expect(verdictOf(manifold, "3.5 inWC", { rated: 3.5 }).verdict).toBe("within");
  });
  it("LP about 10 inWC: a natural-gas setting read on an LP fryer is low", () => {
    expect(verdictOf(manifold, "3.5 inWC", { rated: 10 }).verdict).toBe("low");
  });
  it("a reading in Pa converts (871.8 Pa = 3.5 inWC, NIST SP 811 B.8)", () => {
    expect(verdictOf(manifold, "871.8 Pa", { rated: 3.5 }).reading.value).toBeCloseTo(3.5, 3);
  });
});

describe("limits details", () => {
  it("absolute temperature tolerances are spans: 350 °F ± 15 °F on a °C step", () => {
    const l = limitsOf(
      node("temperature", "°C", {
        kind: "nominal",
        nominal: { value: 350, unit: "°F" },
        tolerance: { kind: "absolute", plus: 15, minus: 15, unit: "°F" },
      }),
    );
    expect(l.lo).toBeCloseTo((335 - 32) / 1.8, 1);
    expect(l.hi).toBeCloseTo((365 - 32) / 1.8, 1);
  });
  it("asymmetric percentages: 120 V +5 % / −10 % → 108–126 V", () => {
    const l = limitsOf(
      node("voltage", "V", { kind: "nominal", nominal: { value: 120 }, tolerance: { kind: "percent", plus: 5, minus: 10 } }),
    );
    expect([l.lo, l.hi]).toEqual([108, 126]);
    expect(l.derivation).toBe("120 V +5 % / −10 %");
  });
  it("ranges may mix units: 20 Ω to 2 kΩ", () => {
    const l = limitsOf(node("resistance", "Ω", { kind: "range", min: { value: 20, unit: "Ω" }, max: { value: 2, unit: "kΩ" } }));
    expect(l.text).toBe("20–2000 Ω");
  });
  it("one-sided limits read as such", () => {
    expect(verdictOf(node("voltage", "mV", { kind: "atLeast", min: { value: 300 } }), "0.45 V").message).toBe(
      "0.45 V = 450 mV — within: at least 300 mV",
    ); // what was typed, then its conversion (issue 10 item 3);
  });
  it("inverted formula limits are an error at run time", () => {
    const r = computeLimits(node("voltage", "V", { kind: "range", min: { formula: "a" }, max: { formula: "b" } }), { a: 5, b: 1 });
    expect(!r.ok && r.code).toBe("inverted");
  });
  it("a limit of the wrong dimension is an error", () => {
    const r = computeLimits(node("capacitance", "µF", { kind: "atLeast", min: { value: 1, unit: "V" } }));
    expect(!r.ok && r.code).toBe("wrong-dimension");
  });
});
