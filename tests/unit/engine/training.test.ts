// Training: practice runs that follow the trainee's own call, the scenario check, and the review of
// a practice run against the reference path. Values for the two-fan rotisserie (trees/):
// a fan-motor run capacitor rated about 1.5 µF, replaced outside ±6 % of its rating (REFERENCES.md:
// "fan-motor run capacitor", "motor-run capacitors" field rule — trade practice, common practice),
// so the limits are 1.41–1.59 µF; about 208 V across L1–L2 on a 208 V unit (common practice).
import fc from "fast-check";
import { readdirSync, readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parseTree } from "../../../app/engine/markdown/parse";
import { computeLimits } from "../../../app/engine/limits";
import { replay, Run, type LogEntry } from "../../../app/engine/traversal";
import type { MeasurementNode, Tree, TreeNode, VerdictKind } from "../../../app/engine/types";
import {
  callsAt,
  checkScript,
  median,
  nodesToward,
  practiceReplay,
  practiceTryEntry,
  reviewPractice,
  walkScript,
  type PracticeEntry,
  type Script,
  type World,
} from "../../../app/engine/training";
import { ROTISSERIE_TO_CAPACITOR } from "../../support/trees";

function load(file: string): Tree {
  const r = parseTree(readFileSync(new URL(`../../../trees/${file}`, import.meta.url), "utf8"));
  if (!r.ok) throw new Error(file);
  return r.tree;
}
const rotisserie = load("rotisserie-uneven-heat.md");
const STARTERS = readdirSync(new URL("../../../trees/", import.meta.url))
  .filter((f) => f.endsWith(".md"))
  .map((f) => ({ file: f, tree: load(f) }));

/** The weak-capacitor scenario: the meter shows 1.31 µF on a 1.5 µF capacitor (below 1.41 µF). */
const WEAK_CAP: Script = {
  fault: "cap-failed",
  world: {
    "supply-voltage": { kind: "measurement", shows: "208 V" },
    fans: { kind: "question", observation: "The left fan turns slower than the right and its note is lower.", answer: "one slow" },
    "cap-rating": { kind: "nameplate", label: "1.5 µF" },
    "cap-measure": { kind: "measurement", shows: "1.31 µF" },
    "shaft-free": {
      kind: "question",
      observation: "The fan wheel turns smoothly by hand and coasts for a moment.",
      answer: "spins freely and coasts",
    },
  },
};

/** A 208 V supply check (utilisation range 191–218 V, REFERENCES.md, from memory) that re-measures a low reading once. */
const LOOP: Tree = {
  title: "Loop",
  category: "other",
  symptom: "x",
  start: "m",
  nodes: [
    {
      id: "m",
      kind: "measurement",
      title: "Volts",
      quantity: "voltage",
      unit: "V",
      variable: "volts",
      limits: { kind: "range", min: { value: 191 }, max: { value: 218 } },
      branches: { low: { to: "m", recheck: { max: 1 } }, within: { to: "ok" } },
    },
    { id: "ok", kind: "outcome", title: "Fine", remedy: "None", parts: [] },
  ],
};

/** Practice entries: the real-run walk to the capacitor, readings called as the engine judges them. */
const TO_CAP: PracticeEntry[] = ROTISSERIE_TO_CAPACITOR.map((e) =>
  e.type === "reading" ? { ...e, call: "within" } : (e as PracticeEntry),
);

describe("practice runs follow the trainee's call", () => {
  it("a call that agrees with the engine walks the same path as a real run", () => {
    const log: PracticeEntry[] = [...TO_CAP, { type: "reading", node: "cap-measure", reading: "1.31 µF", call: "low" }];
    const p = practiceReplay(rotisserie, log);
    const real = replay(rotisserie, [...ROTISSERIE_TO_CAPACITOR, { type: "reading", node: "cap-measure", reading: "1.31 µF" }]);
    expect(p.path).toEqual(real.path);
    expect(p.finished).toEqual({ kind: "outcome", node: "cap-failed" });
    expect(p.steps.map((s) => [s.index, s.node, s.branch, s.to])).toEqual(real.steps.map((s) => [s.index, s.node, s.branch, s.to]));
    expect(p.variables).toEqual(real.variables);
  });

  it("1.31 µF called ‘within’ goes to the shaft check; the engine's verdict stays low", () => {
    const p = practiceReplay(rotisserie, [...TO_CAP, { type: "reading", node: "cap-measure", reading: "1.31 µF", call: "within" }]);
    const cap = p.steps.at(-1)!;
    expect(cap.branch).toBe("within");
    expect(cap.to).toBe("shaft-free");
    expect(cap.verdict?.verdict).toBe("low");
    expect(cap.verdict?.limits.text).toBe("1.41–1.59 µF");
    expect(p.current).toBe("shaft-free");
    expect(p.path.at(-1)).toBe("shaft-free");
  });

  it("a reading without a call, or with a call the step has no branch for, is refused and changes nothing", () => {
    const before = practiceReplay(rotisserie, TO_CAP);
    const noCall = practiceTryEntry(rotisserie, TO_CAP, { type: "reading", node: "cap-measure", reading: "1.31 µF" } as PracticeEntry);
    expect(noCall.ok).toBe(false);
    if (!noCall.ok) expect(noCall.rejection.message).toMatch(/^Make your own call on this reading \(‘low’, ‘within’, ‘high’, ‘marginal’\)/);
    expect(noCall.state).toEqual(before);
    // A step with no marginal branch takes no marginal call.
    const bad = practiceTryEntry(LOOP, [], { type: "reading", node: "m", reading: "212 V", call: "marginal" });
    expect(bad.ok).toBe(false);
    if (!bad.ok)
      expect(bad.rejection.message).toBe("‘marginal’ isn't a branch of Measurement ‘Volts’; make your call from ‘low’, ‘within’.");
    expect(bad.state.current).toBe("m");
    expect(bad.state.steps).toEqual([]);
    expect(bad.state.undone).toEqual([]);
    expect(bad.state.variables).toEqual({});
    expect(callsAt(LOOP.nodes[0] as MeasurementNode)).toEqual(["low", "within"]);
  });

  it("an undo takes the reading and its call back together", () => {
    const log: PracticeEntry[] = [
      ...TO_CAP,
      { type: "reading", node: "cap-measure", reading: "1.31 µF", call: "within" },
      { type: "undo" },
    ];
    const s = practiceReplay(rotisserie, log);
    expect(s.current).toBe("cap-measure");
    expect(s.undone).toEqual([TO_CAP.length]);
    const again = practiceReplay(rotisserie, [...log, { type: "reading", node: "cap-measure", reading: "1.31 µF", call: "low" }]);
    expect(again.finished).toEqual({ kind: "outcome", node: "cap-failed" });
    expect(again.steps.at(-1)!.index).toBe(TO_CAP.length + 2);
  });

  it("a ‘marginal’ call goes round the re-check loop, which is bounded as on a real run", () => {
    const m: PracticeEntry = { type: "reading", node: "cap-measure", reading: "1.5 µF", call: "marginal" };
    const c: PracticeEntry = { type: "continue", node: "cap-remeasure" };
    const s = practiceReplay(rotisserie, [...TO_CAP, m, c, m, c, m, c]);
    // Re-check up to 2 times, then cap-borderline (the tree's own bound).
    expect(s.finished).toEqual({ kind: "outcome", node: "cap-borderline" });
    expect(s.steps.filter((x) => x.node === "cap-measure").every((x) => x.verdict?.verdict === "within" && x.branch === "marginal")).toBe(
      true,
    );
  });

  it("a re-check bound on a measurement's own branch ends as the measurement's", () => {
    const r: PracticeEntry = { type: "reading", node: "m", reading: "180 V", call: "low" };
    const s = practiceReplay(LOOP, [r, r]);
    expect(s.finished).toMatchObject({ kind: "recheck-limit", node: "m", branch: "low", max: 1 });
    expect(s.finished && "reason" in s.finished ? s.finished.reason : "").toBe(
      "Re-checked 1 time at Measurement ‘Volts’ without settling it: hand the call to a lead.",
    );
  });
});

describe("the scenario check", () => {
  it("the weak-capacitor script reaches its hidden fault: a walk through the capacitor reading, judged low", () => {
    const c = checkScript(rotisserie, WEAK_CAP);
    expect(c.findings).toEqual([]);
    expect(c.ok).toBe(true);
    expect(c.reference.end).toEqual({ kind: "outcome", node: "cap-failed" });
    expect(c.reference.path).toEqual([
      "lockout",
      "discharge-caps",
      "live-test",
      "supply-voltage",
      "fans",
      "cap-lockout",
      "cap-rating",
      "cap-measure",
      "cap-failed",
    ]);
    const cap = c.reference.steps.at(-1)!;
    expect(cap.verdict?.message).toBe("1.31 µF — low: below 1.41 µF (1.5 µF ± 6 %; meter ±0.033 µF)");
  });

  it("a script whose reading leads elsewhere is refused at that step, saying where it goes instead", () => {
    const c = checkScript(rotisserie, {
      ...WEAK_CAP,
      world: { ...WEAK_CAP.world, "cap-measure": { kind: "measurement", shows: "1.47 µF" } },
    });
    expect(c.ok).toBe(false);
    expect(c.findings).toEqual([
      {
        severity: "error",
        code: "script-leads-elsewhere",
        nodeId: "cap-measure",
        field: "shows",
        message:
          "At Measurement ‘Run capacitor against its rating’ the scripted reading 1.47 µF is within 1.41–1.59 µF, which leads to Question ‘With power locked out, does the slow fan's shaft spin freely by hand?’; the hidden fault is reached by ‘low’, ‘high’ or ‘marginal’. The script ends at Outcome ‘Failed fan motor — weak winding’ instead of Outcome ‘Failed run capacitor’.",
      },
    ]);
  });

  it("a script that stops on the way names the step that has nothing scripted", () => {
    const { "cap-rating": _, ...world } = WEAK_CAP.world;
    const c = checkScript(rotisserie, { ...WEAK_CAP, world });
    expect(c.findings.map((f) => [f.code, f.nodeId])).toEqual([["script-missing", "cap-rating"]]);
    expect(c.findings[0]!.message).toBe(
      "Nothing is scripted for Nameplate input ‘Rated capacitance of the slow fan's run capacitor’, which is on the way to the hidden fault: say what the label says.",
    );
  });

  it("an answer that turns away from the fault before an unscripted step is named as the turn", () => {
    const c = checkScript(rotisserie, {
      ...WEAK_CAP,
      world: { ...WEAK_CAP.world, fans: { kind: "question", observation: "Both wheels spin up together.", answer: "both at full speed" } },
    });
    expect(c.findings.map((f) => [f.code, f.nodeId])).toEqual([["script-leads-elsewhere", "fans"]]);
    expect(c.findings[0]!.message).toMatch(
      /^At Question ‘With the elements heating, do both convection fans run at full speed\?’ the scripted answer ‘both at full speed’, which leads to Question ‘Do both fans turn in the direction marked on the housing\?’; the hidden fault is reached by ‘one slow’ or ‘one stopped’\.$/,
    );
  });

  it("each scripted value must read in its step's quantity, name a real answer, and not give the answer away", () => {
    const c = checkScript(rotisserie, {
      fault: "cap-failed",
      world: {
        ...WEAK_CAP.world,
        "supply-voltage": { kind: "measurement", shows: "208 µF" },
        fans: { kind: "question", observation: "One slow", answer: "one slow" },
        "shaft-free": { kind: "question", observation: "Turns", answer: "spins" },
        "no-such": { kind: "nameplate", label: "1 V" },
        lockout: { kind: "nameplate", label: "1 V" },
      },
    });
    const codes = c.findings.map((f) => [f.code, f.nodeId]);
    expect(codes).toContainEqual(["script-value", "supply-voltage"]);
    expect(codes).toContainEqual(["script-gives-answer", "fans"]);
    expect(codes).toContainEqual(["script-answer", "shaft-free"]);
    expect(codes).toContainEqual(["script-unknown-step", "no-such"]);
    expect(codes).toContainEqual(["script-kind", "lockout"]);
    expect(c.findings.find((f) => f.nodeId === "supply-voltage")!.message).toMatch(
      /^What the meter shows at Measurement ‘Supply voltage across L1–L2’ doesn't read: /,
    );
    expect(c.ok).toBe(false);
  });

  it("the hidden fault must be an outcome of the version", () => {
    expect(checkScript(rotisserie, { ...WEAK_CAP, fault: "fans" }).findings[0]).toMatchObject({ code: "script-fault" });
    expect(checkScript(rotisserie, { ...WEAK_CAP, fault: "gone" }).findings[0]).toMatchObject({
      code: "script-fault",
      message: "Choose the hidden fault: one of this version's outcomes.",
    });
  });

  it("nodesToward: every node with a way to the capacitor outcome, and none without", () => {
    const toward = nodesToward(rotisserie, "cap-failed");
    for (const id of ["lockout", "supply-voltage", "fans", "cap-lockout", "cap-rating", "cap-measure", "cap-remeasure", "cap-failed"])
      expect(toward.has(id), id).toBe(true);
    for (const id of ["shaft-free", "motor-winding", "self-test", "fan-direction", "low-supply"]) expect(toward.has(id), id).toBe(false);
  });
});

const T0 = Date.UTC(2026, 11, 3, 9, 0, 0);
/** A log with the phone's clock: one entry every `gap` seconds after the start. */
const timed = (log: PracticeEntry[], gap = 20) => ({ log, at: log.map((_, i) => T0 + (i + 1) * gap * 1000), startedAt: T0 });

describe("the review of a practice run", () => {
  it("a trainee who judges 1.31 µF as within: first wrong turn at the capacitor, the misjudged reading, steps not needed, the wrong cause", () => {
    const log: PracticeEntry[] = [
      ...TO_CAP,
      { type: "reading", node: "cap-measure", reading: "1.31 µF", call: "within" },
      { type: "answer", node: "shaft-free", answer: "spins freely and coasts" },
    ];
    const r = reviewPractice(rotisserie, WEAK_CAP, timed(log));
    expect(r.firstWrongTurn).toMatchObject({
      node: "cap-measure",
      index: 7,
      referenceIndex: 7,
      trainee: "within",
      reference: "low",
      traineeTo: "shaft-free",
      referenceTo: "cap-failed",
    });
    expect(r.rows.map((x) => [x.kind, x.node])).toEqual([
      ["same", "lockout"],
      ["same", "discharge-caps"],
      ["same", "live-test"],
      ["same", "supply-voltage"],
      ["same", "fans"],
      ["same", "cap-lockout"],
      ["same", "cap-rating"],
      ["turn", "cap-measure"],
      ["trainee-only", "shaft-free"],
    ]);
    expect(r.misjudged).toHaveLength(1);
    expect(r.misjudged[0]).toMatchObject({ index: 7, node: "cap-measure", call: "within", undone: false });
    expect(r.misjudged[0]!.verdict.verdict).toBe("low");
    expect(r.misjudged[0]!.verdict.limits.text).toBe("1.41–1.59 µF");
    expect(r.misjudged[0]!.verdict.uncertainty?.meterText).toBe("±(1 % + 2 counts) at 0.01 µF");
    expect(r.rows[7]!.trainee).toMatchObject({ misjudged: true, spentMs: 20_000 });
    expect(r.rows[7]!.trainee!.mistyped).toBeUndefined();
    expect(r.end).toEqual({ kind: "outcome", node: "motor-winding" });
    expect(r.referenceEnd).toEqual({ kind: "outcome", node: "cap-failed" });
    expect(r.rightFault).toBe(false);
    expect(r.totalMs).toBe(9 * 20_000);
    expect(r.timeToCauseMs).toBe(9 * 20_000);
    expect(r.undos).toEqual([]);
  });

  it("a misjudgement taken back by undo: no wrong turn on the standing path, but the misjudged reading and the undo are listed", () => {
    const wrong: PracticeEntry = { type: "reading", node: "cap-measure", reading: "1.31 µF", call: "within" };
    const log: PracticeEntry[] = [...TO_CAP, wrong, { type: "undo" }, { ...wrong, call: "low" }];
    const r = reviewPractice(rotisserie, WEAK_CAP, timed(log, 30));
    expect(r.firstWrongTurn).toBeNull();
    expect(r.rows.every((x) => x.kind === "same")).toBe(true);
    expect(r.misjudged.map((m) => [m.index, m.call, m.verdict.verdict, m.undone])).toEqual([[7, "within", "low", true]]);
    expect(r.undos).toEqual([{ index: 8, undid: 7, node: "cap-measure", spentMs: 30_000 }]);
    expect(r.undone.map((s) => s.index)).toEqual([7]);
    expect(r.rightFault).toBe(true);
    expect(r.timeToCauseMs).toBe(10 * 30_000);
  });

  it("an observation read differently and a value typed differently are flagged; times need the phone's clock", () => {
    const log: PracticeEntry[] = [
      ...TO_CAP.slice(0, 4),
      { type: "answer", node: "fans", answer: "one stopped" },
      ...TO_CAP.slice(5, 7),
      { type: "reading", node: "cap-measure", reading: "1.13 µF", call: "low" },
    ];
    const r = reviewPractice(rotisserie, WEAK_CAP, { log, at: log.map((_, i) => (i === 3 ? null : T0 + (i + 1) * 10_000)), startedAt: T0 });
    // Same target either way: a different branch at the fans question is still the first wrong turn.
    expect(r.firstWrongTurn).toMatchObject({
      node: "fans",
      trainee: "answer:one stopped",
      reference: "answer:one slow",
      traineeTo: "cap-lockout",
      referenceTo: "cap-lockout",
    });
    expect(r.misread).toEqual([{ index: 4, node: "fans", answer: "one stopped", scripted: "one slow", undone: false }]);
    expect(r.rows.find((x) => x.node === "cap-measure")!.trainee).toMatchObject({ mistyped: true });
    expect(r.rows[3]!.trainee!.spentMs).toBeNull();
    expect(r.rows[4]!.trainee!.spentMs).toBe(20_000);
    expect(r.rightFault).toBe(true);
  });

  it("an unfinished run has no cause and no wrong turn; the rest of the reference is listed as not reached", () => {
    const r = reviewPractice(rotisserie, WEAK_CAP, timed(TO_CAP.slice(0, 3)));
    expect(r.firstWrongTurn).toBeNull();
    expect(r.end).toBeNull();
    expect(r.timeToCauseMs).toBeNull();
    expect(r.rows.filter((x) => x.kind === "reference-only").map((x) => x.node)).toEqual([
      "supply-voltage",
      "fans",
      "cap-lockout",
      "cap-rating",
      "cap-measure",
    ]);
  });

  it("median", () => {
    expect(median([])).toBeNull();
    expect(median([3, 1, 2])).toBe(2);
    expect(median([4, 1, 3, 2])).toBe(2.5);
  });
});

// --- properties on every starter tree ----------------------------------------------------------------

type Choice = { pick: number; value: number };
const choicesArb = fc.array(fc.record({ pick: fc.nat(50), value: fc.nat(1000) }), { minLength: 60, maxLength: 60 });

/** A reading for a measurement picked from below, inside and above its limits (as the choice says). */
function readingFor(node: MeasurementNode, vars: Readonly<Record<string, number>>, c: Choice): string | null {
  const lim = computeLimits(node, vars);
  if (!lim.ok) return null;
  const { lo, hi } = lim.limits;
  const a = lo ?? (hi !== undefined ? hi - Math.abs(hi) - 10 : 0);
  const b = hi ?? a + Math.abs(a) + 10;
  const span = Math.max(b - a, 1e-6);
  const x = [a - span * 0.5 - 1, a + span * (0.2 + 0.6 * (c.value / 1000)), b + span * 0.5 + 1][c.pick % 3]!;
  return `${x} ${node.unit}`;
}

/** A random world: walk from the start with the choices, scripting each step as it is met. */
function randomScript(tree: Tree, choices: Choice[]): Script | null {
  const run = new Run(tree);
  const world: World = {};
  for (const c of choices) {
    const node = run.currentNode;
    if (!node) break;
    let entry: LogEntry;
    const have = world[node.id];
    if (node.kind === "question") {
      const label = have?.kind === "question" ? have.answer : node.answers[c.pick % node.answers.length]!.label;
      world[node.id] = { kind: "question", observation: `Seen at ${node.id}`, answer: label };
      entry = { type: "answer", node: node.id, answer: label };
    } else if (node.kind === "measurement") {
      const shows = have?.kind === "measurement" ? have.shows : readingFor(node, run.variableValues, c);
      if (!shows) return null;
      world[node.id] = { kind: "measurement", shows };
      entry = node.meter
        ? { type: "reading", node: node.id, reading: shows, meter: node.meter }
        : { type: "reading", node: node.id, reading: shows };
    } else if (node.kind === "nameplate") {
      const label = have?.kind === "nameplate" ? have.label : `${[1.5, 12, 208, 350, 2800][c.pick % 5]} ${node.unit}`;
      world[node.id] = { kind: "nameplate", label };
      entry = { type: "nameplate", node: node.id, value: label };
    } else entry = node.kind === "caution" ? { type: "acknowledge", node: node.id } : { type: "continue", node: node.id };
    if (!run.apply(entry).ok) return null;
  }
  const end = run.snapshot().finished;
  return end?.kind === "outcome" ? { fault: end.node, world } : null;
}

/** The practice entry a trainee writes for a reference step, reading the world right. */
function asPractice(e: LogEntry, branch: string): PracticeEntry {
  return e.type === "reading" ? { ...e, call: branch as VerdictKind } : (e as PracticeEntry);
}

/** Another branch at this step, if the node has one: a different answer, or a different call. */
function deviation(node: TreeNode, e: LogEntry, branch: string, pick: number): PracticeEntry | null {
  if (node.kind === "question") {
    const others = node.answers.filter((a) => `answer:${a.label}` !== branch);
    return others.length ? { type: "answer", node: node.id, answer: others[pick % others.length]!.label } : null;
  }
  if (node.kind === "measurement" && e.type === "reading") {
    const others = callsAt(node).filter((c) => c !== branch);
    return others.length ? { ...e, call: others[pick % others.length]! } : null;
  }
  return null;
}

/** Carry on from wherever the run stands with any choices, for a bounded number of entries. */
function carryOn(tree: Tree, log: PracticeEntry[], choices: Choice[]): PracticeEntry[] {
  const out = [...log];
  for (const c of choices) {
    const s = practiceReplay(tree, out);
    const node = tree.nodes.find((n) => n.id === s.current);
    if (!node) break;
    let e: PracticeEntry;
    if (node.kind === "question") e = { type: "answer", node: node.id, answer: node.answers[c.pick % node.answers.length]!.label };
    else if (node.kind === "measurement") {
      const calls = callsAt(node);
      const reading = readingFor(node, Object.fromEntries(Object.entries(s.variables).map(([k, v]) => [k, v.value])), c);
      if (!reading || !calls.length) break;
      e = { type: "reading", node: node.id, reading, call: calls[c.pick % calls.length]! };
    } else if (node.kind === "nameplate") e = { type: "nameplate", node: node.id, value: `${[1.5, 12, 208][c.pick % 3]} ${node.unit}` };
    else e = node.kind === "caution" ? { type: "acknowledge", node: node.id } : { type: "continue", node: node.id };
    if (!practiceTryEntry(tree, out, e).ok) break;
    out.push(e);
  }
  return out;
}

describe("properties of the review, on every starter tree", () => {
  it("the scenario check accepts every world made by walking to an outcome, and its reference walk ends there", () => {
    for (const { file, tree } of STARTERS) {
      fc.assert(
        fc.property(choicesArb, (choices) => {
          const script = randomScript(tree, choices);
          fc.pre(script !== null);
          const c = checkScript(tree, script!);
          expect(c.findings, file).toEqual([]);
          expect(c.reference.end).toEqual({ kind: "outcome", node: script!.fault });
        }),
        { numRuns: 60 },
      );
    }
  });

  it("a trainee who follows the reference has no wrong turn, no misjudged reading, and reaches the hidden fault", () => {
    for (const { file, tree } of STARTERS) {
      fc.assert(
        fc.property(choicesArb, (choices) => {
          const script = randomScript(tree, choices);
          fc.pre(script !== null);
          const ref = walkScript(tree, script!.world);
          const log = ref.entries.map((e, i) => asPractice(e, ref.steps[i]!.branch));
          const r = reviewPractice(tree, script!, timed(log));
          expect(r.firstWrongTurn, file).toBeNull();
          expect(r.misjudged).toEqual([]);
          expect(r.misread).toEqual([]);
          expect(r.rows.every((x) => x.kind === "same")).toBe(true);
          expect(r.rows).toHaveLength(ref.steps.length);
          expect(r.rightFault).toBe(true);
        }),
        { numRuns: 60 },
      );
    }
  });

  it("a single deviation inserted at any step is found at that step", () => {
    for (const { file, tree } of STARTERS) {
      fc.assert(
        fc.property(choicesArb, fc.nat(100), fc.nat(10), choicesArb, (choices, at, pick, after) => {
          const script = randomScript(tree, choices);
          fc.pre(script !== null);
          const ref = walkScript(tree, script!.world);
          const byId = new Map(tree.nodes.map((n) => [n.id, n]));
          const can = ref.steps
            .map((s, i) => (deviation(byId.get(s.node)!, ref.entries[i]!, s.branch, pick) ? i : -1))
            .filter((i) => i >= 0);
          fc.pre(can.length > 0);
          const k = can[at % can.length]!;
          const prefix = ref.entries.slice(0, k).map((e, i) => asPractice(e, ref.steps[i]!.branch));
          const turn = deviation(byId.get(ref.steps[k]!.node)!, ref.entries[k]!, ref.steps[k]!.branch, pick)!;
          const log = carryOn(tree, [...prefix, turn], after);
          const r = reviewPractice(tree, script!, timed(log));
          expect(r.firstWrongTurn, file).not.toBeNull();
          expect(r.firstWrongTurn!.index).toBe(k);
          expect(r.firstWrongTurn!.referenceIndex).toBe(k);
          expect(r.firstWrongTurn!.node).toBe(ref.steps[k]!.node);
          expect(r.rows.slice(0, k).every((x) => x.kind === "same")).toBe(true);
          // A different call on a reading is a misjudged reading at the same step.
          if (turn.type === "reading") expect(r.misjudged[0]?.index).toBe(k);
        }),
        { numRuns: 60 },
      );
    }
  });
});
