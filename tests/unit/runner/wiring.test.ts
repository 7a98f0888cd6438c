// The engine's answers wired into the runner and the run log (issue 10 items 6, 8 and 11 on the
// app's side): confirmations travel with a reading and make a different payload, a shop meter's
// range reaches the engine, suggestions fill the field, a rating is shown as understood, "found
// here before" lines, and node pickers that tell same-title nodes apart.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parseTree } from "../../../app/engine/markdown/parse";
import { replay, tryEntry, type LogEntry } from "../../../app/engine/traversal";
import { practiceReplay, practiceTryEntry, type PracticeEntry } from "../../../app/engine/training/practice";
import type { MeasurementNode } from "../../../app/engine/types";
import { parseRating } from "../../../app/engine/units";
import { evaluateReading } from "../../../app/engine/verdict";
import { fillFrom, ratingEcho, unitsFor } from "../../../app/components/runner/Reading";
import { foundHereLine } from "../../../app/components/runner/FoundHere";
import { nodeOptionLabels } from "../../../app/components/editor/BranchFields";
import { distinctLabels } from "../../../app/lib/node-labels";
import type { FoundHere } from "../../../app/lib/insights/found-here";
import { canonicalPayload, entryOf, logOf, meterAccuracy, type MeterView } from "../../../app/lib/run-log";
import { storedStep } from "../../support/steps";

const parsed = parseTree(readFileSync("trees/rotisserie-uneven-heat.md", "utf8"));
if (!parsed.ok) throw new Error("the starter tree does not parse");
const tree = parsed.tree;
const supply = tree.nodes.find((n) => n.id === "supply-voltage") as MeasurementNode;
const toSupply: LogEntry[] = [
  { type: "acknowledge", node: "lockout" },
  { type: "acknowledge", node: "discharge-caps" },
  { type: "acknowledge", node: "live-test" },
];

// The demo shop's van multimeter on its AC volts range (db/demo.ts), as a stored meter row.
const van: MeterView = {
  id: "m",
  name: "AC volts, 600 V range",
  quantity: "voltage",
  unit: "V",
  rangeMax: 600,
  resolution: 0.1,
  percent: 1,
  counts: 3,
};

describe("confirming an implausible reading", () => {
  // 208 typed with mV chosen on a 191–218 V step is 0.208 V: SI prefix milli = 10⁻³ (BIPM SI
  // Brochure, 9th ed., table 7); 208 V is the nominal supply (ANSI C84.1, from memory).
  const slip: LogEntry = { type: "reading", node: "supply-voltage", reading: "208 mV" };

  it("is refused until confirmed, then stands, and the flag survives the stored row and the replay", () => {
    const asked = tryEntry(tree, toSupply, slip);
    expect(asked.ok).toBe(false);
    if (asked.ok) return;
    expect(asked.rejection.code).toBe("needs-confirmation");
    expect(asked.rejection.confirm?.suggestion).toBe("208 V");
    expect(asked.rejection.message).toMatch(/did you mean 208 V\?/);

    const ok = tryEntry(tree, toSupply, { ...slip, confirmed: true } as LogEntry);
    expect(ok.ok && ok.step?.confirmed).toBe(true);
    expect(ok.ok && ok.step?.verdict?.verdict).toBe("low");

    // Stored as a row and read back, the entry keeps its confirmation; the log replays without asking.
    const row = {
      type: "reading",
      node: "supply-voltage",
      answer: null,
      typed: "208 mV",
      meter: null,
      call: null,
      confirmed: true,
    } as const;
    expect(entryOf(row)).toEqual({ ...slip, confirmed: true });
    expect(entryOf({ ...row, confirmed: false })).toEqual(slip);
    const state = replay(tree, [...toSupply, entryOf(row)]);
    expect(state.rejected).toEqual([]);
    expect(state.steps.at(-1)?.confirmed).toBe(true);
  });

  it("in practice too: asked about until confirmed, with the trainee's call, and a practice log replays with it", () => {
    const withCall = { ...slip, call: "low" } as PracticeEntry;
    const asked = practiceTryEntry(tree, toSupply as PracticeEntry[], withCall);
    expect(!asked.ok && asked.rejection.code).toBe("needs-confirmation");
    expect(!asked.ok && asked.rejection.confirm?.suggestion).toBe("208 V");
    const confirmed = { ...withCall, confirmed: true } as PracticeEntry;
    const ok = practiceTryEntry(tree, toSupply as PracticeEntry[], confirmed);
    expect(ok.ok && ok.step?.confirmed).toBe(true);
    const state = practiceReplay(tree, [...(toSupply as PracticeEntry[]), confirmed]);
    expect(state.rejected).toEqual([]);
    expect(state.current).toBeNull();
  });

  it("a confirmed reading is another payload under one idempotency key; confirmed:false is the same as none", () => {
    const plain = canonicalPayload(slip, null);
    expect(canonicalPayload({ ...slip, confirmed: true } as LogEntry, null)).not.toBe(plain);
    expect(canonicalPayload({ ...slip, confirmed: false } as LogEntry, null)).toBe(plain);
  });

  it("a log of stored steps carries the confirmation to the engine in order", () => {
    const steps = [
      storedStep({ seq: 1, type: "reading", node: "supply-voltage", typed: "208 mV", confirmed: true }),
      storedStep({ seq: 0, type: "acknowledge", node: "lockout" }),
    ];
    expect(logOf(steps)).toEqual([
      { type: "acknowledge", node: "lockout" },
      { ...slip, confirmed: true },
    ]);
  });
});

describe("the shop meter's range reaches the engine", () => {
  it("meterAccuracy passes rangeMax as the engine's range", () => {
    expect(meterAccuracy(van)).toEqual({ percent: 1, counts: 3, resolution: 0.1, unit: "V", range: 600 });
  });

  it("a reading above the range is refused; OL is high on a step whose upper limit is inside the range", () => {
    // A meter can't display above its selected range; it shows overload instead (meter makers'
    // manuals; common practice).
    const over = evaluateReading(supply, "700 V", { meter: meterAccuracy(van) });
    expect(over.ok).toBe(false);
    expect(!over.ok && over.code).toBe("over-range");
    expect(!over.ok && over.message).toMatch(/above the top of this meter's 600 V range/);
    // Without the shop meter's range the same 700 V is judged (high): the range is what refuses it.
    const judged = evaluateReading(supply, "700 V", { meter: { percent: 1, counts: 3, resolution: 0.1, unit: "V" } });
    expect(judged.ok && judged.verdict.verdict).toBe("high");

    const ol = evaluateReading(supply, "OL", { meter: meterAccuracy(van) });
    expect(ol.ok && ol.verdict.verdict).toBe("high");
    expect(ol.ok && ol.verdict.message).toMatch(/above its 600 V range/);
    // A 200 V range sits below the step's 218 V upper limit: OL there says nothing either way.
    const small = evaluateReading(supply, "OL", { meter: meterAccuracy({ ...van, rangeMax: 200 }) });
    expect(small.ok).toBe(false);
    expect(!small.ok && small.message).toMatch(/switch to a higher range/);
  });
});

describe("what the runner puts back in the field and shows under it", () => {
  it("a suggestion fills the number and picks its unit button when the step offers that unit", () => {
    const units = unitsFor("voltage", "V");
    expect(fillFrom("208 V", units)).toEqual({ text: "208", unit: "V" });
    expect(fillFrom("1.47 µF", unitsFor("capacitance", "µF"))).toEqual({ text: "1.47", unit: "µF" });
    expect(fillFrom("350 °F", unitsFor("temperature", "°F"))).toEqual({ text: "350", unit: "°F" });
    // A unit the buttons don't offer stays typed in the field (the typed unit wins over the button).
    expect(fillFrom("2 furlongs", units)).toEqual({ text: "2 furlongs", unit: null });
  });

  it("a nameplate value is shown as understood, converted to the step's unit (SI prefixes: 1 µF = 1000 nF)", () => {
    const p = parseRating("1500 nF", "capacitance", "µF");
    expect(p.ok && ratingEcho(p, "µF")).toBe("1500 nF = 1.50 µF");
    const q = parseRating("1,5 µF", "capacitance", "µF");
    expect(q.ok && ratingEcho(q, "µF")).toBe("1.5 µF");
    // A rating of zero can't be right, so nothing is shown as understood and the field says why.
    const z = parseRating("0 µF", "capacitance", "µF");
    expect(z.ok).toBe(false);
  });
});

describe("found here before, as the runner words it", () => {
  const found: FoundHere = {
    threshold: 10,
    treeRuns: 31,
    shown: true,
    steps: [
      {
        node: "fans",
        runs: 31,
        branches: [
          { branch: "answer:one slow", label: "one slow", runs: 20 },
          { branch: "answer:both stopped", label: "both stopped", runs: 11 },
        ],
      },
    ],
    causes: { make: "Larkspur", model: "RT-8", runs: 12, shown: true, outcomes: [{ node: "cap-failed", runs: 7 }] },
  };
  it("a step with earlier runs, and a root cause found before on this make and model, get a line; the rest none", () => {
    expect(foundHereLine(found, { id: "fans", kind: "question" })).toBe("31 earlier runs at this step: 20 one slow · 11 both stopped");
    expect(foundHereLine(found, { id: "cap-failed", kind: "outcome" })).toBe(
      "Found in 7 of 12 completed runs of this tree on Larkspur RT-8",
    );
    expect(foundHereLine(found, { id: "motor-seized", kind: "outcome" })).toBeNull();
    expect(foundHereLine(found, { id: "cap-measure", kind: "measurement" })).toBeNull();
    expect(
      foundHereLine(
        { ...found, shown: false, steps: [], causes: { ...found.causes!, shown: false, outcomes: [] } },
        { id: "fans", kind: "question" },
      ),
    ).toBeNull();
    expect(foundHereLine(undefined, { id: "fans", kind: "question" })).toBeNull();
  });
});

describe("node pickers tell same-title nodes apart (issue 10 item 11)", () => {
  it("two nodes whose choice would read the same get their ids; the others read as before", () => {
    const labels = nodeOptionLabels([
      { id: "fan-left", kind: "question", title: "Does the fan turn?", answers: [] },
      { id: "fan-right", kind: "question", title: "Does the fan turn? ", answers: [] },
      {
        id: "fan-amps",
        kind: "measurement",
        title: "Does the fan turn?",
        quantity: "current",
        unit: "A",
        limits: { kind: "atMost", max: { value: 1 } },
        branches: {},
      },
      { id: "done", kind: "outcome", title: "Fan motor worn", remedy: "Replace it.", parts: [] },
    ]);
    const all = [...labels.values()];
    expect(new Set(all).size).toBe(all.length);
    expect(labels.get("fan-left")).toBe("Question: Does the fan turn? · fan-left");
    expect(labels.get("fan-right")).toBe("Question: Does the fan turn? · fan-right");
    // Another kind with the same title already reads differently.
    expect(labels.get("fan-amps")).not.toContain("· fan-amps");
    expect(labels.get("done")).not.toContain("·");
    expect(distinctLabels([{ id: "a" }, { id: "b" }], () => "Same")).toEqual(
      new Map([
        ["a", "Same · a"],
        ["b", "Same · b"],
      ]),
    );
  });
});
