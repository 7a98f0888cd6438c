import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { unit as mathUnit } from "mathjs";
import { convert, normaliseUnit, parseReading, resolveUnit, unitQuantity } from "../../../app/engine/units";
import type { Quantity } from "../../../app/engine/types";

const ok = (text: string, q: Quantity, display: string) => {
  const r = parseReading(text, q, display);
  if (!r.ok) throw new Error(`${text}: ${r.message}`);
  return r;
};

describe("readings as technicians type them (issue 3 list)", () => {
  it.each([
    ["1.47 µF", "capacitance", "µF", 1.47],
    ["1.47uF", "capacitance", "µF", 1.47],
    ["1470 nF", "capacitance", "µF", 1.47],
    ["1.47 μF", "capacitance", "µF", 1.47], // Greek mu, as phone keyboards type it
    ["1.5 MFD", "capacitance", "µF", 1.5], // older capacitor marking
    ["208V", "voltage", "V", 208],
    ["208 VAC", "voltage", "V", 208],
    ["750 mV", "voltage", "V", 0.75],
    ["350 °F", "temperature", "°F", 350],
    ["350 F", "temperature", "°F", 350],
    ["3.5 inWC", "pressure", "inWC", 3.5],
    ["3.5 in. w.c.", "pressure", "inWC", 3.5],
    ['3.5 "WC', "pressure", "inWC", 3.5],
    ["1.1 kΩ", "resistance", "Ω", 1100],
    ["1.1 kohm", "resistance", "Ω", 1100],
    ["4.7k", "resistance", "Ω", 4700],
    ["2 MΩ", "resistance", "kΩ", 2000],
    ["12 A", "current", "A", 12],
    ["1140 rpm", "rotation", "rpm", 1140],
    ["1.47", "capacitance", "µF", 1.47], // a bare number is in the step's own unit
  ] as const)("%s on a %s step in %s", (text, q, display, expected) => {
    expect(ok(text, q, display).value).toBeCloseTo(expected, 9);
  });

  it("0.9 kPa on an inWC step converts through Pa (NIST SP 811 B.8: 1 inH2O ≈ 249.09 Pa)", () => {
    expect(ok("0.9 kPa", "pressure", "inWC").value).toBeCloseTo(900 / 249.0889, 3);
  });

  it("a bare F is a farad on a capacitance step, °F on a thermometer step", () => {
    expect(ok("2 F", "capacitance", "µF").value).toBeCloseTo(2e6, 3);
    expect(ok("212 F", "temperature", "°C").value).toBeCloseTo(100, 9);
  });

  it("keeps what was typed for display, and significant figures across a conversion", () => {
    expect(ok("1.40 µF", "capacitance", "µF").display).toBe("1.40");
    expect(ok("120.0 V", "voltage", "V").display).toBe("120.0");
    expect(ok("1470 nF", "capacitance", "µF").display).toBe("1.47");
    expect(ok("-5 °C", "temperature", "°F").display).toBe("23.0");
  });

  it("gives the SI value alongside (kelvin for temperatures)", () => {
    const r = ok("1470 nF", "capacitance", "µF");
    expect(r.si).toBeCloseTo(1.47e-6, 15);
    expect(r.siUnit).toBe("F");
    const t = ok("32 °F", "temperature", "°F");
    expect(t.si).toBeCloseTo(273.15, 9);
    expect(t.siUnit).toBe("K");
  });
});

describe("wrong or unreadable readings are errors with a message, never a value", () => {
  it("a voltage typed on a capacitance step", () => {
    const r = parseReading("208 V", "capacitance", "µF");
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.code).toBe("wrong-dimension");
      expect(r.message).toMatch(/^Expected a capacitance, got a voltage/);
    }
  });
  it("a length typed on a voltage step", () => {
    const r = parseReading("12 in", "voltage", "V");
    expect(!r.ok && r.message).toMatch(/Expected a voltage, got a length/);
  });
  it.each(["", "   ", "abc", "µF", "1.2.3 V", "one volt"])("‘%s’ is refused", (text) => {
    expect(parseReading(text, "voltage", "V").ok).toBe(false);
  });
  it("a temperature below absolute zero is refused, not converted", () => {
    const r = parseReading("-500 °F", "temperature", "°C");
    expect(!r.ok && r.code).toBe("below-absolute-zero");
  });
  it("an unknown unit says which units would do", () => {
    const r = parseReading("1.5 uFF", "capacitance", "µF");
    expect(!r.ok && r.code).toBe("unknown-unit");
    expect(!r.ok && r.message).toMatch(/µF, nF, pF or F/);
  });
});

describe("decimal comma (decision: accept 1,47 as 1.47; refuse 1,470 as ambiguous)", () => {
  it("1,47 µF is 1.47 µF", () => {
    expect(ok("1,47 µF", "capacitance", "µF").value).toBeCloseTo(1.47, 12);
  });
  it("1,470 nF could be 1470 or 1.470, so it is refused", () => {
    const r = parseReading("1,470 nF", "capacitance", "µF");
    expect(!r.ok && r.code).toBe("ambiguous-comma");
  });
  it("1,470.5 reads the comma as a thousands separator", () => {
    expect(ok("1,470.5 nF", "capacitance", "nF").value).toBeCloseTo(1470.5, 9);
  });
});

describe("NIST SP 811 (2008) conversions", () => {
  // B.9: °C = (°F − 32) / 1.8 (read)
  it.each([
    [32, 0],
    [212, 100],
    [-40, -40],
    [350, 176.6667],
    [135, 57.2222],
  ])("%d °F = (°F − 32)/1.8 = %d °C (NIST SP 811 B.9)", (f, c) => {
    expect(convert(f, "°F", "°C", "temperature")).toBeCloseTo(c, 3);
    expect(convert(f, "°F", "°C", "temperature")).toBeCloseTo((f - 32) / 1.8, 9);
  });
  it("1 inch of water (conventional) = 249.0889 Pa (NIST SP 811 B.8, read)", () => {
    // The engine's own factor, 25.4 mm × 1000 kg/m³ × 9.80665 m/s², not js-quantities' inH2O at
    // 39.2 °F water (249.0821 Pa): to the half unit of NIST's last printed digit.
    expect(Math.abs(convert(1, "inWC", "Pa", "pressure") - 249.0889)).toBeLessThanOrEqual(0.00005);
  });
  it("3.5 inWC = 871.8 Pa (NIST SP 811 B.8, read)", () => {
    expect(convert(3.5, "inWC", "Pa", "pressure")).toBeCloseTo(871.8, 1);
  });
  it("1 psi = 6.894757 kPa (NIST SP 811 B.8, read)", () => {
    expect(convert(1, "psi", "kPa", "pressure")).toBeCloseTo(6.894757, 5);
  });
  it("temperature spans convert without the offset: 15 °F span = 8.33 °C span", () => {
    expect(convert(15, "°F", "°C", "temperature", true)).toBeCloseTo(15 / 1.8, 9);
  });
});

// mathjs is the general-purpose reference library for the cross-check (devDependency only).
const PAIRS: [string, string, string, string, Quantity, number?][] = [
  // [ours from, ours to, mathjs from, mathjs to, quantity]
  ["µF", "nF", "uF", "nF", "capacitance"],
  ["pF", "µF", "pF", "uF", "capacitance"],
  ["V", "mV", "V", "mV", "voltage"],
  ["kV", "V", "kV", "V", "voltage"],
  ["mA", "A", "mA", "A", "current"],
  ["kΩ", "Ω", "kohm", "ohm", "resistance"],
  ["MΩ", "kΩ", "Mohm", "kohm", "resistance"],
  ["°F", "°C", "degF", "degC", "temperature", -459.67],
  ["°C", "K", "degC", "K", "temperature", -273.15],
  ["°F", "K", "degF", "K", "temperature", -459.67],
  ["psi", "kPa", "psi", "kPa", "pressure"],
  ["kPa", "Pa", "kPa", "Pa", "pressure"],
  ["mbar", "Pa", "mbar", "Pa", "pressure"],
  ["kW", "W", "kW", "W", "power"],
  ["BTU/h", "W", "BTU/h", "W", "power"],
  ["min", "s", "min", "s", "time"],
  ["kHz", "Hz", "kHz", "Hz", "frequency"],
];

describe("cross-check against mathjs units", () => {
  it.each(PAIRS)("%s → %s agrees with mathjs for any value", (from, to, mf, mt, q, absoluteZero) => {
    fc.assert(
      fc.property(fc.double({ min: absoluteZero === undefined ? -1e6 : absoluteZero + 1e-9, max: 1e6, noNaN: true }), (x) => {
        const ours = convert(x, from, to, q);
        const ref = mathUnit(x, mf).toNumber(mt);
        expect(Math.abs(ours - ref)).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(ref)));
      }),
      { numRuns: 200 },
    );
  });
  it("inWC → Pa agrees with mathjs built from 25.4 mm of water (conventional, so exactly)", () => {
    const ref = mathUnit(25.4, "mmH2O").toNumber("Pa"); // 249.0889 Pa, the conventional inch
    expect(Math.abs(convert(1, "inWC", "Pa", "pressure") - ref) / ref).toBeLessThan(1e-12);
  });
  it("typed readings land on the same value mathjs gives", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.001, max: 1e5, noNaN: true }), fc.constantFrom(...PAIRS), (x, [from, to, mf, mt, q]) => {
        const text = `${x} ${from}`;
        const r = parseReading(text, q, to);
        if (!r.ok) throw new Error(r.message);
        const ref = mathUnit(x, mf).toNumber(mt);
        expect(Math.abs(r.value - ref)).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(ref)));
      }),
      { numRuns: 300 },
    );
  });
});

describe("unit spelling and dimensions", () => {
  it.each([
    ["µF", "capacitance"],
    ["V", "voltage"],
    ["Ω", "resistance"],
    ["kΩ", "resistance"],
    ["°F", "temperature"],
    ["inWC", "pressure"],
    ["W", "power"],
    ["rpm", "rotation"],
    ["mA", "current"],
  ] as const)("%s measures %s", (u, q) => {
    expect(unitQuantity(u)).toBe(q);
  });
  it("readings are absolute temperatures; tolerances and resolutions are spans", () => {
    expect(resolveUnit("°F", "temperature")?.absoluteTemperature).toBe(true);
    expect(resolveUnit("°F", "temperature", true)?.absoluteTemperature).toBe(false);
    expect(normaliseUnit("°F")).toBe("tempF");
    expect(normaliseUnit("°F", "temperature", true)).toBe("degF");
  });
  it("unknown units resolve to nothing", () => {
    expect(resolveUnit("flurbs")).toBeNull();
    expect(unitQuantity("uFF")).toBeNull();
  });
});
