import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { readFileSync, readdirSync } from "node:fs";
import { parseTree, formatParseError } from "../../../app/engine/markdown/parse";
import { serializeTree } from "../../../app/engine/markdown/serialize";
import { TreeSchema } from "../../../app/engine/schema";
import type { Tree } from "../../../app/engine/types";
import { treeArb } from "./arbitraries";

const TREES = new URL("../../../trees/", import.meta.url);
const files = readdirSync(TREES).filter((f) => f.endsWith(".md"));

function parsed(src: string): Tree {
  const r = parseTree(src);
  if (!r.ok) throw new Error(r.errors.map(formatParseError).join("\n"));
  return r.tree;
}

function errorsOf(src: string): string[] {
  const r = parseTree(src);
  if (r.ok) throw new Error("expected parse errors");
  return r.errors.map(formatParseError);
}

describe("round trip", () => {
  it("property: parse(serialize(tree)) deep-equals tree, for generated trees", () => {
    fc.assert(
      fc.property(treeArb, (generated) => {
        const tree = JSON.parse(JSON.stringify(generated)) as Tree; // plain objects, as from a DB or request
        expect(TreeSchema.safeParse(tree).success).toBe(true);
        const text = serializeTree(tree);
        const back = parseTree(text);
        if (!back.ok) throw new Error(back.errors.map(formatParseError).join("\n") + "\n---\n" + text);
        expect(back.tree).toStrictEqual(tree);
      }),
      { numRuns: Number(process.env.ROUNDTRIP_RUNS ?? 400) },
    );
  }, 300_000);
  it("property: the canonical form is a fixed point (serialize ∘ parse is idempotent)", () => {
    fc.assert(
      fc.property(treeArb, (tree) => {
        const once = serializeTree(tree);
        expect(serializeTree(parsed(once))).toBe(once);
      }),
      { numRuns: 100 },
    );
  });
  it.each(files)("trees/%s is already in canonical form and the schema accepts it", (file) => {
    const src = readFileSync(new URL(file, TREES), "utf8");
    const tree = parsed(src);
    expect(TreeSchema.safeParse(tree).success).toBe(true);
    expect(serializeTree(tree)).toBe(src);
  });
});

const HEAD = "# Demo\n- category: rotisserie\n- symptom: Uneven heat\n- start: a\n\n";

describe("what the format reads", () => {
  it("a full node: kind, id and title in the heading, fields, branches and a verbatim body", () => {
    const t = parsed(
      HEAD +
        "## Measurement `a`: Run capacitor\n- unit: µF\n- limits: `rated_uf` ± 6 %\n- meter: ±(1 % + 2 counts) at 0.01 µF\n- acceptance: guarded\n- low → b\n- within → b (re-check up to 2 times, then b)\n\nMeasure it *cold*.\n\n```\n## not a heading\n```\n\n## Outcome `b`: Done\n- remedy: Replace it\n- part: Capacitor 1.5 µF\n- part: Wire nut\n",
    );
    expect(t.nodes[0]).toStrictEqual({
      id: "a",
      kind: "measurement",
      title: "Run capacitor",
      quantity: "capacitance",
      unit: "µF",
      limits: { kind: "nominal", nominal: { formula: "rated_uf" }, tolerance: { kind: "percent", plus: 6, minus: 6 } },
      meter: { percent: 1, counts: 2, resolution: 0.01, unit: "µF" },
      acceptance: "guarded",
      branches: { low: { to: "b" }, within: { to: "b", recheck: { max: 2, onExceed: "b" } } },
      body: "Measure it *cold*.\n\n```\n## not a heading\n```",
    });
    expect(t.nodes[1]).toStrictEqual({
      id: "b",
      kind: "outcome",
      title: "Done",
      remedy: "Replace it",
      parts: ["Capacitor 1.5 µF", "Wire nut"],
    });
  });
  it("questions list answers as ‘- label → id’, labels may hold arrows and punctuation", () => {
    const t = parsed(
      HEAD + "## Question `a`: Fans?\n- one slow → b\n- yes → maybe → b\n- no: really (sure) → b\n\n## Outcome `b`: Done\n- remedy: x\n",
    );
    expect(t.nodes[0]).toMatchObject({
      answers: [
        { label: "one slow", to: "b" },
        { label: "yes → maybe", to: "b" },
        { label: "no: really (sure)", to: "b" },
      ],
    });
  });
  it.each([
    ["191 V to 218 V", { kind: "range", min: { value: 191, unit: "V" }, max: { value: 218, unit: "V" } }],
    ["at least 135 °F", { kind: "atLeast", min: { value: 135, unit: "°F" } }],
    ["at most 5", { kind: "atMost", max: { value: 5 } }],
    ["100 Ω +5 % / -10 %", { kind: "nominal", nominal: { value: 100, unit: "Ω" }, tolerance: { kind: "percent", plus: 5, minus: 10 } }],
    ["100 Ω +5 % / −10 %", { kind: "nominal", nominal: { value: 100, unit: "Ω" }, tolerance: { kind: "percent", plus: 5, minus: 10 } }],
    [
      "350 °F ± 15 °F",
      { kind: "nominal", nominal: { value: 350, unit: "°F" }, tolerance: { kind: "absolute", plus: 15, minus: 15, unit: "°F" } },
    ],
    ["1.5 µF ±6%", { kind: "nominal", nominal: { value: 1.5, unit: "µF" }, tolerance: { kind: "percent", plus: 6, minus: 6 } }],
    ["1.5 µF +- 6 %", { kind: "nominal", nominal: { value: 1.5, unit: "µF" }, tolerance: { kind: "percent", plus: 6, minus: 6 } }],
    ["4.7 kΩ letter J", { kind: "nominal", nominal: { value: 4.7, unit: "kΩ" }, tolerance: { kind: "letter", letter: "J" } }],
    [
      "`volts^2 / watts` Ω ± 10 %",
      { kind: "nominal", nominal: { formula: "volts^2 / watts", unit: "Ω" }, tolerance: { kind: "percent", plus: 10, minus: 10 } },
    ],
    ["at least `rated_manifold + 1`", { kind: "atLeast", min: { formula: "rated_manifold + 1" } }],
  ])("limits: %s", (text, limits) => {
    const t = parsed(HEAD + `## Measurement \`a\`: M\n- quantity: resistance\n- unit: Ω\n- limits: ${text}\n`);
    expect((t.nodes[0] as { limits: unknown }).limits).toStrictEqual(limits);
  });
  it("the quantity can be left out when the unit says it", () => {
    const t = parsed(
      HEAD +
        "## Nameplate `a`: Rated\n- variable: rated_uf\n- unit: MFD\n- quantity: capacitance\n\n## Nameplate `b`: Watts\n- variable: w\n- unit: W\n",
    );
    expect(t.nodes.map((n) => (n as { quantity?: string }).quantity)).toEqual(["capacitance", "power"]);
  });
  it("CRLF files parse like LF files", () => {
    const src = HEAD + "## Step `a`: Do it\n- next → b\n\nBody.\n\n## Outcome `b`: Done\n- remedy: x\n";
    expect(parsed(src.replace(/\n/g, "\r\n"))).toStrictEqual(parsed(src));
  });
  it("the start defaults to the first node", () => {
    expect(parsed("# T\n- category: oven\n- symptom: s\n\n## Outcome `z`: Done\n- remedy: x\n").start).toBe("z");
  });
});

describe("parse errors say line:column and what was expected", () => {
  it("a branch without its arrow", () => {
    const src = HEAD + "## Measurement `a`: Run capacitor\n- unit: µF\n- limits: 1.5 µF ± 6 %\n- within next-node\n";
    expect(errorsOf(src)).toContain("line 9:3: expected a branch like ‘- within → next-node’, got ‘- within next-node’");
  });
  it("an answer without its arrow", () => {
    expect(errorsOf(HEAD + "## Question `a`: Fans?\n- one slow shaft-check\n")).toEqual([
      "line 7:3: expected an answer like ‘- yes → next-step’, got ‘- one slow shaft-check’",
    ]);
  });
  it("limits that don't read", () => {
    const [e] = errorsOf(HEAD + "## Measurement `a`: M\n- unit: V\n- limits: 191 V from 218 V\n");
    expect(e).toBe("line 8:17: expected ‘to’, ‘±’, ‘+… / -…’ or ‘letter’ after the value, got ‘from’");
  });
  it("a tolerance letter the standard doesn't have", () => {
    const [e] = errorsOf(HEAD + "## Measurement `a`: M\n- unit: Ω\n- limits: 4.7 kΩ letter Q\n");
    expect(e).toMatch(/^line 8:25: expected a tolerance letter \(B, C, D, F, G, J, K, M, Z\), got ‘Q’$/);
  });
  it("an unknown kind of step, and a heading without the id in backticks", () => {
    expect(errorsOf(HEAD + "## Check `a`: x\n\n## Step a: y\n")).toEqual([
      "line 6:4: ‘Check’ isn't a kind of step: use Question, Measurement, Step, Caution, Nameplate, Outcome or Escalate",
      "line 8:8: expected the step's id in backticks after ‘Step’, like ‘## Measurement `supply-voltage`: Supply voltage across L1–L2’",
    ]);
  });
  it("an unknown field, a field given twice, a bad quantity", () => {
    const errs = errorsOf(HEAD + "## Measurement `a`: M\n- unit: V\n- unit: mV\n- colour: red\n- quantity: volts\n- limits: at most 5\n");
    expect(errs).toEqual([
      "line 8:3: ‘unit’ is given twice (first on line 7)",
      "line 9:3: ‘colour’ isn't a field of a measurement: use quantity, unit, limits, meter, acceptance or variable",
      "line 10:13: expected a quantity (voltage, current, resistance, capacitance, temperature, pressure, power, frequency, time or rotation), got ‘volts’",
    ]);
  });
  it("fields separated from the heading by a blank line are pointed out", () => {
    expect(errorsOf(HEAD + "## Step `a`: Do it\n\n- next → b\n")).toEqual([
      "line 8:1: fields and branches go right under the heading, with no blank line between: this line is read as the body",
    ]);
  });
  it("a setext heading made by --- under body text", () => {
    const [e] = errorsOf(HEAD + "## Step `a`: Do it\n- next → a\n\nSome text\n---\n");
    expect(e).toMatch(/^line 9:1: expected a heading that starts with ‘##’/);
  });
  it("a missing title line", () => {
    expect(errorsOf("Some words\n\n## Step `a`: x\n")[0]).toMatch(/^line 1:1: expected the tree's title first/);
  });
  it("missing required fields", () => {
    expect(errorsOf(HEAD + "## Outcome `a`: Done\n")).toEqual([
      "line 6:1: Outcome `a` needs ‘- remedy: …’ (what the technician does about it)",
    ]);
  });
  it("schema problems map back to their line: an id with capitals", () => {
    const errs = errorsOf(HEAD + "## Step `Check_Fans`: x\n- next → a\n");
    expect(errs[0]).toBe("line 6:1: the id ‘Check_Fans’ isn't valid: ids are lower-case words joined by hyphens, like check-fan-rotation");
  });
});
