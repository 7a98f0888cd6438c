// Pure pieces of the runner and the run log: position in a tree, typed readings, the payload
// identity behind idempotency keys, and the safe Markdown subset.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parseTree } from "../../../app/engine/markdown/parse";
import { replay } from "../../../app/engine/traversal";
import { stepsToGo } from "../../../app/components/runner/progress";
import { composeReading } from "../../../app/components/runner/Reading";
import { markdownBlocks } from "../../../app/lib/md.server";
import { placeName } from "../../../app/lib/display";
import { canonicalPayload, entryOf, logOf } from "../../../app/lib/run-log";
import { storedStep } from "../../support/steps";

const parsed = parseTree(readFileSync("trees/rotisserie-uneven-heat.md", "utf8"));
if (!parsed.ok) throw new Error("the starter tree does not parse");
const tree = parsed.tree;

describe("steps to an answer", () => {
  it("counts the fewest and most steps from a node to an outcome or hand-over, leaving re-check loops out", () => {
    // From the capacitor reading: low/high → outcome (1 step), within → shaft question → outcome (2).
    expect(stepsToGo(tree, "cap-measure")).toEqual({ min: 1, max: 2 });
    // From the shaft question both answers are outcomes.
    expect(stepsToGo(tree, "shaft-free")).toEqual({ min: 1, max: 1 });
    // An outcome is the answer itself.
    expect(stepsToGo(tree, "motor-seized")).toEqual({ min: 0, max: 0 });
    const fromStart = stepsToGo(tree, tree.start)!;
    expect(fromStart.min).toBe(4); // three cautions, then a supply reading out of range ends it
    expect(fromStart.max).toBeGreaterThan(fromStart.min);
    expect(stepsToGo(tree, "no-such-node")).toBeNull();
  });
});

describe("typed readings", () => {
  it("a bare number takes the chosen unit; a typed unit wins; a decimal comma is read as a point", () => {
    expect(composeReading("1470", "nF")).toBe("1470 nF");
    expect(composeReading(" 1.47 ", "µF")).toBe("1.47 µF");
    expect(composeReading("1470 nF", "µF")).toBe("1470 nF");
    expect(composeReading("1,47", "µF")).toBe("1.47 µF");
    expect(composeReading("", "V")).toBe("");
    expect(composeReading("2e2", "V")).toBe("2e2 V");
  });
});

describe("the run log", () => {
  const row = storedStep;

  it("stored steps replay, in seq order, to the state the engine reached when they were taken", () => {
    const meter = { percent: 1.9, counts: 2, resolution: 0.01, unit: "µF" };
    const rows = [
      row({ seq: 1, node: "discharge-caps" }),
      row({ seq: 0, node: "lockout" }),
      row({ seq: 2, node: "live-test" }),
      row({ seq: 3, type: "reading", node: "supply-voltage", typed: "208 V" }),
      row({ seq: 4, type: "answer", node: "fans", answer: "one slow" }),
      row({ seq: 5, node: "cap-lockout" }),
      row({ seq: 6, type: "nameplate", node: "cap-rating", typed: "1.5 µF" }),
      row({ seq: 7, type: "reading", node: "cap-measure", typed: "1.47 µF", meter }),
      row({ seq: 8, type: "undo", node: null }),
      row({ seq: 9, type: "reading", node: "cap-measure", typed: "1470 nF", meter }),
    ];
    const log = logOf(rows);
    expect(log[0]).toEqual({ type: "acknowledge", node: "lockout" });
    expect(log[7]).toEqual({ type: "reading", node: "cap-measure", reading: "1.47 µF", meter });
    const state = replay(tree, log);
    expect(state.rejected).toEqual([]);
    expect(state.current).toBe("shaft-free");
    expect(state.undone).toEqual([7]);
    expect(state.steps.at(-1)?.verdict?.verdict).toBe("within");
  });

  it("a payload's identity ignores key order, surrounding spaces and the meter snapshot, but not the meter chosen", () => {
    const a = canonicalPayload({ type: "reading", node: "cap-measure", reading: "1.47 µF" }, "m1");
    const b = canonicalPayload(
      { reading: " 1.47 µF ", node: "cap-measure", type: "reading", meter: { percent: 1, counts: 1, resolution: 1 } } as never,
      "m1",
    );
    expect(b).toBe(a);
    expect(canonicalPayload({ type: "reading", node: "cap-measure", reading: "1.47 µF" }, "m2")).not.toBe(a);
    expect(canonicalPayload({ type: "reading", node: "cap-measure", reading: "1.48 µF" }, "m1")).not.toBe(a);
    expect(entryOf(row({ type: "undo", node: null }))).toEqual({ type: "undo" });
  });
});

describe("step bodies as safe Markdown blocks", () => {
  it("keeps paragraphs, emphasis, lists, code and same-site or https images; drops other link and image schemes", () => {
    const blocks = markdownBlocks(
      "Measure **across L1–L2**.\n\n- first\n- second\n\n![terminal block](/trees/t/images/i)\n\n[bad](javascript:alert(1)) ![x](data:image/png;base64,AAAA) <script>alert(1)</script>",
    );
    expect(blocks[0]).toEqual({
      t: "p",
      c: [
        { t: "text", v: "Measure " },
        { t: "strong", c: [{ t: "text", v: "across L1–L2" }] },
        { t: "text", v: "." },
      ],
    });
    expect(blocks[1]).toMatchObject({ t: "list", ordered: false, items: [[{ t: "p" }], [{ t: "p" }]] });
    expect(blocks[2]).toEqual({ t: "p", c: [{ t: "img", src: "/trees/t/images/i", alt: "terminal block" }] });
    const last = JSON.stringify(blocks[3]);
    expect(last).not.toContain("javascript:");
    expect(last).not.toContain("data:image");
    expect(last).not.toMatch(/"t":"(link|img)"/);
    expect(markdownBlocks(undefined)).toEqual([]);
  });
});

describe("small rules", () => {
  it("a site named after its customer is not named twice", () => {
    expect(placeName("Larkspur Market", "Larkspur Market — Deli counter")).toBe("Larkspur Market — Deli counter");
    expect(placeName("Hollin Street School District", "Central Kitchen")).toBe("Hollin Street School District — Central Kitchen");
  });
});
