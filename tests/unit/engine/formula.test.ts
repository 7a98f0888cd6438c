import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { compileFormula, evaluateFormula, FormulaError } from "../../../app/engine/formula";

// evaluateFormula never throws (issue 10 item 1); here a refusal is rethrown so checks can say which.
const ev = (src: string, vars: Record<string, number> = {}) => {
  const r = evaluateFormula(src, vars);
  if (!r.ok) throw new FormulaError(r.message, r.code);
  return r.value;
};

describe("plain maths syntax", () => {
  it("^ is power and right-associative: 2^3^2 = 2^(3^2) = 512", () => {
    expect(ev("2^3^2")).toBe(512);
    expect(ev("(2^3)^2")).toBe(64);
  });
  it("usual precedence: * before +, ^ before *", () => {
    expect(ev("1 + 2 * 3")).toBe(7);
    expect(ev("2 * 3^2")).toBe(18);
    expect(ev("volts^2 / watts", { volts: 120, watts: 1320 })).toBeCloseTo(10.909090909, 9);
  });
  it("functions from the short list", () => {
    expect(ev("sqrt(16) + abs(-2) + min(3, 1, 2) + max(1, 5) + pow(2, 3)")).toBe(4 + 2 + 1 + 5 + 8);
    expect(ev("sqrt(3) * 208")).toBeCloseTo(360.267, 3);
    expect(ev("ln(exp(2)) + log10(1000)")).toBeCloseTo(5, 12);
    expect(ev("2 * pi")).toBeCloseTo(2 * Math.PI, 12);
  });
  it("negative numbers and exponents", () => {
    expect(ev("1 + 3.9083e-3 * t - 5.775e-7 * t^2", { t: 100 })).toBeCloseTo(1.3851, 4);
    expect(ev("2^-1")).toBe(0.5);
    expect(ev("-(t^2)", { t: 3 })).toBe(-9);
    expect(ev("(-t)^2", { t: 3 })).toBe(9);
  });
  it("a minus in front of a power is refused as ambiguous", () => {
    const r = compileFormula("-t^2");
    expect(r.ok).toBe(false);
    expect(!r.ok && r.message).toMatch(/write -\(t\^…\) or \(-t\)\^…/);
  });
  it("lists the variables a formula reads, once each, in order", () => {
    const r = compileFormula("a * b + a / c");
    expect(r.ok && r.formula.variables).toEqual(["a", "b", "c"]);
  });
});

describe("a safe evaluator: nothing but numbers, the run's variables and the listed functions", () => {
  it.each([
    ["a.b", "not-allowed"],
    ["a[0]", "not-allowed"],
    ["x ? 1 : 2", "not-allowed"],
    ["this", "not-allowed"],
    ["'text'", "not-allowed"],
    ["true", "not-allowed"],
    ["a == b", "not-allowed"],
    ["a % 2", "not-allowed"],
    ["a && b", "not-allowed"],
    ["!a", "not-allowed"],
    ["[1, 2]", "not-allowed"],
    ["eval(1)", "unknown-function"],
    ["Function(1)", "unknown-function"],
    ["constructor(1)", "unknown-function"],
    ["sqrt", "not-allowed"],
    ["min()", "not-allowed"],
    ["1 +", "syntax"],
    ["a, b", "syntax"],
    ["", "syntax"],
  ])("%s is refused (%s)", (src, code) => {
    const r = compileFormula(src);
    expect(r.ok).toBe(false);
    expect(!r.ok && r.code).toBe(code);
  });
  it.each(["constructor", "__proto__", "toString", "hasOwnProperty", "process", "globalThis", "window"])(
    "the name %s is only ever a run variable, never an object property or global",
    (name) => {
      expect(() => ev(name, {})).toThrow(FormulaError);
      expect(() => ev(name, {})).toThrow(/no value for/);
      expect(ev(`${name} * 2`, { [name]: 4 })).toBe(8);
    },
  );
  it("division by zero and other non-finite results are errors", () => {
    expect(() => ev("1 / x", { x: 0 })).toThrow(/no finite number/);
    expect(() => ev("sqrt(-1)")).toThrow(/no finite number/);
  });
});

// Reference model: a random expression tree, printed with full parentheses, evaluated directly.
type E =
  | { n: number }
  | { v: "a" | "b" | "c" }
  | { op: "+" | "-" | "*" | "/" | "^"; l: E; r: E }
  | { neg: E }
  | { f: "sqrt" | "abs" | "max"; args: E[] };
const eArb: fc.Arbitrary<E> = fc.letrec<{ e: E }>((tie) => ({
  e: fc.oneof(
    { depthSize: "small" },
    fc.double({ min: 0, max: 1000, noNaN: true }).map((n) => ({ n })),
    fc.constantFrom("a" as const, "b" as const, "c" as const).map((v) => ({ v })),
    fc.record({ op: fc.constantFrom("+" as const, "-" as const, "*" as const, "/" as const, "^" as const), l: tie("e"), r: tie("e") }),
    tie("e").map((neg) => ({ neg })),
    fc.record({ f: fc.constantFrom("sqrt" as const, "abs" as const), args: tie("e").map((x) => [x]) }),
    fc.record({ f: fc.constant("max" as const), args: fc.array(tie("e"), { minLength: 1, maxLength: 3 }) }),
  ),
})).e;
function print(e: E): string {
  if ("n" in e) return String(e.n);
  if ("v" in e) return e.v;
  if ("neg" in e) return `-(${print(e.neg)})`;
  if ("op" in e) return `(${print(e.l)}) ${e.op} (${print(e.r)})`;
  return `${e.f}(${e.args.map(print).join(", ")})`;
}
function model(e: E, vars: Record<string, number>): number {
  if ("n" in e) return e.n;
  if ("v" in e) return vars[e.v]!;
  if ("neg" in e) return -model(e.neg, vars);
  if ("op" in e) {
    const l = model(e.l, vars);
    const r = model(e.r, vars);
    return e.op === "+" ? l + r : e.op === "-" ? l - r : e.op === "*" ? l * r : e.op === "/" ? l / r : l ** r;
  }
  const args = e.args.map((x) => model(x, vars));
  return e.f === "sqrt" ? Math.sqrt(args[0]!) : e.f === "abs" ? Math.abs(args[0]!) : Math.max(...args);
}

describe("property: the evaluator agrees with a direct model of the same expression", () => {
  it("for random expressions and variables", () => {
    fc.assert(
      fc.property(
        eArb,
        fc.record({
          a: fc.double({ min: -100, max: 100, noNaN: true }),
          b: fc.double({ min: -100, max: 100, noNaN: true }),
          c: fc.double({ min: 0, max: 10, noNaN: true }),
        }),
        (e, vars) => {
          const expected = model(e, vars);
          const src = print(e);
          if (Number.isFinite(expected)) expect(ev(src, vars)).toBe(expected);
          else expect(() => ev(src, vars)).toThrow(FormulaError);
        },
      ),
      { numRuns: 500 },
    );
  });
});
