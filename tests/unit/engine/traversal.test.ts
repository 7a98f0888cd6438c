import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { replay, startRun, tryEntry, type LogEntry } from "../../../app/engine/traversal";
import type { Tree, TreeNode } from "../../../app/engine/types";
import { rotisserie, TO_AMBIENT, TO_CAPACITOR } from "./rotisserie";

describe("tree (1): two-fan rotisserie, 208 V unit", () => {
  it("walks cautions → L1–L2 supply → fans → rated µF → capacitor → root cause", () => {
    const s = replay(rotisserie, [
      ...TO_CAPACITOR,
      { type: "reading", node: "cap-measure", reading: "1.47 µF" },
      { type: "answer", node: "shaft-free", answer: "stiff, gritty or seized" },
    ]);
    expect(s.rejected).toEqual([]);
    expect(s.path).toEqual([
      "lockout",
      "discharge-caps",
      "live-test",
      "supply-voltage",
      "fans",
      "cap-lockout",
      "cap-rating",
      "cap-measure",
      "shaft-free",
      "motor-seized",
    ]);
    expect(s.finished).toEqual({ kind: "outcome", node: "motor-seized" });
    expect(s.current).toBeNull();
    const supply = s.steps.find((x) => x.node === "supply-voltage")!;
    expect(supply.verdict?.verdict).toBe("within"); // about 208 V across L1–L2 (common practice)
    const cap = s.steps.find((x) => x.node === "cap-measure")!;
    expect(cap.verdict?.message).toBe("1.47 µF — within 1.41–1.59 µF (1.5 µF ± 6 %; meter ±0.035 µF; acceptance limits 1.445–1.555 µF)");
    expect(s.variables.rated_uf).toMatchObject({ value: 1.5, unit: "µF", node: "cap-rating" });
    expect(s.variables.rated_uf!.si).toBeCloseTo(1.5e-6, 15);
  });
  it("1470 nF against the 1.5 µF rating is within too (common practice: 1.47–1.49 µF is good)", () => {
    const s = replay(rotisserie, [...TO_CAPACITOR, { type: "reading", node: "cap-measure", reading: "1470 nF" }]);
    expect(s.steps.at(-1)!.verdict!.verdict).toBe("within");
    expect(s.current).toBe("shaft-free");
  });
  it("a voltage typed at the capacitor step is rejected with a message and changes nothing", () => {
    const s = replay(rotisserie, [...TO_CAPACITOR, { type: "reading", node: "cap-measure", reading: "208 V" }]);
    expect(s.current).toBe("cap-measure");
    expect(s.rejected).toHaveLength(1);
    expect(s.rejected[0]!.code).toBe("reading");
    expect(s.rejected[0]!.message).toMatch(/Expected a capacitance, got a voltage/);
  });
  it("a marginal capacitor is re-checked at most twice, then the loop goes to its exit", () => {
    const marginal: LogEntry[] = [
      { type: "reading", node: "cap-measure", reading: "1.42 µF" },
      { type: "continue", node: "cap-remeasure" },
    ];
    const s = replay(rotisserie, [...TO_CAPACITOR, ...marginal, ...marginal, ...marginal]);
    expect(s.rejected).toEqual([]);
    const loops = s.steps.filter((x) => x.recheck).map((x) => x.recheck);
    expect(loops).toEqual([
      { count: 1, max: 2, exceeded: false },
      { count: 2, max: 2, exceeded: false },
      { count: 3, max: 2, exceeded: true },
    ]);
    expect(s.finished).toEqual({ kind: "outcome", node: "cap-borderline" });
  });
  it("undo steps back, restoring the variable a step recorded", () => {
    const s = replay(rotisserie, [...TO_CAPACITOR, { type: "undo" }]);
    expect(s.current).toBe("cap-rating");
    expect(s.variables.rated_uf).toBeUndefined();
    expect(s.undone).toEqual([6]);
    const again = replay(rotisserie, [...TO_CAPACITOR, { type: "undo" }, { type: "nameplate", node: "cap-rating", value: "1.6 µF" }]);
    expect(again.variables.rated_uf!.value).toBe(1.6);
  });
  it("undo of a re-recorded variable brings back the earlier value, for formulas too", () => {
    const toAmbient: LogEntry[] = [
      ...TO_AMBIENT,
      { type: "reading", node: "ambient", reading: "60 °C" },
      { type: "continue", node: "probe-cool" },
      { type: "reading", node: "ambient", reading: "25 °C" },
    ];
    const run = startRun(rotisserie);
    for (const e of toAmbient) expect(run.apply(e).ok).toBe(true);
    expect(run.variableValues.ambient_c).toBe(25);
    run.apply({ type: "undo" });
    expect(run.variableValues.ambient_c).toBe(60);
    expect(run.snapshot().variables.ambient_c!.value).toBe(60);
    // and the derived probe limits follow: Pt1000 at 22 °C per IEC 60751 (from memory)
    run.apply({ type: "reading", node: "ambient", reading: "22 °C" });
    const probe = run.apply({ type: "reading", node: "probe-ohms", reading: "1085.7 Ω" });
    expect(probe.ok && probe.step?.verdict?.limits.nominal).toBeCloseTo(1000 * (1 + 3.9083e-3 * 22 - 5.775e-7 * 22 * 22), 6);
    expect(probe.ok && probe.step?.verdict?.verdict).toBe("within");
  });
  it("undo after the run has ended reopens it", () => {
    const done = [...TO_CAPACITOR, { type: "reading", node: "cap-measure", reading: "1.2 µF" } as const];
    expect(replay(rotisserie, done).finished).toEqual({ kind: "outcome", node: "cap-failed" });
    const s = replay(rotisserie, [...done, { type: "undo" }]);
    expect(s.finished).toBeNull();
    expect(s.current).toBe("cap-measure");
  });
});

describe("rejections", () => {
  it.each<[LogEntry, string]>([
    [{ type: "continue", node: "lockout" }, "wrong-entry"],
    [{ type: "acknowledge", node: "fans" }, "wrong-node"],
    [{ type: "undo" }, "nothing-to-undo"],
  ])("%o is rejected as %s", (entry, code) => {
    const s = replay(rotisserie, [entry]);
    expect(s.rejected.map((r) => r.code)).toEqual([code]);
    expect(s.current).toBe("lockout");
  });
  it("an answer that isn't on the list names the answers", () => {
    const s = replay(rotisserie, [...TO_CAPACITOR.slice(0, 4), { type: "answer", node: "fans", answer: "maybe" }]);
    expect(s.rejected[0]!.message).toBe(
      "‘maybe’ isn't an answer to Question ‘With the elements heating, do both convection fans run at full speed?’; the answers are ‘both at full speed’, ‘one slow’, ‘one stopped’, ‘one slow, one stopped’, ‘both stopped’.",
    );
  });
  it("one slow, one stopped: both fans are walked — each fan's capacitor, then its motor (trade practice: common practice)", () => {
    const s = replay(rotisserie, [
      ...TO_CAPACITOR.slice(0, 4),
      { type: "answer", node: "fans", answer: "one slow, one stopped" },
      { type: "acknowledge", node: "two-fans-lockout" },
      { type: "nameplate", node: "stopped-cap-rating", value: "1.5 µF" },
      { type: "reading", node: "stopped-cap-measure", reading: "1.30 µF" }, // below 1.41 µF: failed
      { type: "nameplate", node: "sc-slow-rating", value: "1.5 µF" },
      { type: "reading", node: "sc-slow-measure", reading: "1.50 µF" }, // good capacitor…
      { type: "answer", node: "sc-slow-shaft", answer: "stiff, gritty or seized" }, // …so the slow fan's motor
    ]);
    expect(s.rejected).toEqual([]);
    expect(s.finished).toEqual({ kind: "outcome", node: "stopped-cap-slow-motor" });
    expect(s.steps.filter((x) => x.verdict).map((x) => [x.node, x.verdict!.verdict])).toEqual([
      ["supply-voltage", "within"],
      ["stopped-cap-measure", "low"],
      ["sc-slow-measure", "within"],
    ]);
  });
  it("one slow, one stopped: every way through checks both fans and ends in a root cause that names both", () => {
    const byId = new Map(rotisserie.nodes.map((n) => [n.id, n]));
    const next = (id: string): string[] => {
      const n = byId.get(id)!;
      const bs =
        n.kind === "question" ? n.answers : n.kind === "measurement" ? Object.values(n.branches) : "next" in n && n.next ? [n.next] : [];
      // A re-check loop is taken at most its bound, then leaves by its exit: follow the exit instead.
      return bs.flatMap((b) => (b!.recheck ? (b!.recheck.onExceed ? [b!.recheck.onExceed] : []) : [b!.to]));
    };
    const ends = new Set<string>();
    let paths = 0;
    const walkFrom = (id: string, path: string[]) => {
      const n = byId.get(id)!;
      if (n.kind === "outcome" || n.kind === "escalate") {
        paths++;
        ends.add(id);
        expect(path).toContain("stopped-cap-measure");
        expect(path.some((p) => p === "sc-slow-measure" || p === "sm-slow-measure")).toBe(true);
        // a motor is only condemned after its shaft was checked
        if (/motor/.test(id)) expect(path.some((p) => /shaft/.test(p))).toBe(true);
        return;
      }
      for (const to of next(id)) walkFrom(to, [...path, to]);
    };
    const fans = byId.get("fans") as Extract<TreeNode, { kind: "question" }>;
    const start = fans.answers.find((a) => a.label === "one slow, one stopped")!.to;
    walkFrom(start, [start]);
    expect(paths).toBeGreaterThan(8);
    expect([...ends].sort()).toEqual(["both-caps-failed", "both-motors-failed", "stopped-cap-slow-motor", "stopped-motor-slow-cap"]);
  });
  it("nothing applies after the end except undo", () => {
    const s = replay(rotisserie, [
      ...TO_CAPACITOR.slice(0, 4),
      { type: "answer", node: "fans", answer: "both stopped" },
      { type: "acknowledge", node: "fans-both-stopped" },
    ]);
    expect(s.finished).toMatchObject({ kind: "escalate", node: "fans-both-stopped" });
    expect(s.rejected.map((r) => r.code)).toEqual(["finished"]);
  });
  it("tryEntry checks one new entry against the stored log without keeping a failure", () => {
    const bad = tryEntry(rotisserie, TO_CAPACITOR, { type: "reading", node: "cap-measure", reading: "lots" });
    expect(bad.ok).toBe(false);
    expect(bad.state.rejected).toEqual([]);
    const good = tryEntry(rotisserie, TO_CAPACITOR, { type: "reading", node: "cap-measure", reading: "1.48" });
    expect(good.ok && good.step?.verdict?.verdict).toBe("within");
  });
});

describe("re-check loop without an exit escalates when its bound is passed", () => {
  const tree: Tree = {
    title: "Loop",
    category: "other",
    symptom: "s",
    start: "m",
    nodes: [
      {
        id: "m",
        kind: "measurement",
        title: "Volts",
        quantity: "voltage",
        unit: "V",
        limits: { kind: "range", min: { value: 1 }, max: { value: 2 } },
        branches: { low: { to: "again" }, within: { to: "ok" }, high: { to: "ok" } },
      },
      { id: "again", kind: "step", title: "Again", next: { to: "m", recheck: { max: 1 } } },
      { id: "ok", kind: "outcome", title: "Fine", remedy: "none", parts: [] },
    ],
  };
  it("ends as recheck-limit with a reason for the lead", () => {
    const low: LogEntry[] = [
      { type: "reading", node: "m", reading: "0.5 V" },
      { type: "continue", node: "again" },
    ];
    const s = replay(tree, [...low, ...low]);
    expect(s.finished).toMatchObject({ kind: "recheck-limit", node: "again", max: 1 });
    expect(s.finished && "reason" in s.finished && s.finished.reason).toMatch(/Re-checked 1 time at Step ‘Again’/);
    expect(s.path.at(-1)).toBe("again");
    const back = replay(tree, [...low, ...low, { type: "undo" }]);
    expect(back.current).toBe("again");
    expect(back.finished).toBeNull();
  });
});

// Random walks: pick a plausible entry for the node the run is at (sometimes a wrong one).
function entryFor(node: TreeNode | undefined, pick: number, reading: string): LogEntry {
  if (!node || pick % 11 === 0) return { type: "undo" };
  switch (node.kind) {
    case "question":
      return { type: "answer", node: node.id, answer: node.answers[pick % node.answers.length]?.label ?? "?" };
    case "measurement":
      return { type: "reading", node: node.id, reading };
    case "nameplate":
      return { type: "nameplate", node: node.id, value: reading };
    case "caution":
      return pick % 7 === 0 ? { type: "continue", node: node.id } : { type: "acknowledge", node: node.id };
    default:
      return { type: "continue", node: node.id };
  }
}
const readingArb = fc.constantFrom(
  "1.5 µF",
  "1.42 µF",
  "1.2",
  "208 V",
  "240 V",
  "180 V",
  "10 Ω",
  "1000 Ω",
  "22 °C",
  "60 °C",
  "1320 W",
  "120 V",
  "bogus",
  "",
);
const walkArb = fc.array(fc.tuple(fc.nat(1000), readingArb), { maxLength: 40 });
function walk(tree: Tree, choices: [number, string][]): LogEntry[] {
  const run = startRun(tree);
  const log: LogEntry[] = [];
  const byId = new Map(tree.nodes.map((n) => [n.id, n]));
  for (const [pick, reading] of choices) {
    const cur = run.snapshot().current;
    const e = entryFor(cur ? byId.get(cur) : undefined, pick, reading);
    log.push(e);
    run.apply(e);
  }
  return log;
}

describe("properties of replay", () => {
  it("replaying a log equals the state built entry by entry with tryEntry (as the server stores steps)", () => {
    const byId = new Map(rotisserie.nodes.map((n) => [n.id, n]));
    fc.assert(
      fc.property(walkArb, (choices) => {
        // Step by step, as postStep does: try each entry against the accepted log; keep it only when it applies.
        const accepted: LogEntry[] = [];
        let state = replay(rotisserie, []);
        for (const [pick, reading] of choices) {
          const e = entryFor(state.current ? byId.get(state.current) : undefined, pick, reading);
          const r = tryEntry(rotisserie, accepted, e);
          if (r.ok) {
            accepted.push(e);
            state = r.state;
          } else {
            // A refused entry changes nothing: the state it reports is the state before it.
            expect(r.state).toEqual(state);
          }
        }
        expect(replay(rotisserie, accepted)).toEqual(state);
        expect(state.rejected).toEqual([]);
      }),
      { numRuns: 300 },
    );
  });
  it("an applied entry followed by undo leaves the run where it was", () => {
    fc.assert(
      fc.property(walkArb, fc.nat(1000), readingArb, (choices, pick, reading) => {
        const log = walk(rotisserie, choices);
        const before = replay(rotisserie, log);
        const node = before.current ? rotisserie.nodes.find((n) => n.id === before.current) : undefined;
        const e = entryFor(node, pick === 0 ? 1 : pick, reading);
        if (e.type === "undo") return;
        const applied = tryEntry(rotisserie, log, e);
        if (!applied.ok) return;
        const after = replay(rotisserie, [...log, e, { type: "undo" }]);
        // The numbers formulas see are restored too, not only the recorded variables.
        const run = startRun(rotisserie);
        for (const x of [...log, e, { type: "undo" } as const]) run.apply(x);
        expect({ ...run.variableValues }).toEqual(Object.fromEntries(Object.entries(before.variables).map(([k, v]) => [k, v.value])));
        expect(after.current).toBe(before.current);
        expect(after.path).toEqual(before.path);
        expect(after.variables).toEqual(before.variables);
        expect(after.finished).toEqual(before.finished);
        expect(after.steps.map((s) => s.index)).toEqual(before.steps.map((s) => s.index));
      }),
      { numRuns: 200 },
    );
  });
  it("the path always follows the tree's branches from the start", () => {
    const edges = new Set<string>();
    for (const n of rotisserie.nodes) {
      const bs =
        n.kind === "question" ? n.answers : n.kind === "measurement" ? Object.values(n.branches) : "next" in n && n.next ? [n.next] : [];
      for (const b of bs) {
        edges.add(`${n.id}>${b!.to}`);
        if (b!.recheck?.onExceed) edges.add(`${n.id}>${b!.recheck.onExceed}`);
      }
    }
    fc.assert(
      fc.property(walkArb, (choices) => {
        const s = replay(rotisserie, walk(rotisserie, choices));
        expect(s.path[0]).toBe(rotisserie.start);
        for (let i = 1; i < s.path.length; i++) expect(edges.has(`${s.path[i - 1]}>${s.path[i]}`)).toBe(true);
        expect(s.path.length).toBe(s.steps.filter((x) => x.to !== null).length + 1);
      }),
      { numRuns: 200 },
    );
  });
});
