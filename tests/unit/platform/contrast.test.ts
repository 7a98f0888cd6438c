import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";

// WCAG 2.2 SC 1.4.3 (Contrast, Minimum, level AA): text needs 4.5:1. Relative luminance and
// contrast ratio as WCAG 2.2 defines them (sRGB, 0.03928 threshold).
const css = readFileSync("app/app.css", "utf8");
const colour = (name: string): string => {
  const m = css.match(new RegExp(`--color-${name}:\\s*(#[0-9a-fA-F]{6})`));
  if (!m) throw new Error(`no --color-${name} in app.css`);
  return m[1]!;
};
const luminance = (hex: string) => {
  const [r, g, b] = [1, 3, 5].map((i) => {
    const c = parseInt(hex.slice(i, i + 2), 16) / 255;
    return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!;
};
const ratio = (a: string, b: string) => {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (hi! + 0.05) / (lo! + 0.05);
};

describe("theme contrast (WCAG 2.2 SC 1.4.3, AA ≥ 4.5:1)", () => {
  it("the formula gives the textbook extremes: black on white 21:1, a colour on itself 1:1", () => {
    expect(ratio("#000000", "#ffffff")).toBeCloseTo(21, 5);
    expect(ratio("#9c4521", "#9c4521")).toBeCloseTo(1, 5);
  });
  const pairs: [string, string][] = [
    ["ink", "paper"],
    ["ink", "card"],
    ["ink-soft", "paper"],
    ["ink-soft", "card"],
    ["copper", "card"],
    ["copper-dark", "copper-soft"],
    ["copper-dark", "paper"],
    ["out", "out-soft"],
    ["within", "within-soft"],
    ["marginal", "marginal-soft"],
    ["out", "card"],
    ["practice", "practice-soft"],
    ["practice", "card"],
  ];
  for (const [fg, bg] of pairs) {
    it(`${fg} text on ${bg} reaches 4.5:1`, () => {
      expect(ratio(colour(fg), colour(bg))).toBeGreaterThanOrEqual(4.5);
    });
  }
  it("white text on the copper button reaches 4.5:1", () => {
    expect(ratio("#ffffff", colour("copper"))).toBeGreaterThanOrEqual(4.5);
  });
  it("white text on the practice banner reaches 4.5:1", () => {
    expect(ratio("#ffffff", colour("practice"))).toBeGreaterThanOrEqual(4.5);
  });
});
