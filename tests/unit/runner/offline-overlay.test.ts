// The runner's view while entries wait on the phone: the server's run with the queued steps,
// notes and photos replayed over it by the engine, in order; refused ones left out; accepted
// answers folded in; and what waits, said in words.
// 1.5 µF ± 6 % → 1.41–1.59 µF: fan-motor run capacitor, REFERENCES.md (trade practice / common practice).
import { describe, expect, it } from "vitest";
import type { LogEntry } from "../../../app/engine/traversal";
import type { RunView } from "../../../app/lib/run-log";
import type { OutboxItem } from "../../../app/components/runner/offline/db";
import { describeItems, withAcceptedStep } from "../../../app/components/runner/offline/fold";
import { overlay, stepFor, withMeter } from "../../../app/components/runner/offline/overlay";
import { smallTree } from "../../support/trees";

const tree = smallTree();
const me = { id: "u1", name: "Tess Field" };

function serverRun(): RunView {
  return {
    run: {
      id: "r1",
      status: "active",
      practice: false,
      stepCount: 0,
      currentNode: "cap-look",
      endKind: null,
      rootCause: null,
      actionTaken: null,
      minutesOnJob: null,
      abandonReason: null,
      startedAt: "2026-12-03T08:00:00.000Z",
      pausedAt: null,
      completedAt: null,
      technician: me,
      startedBy: me,
    },
    call: null,
    unit: null,
    version: { id: "v1", treeId: "t1", number: 1, title: tree.title },
    tree,
    bodies: {},
    description: [],
    steps: [],
    notes: [],
    photos: [],
    parts: [],
    meters: [
      {
        id: "m1",
        name: "Van meter — capacitance",
        quantity: "capacitance",
        unit: "µF",
        rangeMax: 100,
        resolution: 0.01,
        percent: 1.9,
        counts: 2,
      },
    ],
    escalation: null,
    report: null,
    practice: null,
    viewer: { id: me.id, holds: true, canTakeOver: false },
    timeZone: "UTC",
  };
}

let n = 0;
function step(entry: LogEntry, state: OutboxItem["state"] = "queued", meterId: string | null = null): OutboxItem {
  n++;
  return { n, runId: "r1", key: `k${n}`, at: `2026-12-03T08:0${n}:00.000Z`, state, kind: "step", entry, meterId };
}
const photo = (state: OutboxItem["state"] = "queued"): OutboxItem => ({
  n: ++n,
  runId: "r1",
  key: `p${n}`,
  at: "2026-12-03T08:09:00.000Z",
  state,
  kind: "photo",
  node: "cap-measure",
  photo: new Blob([new Uint8Array(68)]),
  fileName: "cap.png",
});
const url = () => "blob:phone-copy";

describe("the view with entries still on the phone", () => {
  it("replays queued steps in order with the engine's verdicts, and shows queued photos from the phone's copy", () => {
    const items = [
      step({ type: "answer", node: "cap-look", answer: "no" }),
      step(withMeter(tree, serverRun().meters, { type: "reading", node: "cap-measure", reading: "1.47 µF" }, "m1"), "queued", "m1"),
      photo(),
    ];
    const v = overlay(serverRun(), items, url);
    expect(v.steps.map((s) => [s.seq, s.type, s.pending, s.recordedAt])).toEqual([
      [0, "answer", true, "2026-12-03T08:01:00.000Z"],
      [1, "reading", true, "2026-12-03T08:02:00.000Z"],
    ]);
    // 1.47 µF is inside 1.41–1.59 µF.
    expect(v.steps[1]).toMatchObject({ verdict: "within", limitsText: "1.41–1.59 µF", meterId: "m1", to: "motor-failed" });
    expect(v.photos).toEqual([expect.objectContaining({ key: items[2]!.key, url: "blob:phone-copy", pending: true, bytes: 68 })]);
  });

  it("an undo on the phone takes back the step before it; refused and held entries are not shown", () => {
    const items = [
      step({ type: "answer", node: "cap-look", answer: "no" }),
      step({ type: "undo" }),
      step({ type: "answer", node: "cap-look", answer: "yes" }, "refused"),
    ];
    const v = overlay(serverRun(), items, url);
    expect(v.steps.map((s) => [s.type, s.undone, s.undoesSeq])).toEqual([
      ["answer", true, null],
      ["undo", false, 0],
    ]);
  });

  it("leaves out a queued step the engine no longer takes after the server's steps (the run moved on elsewhere)", () => {
    const server = serverRun();
    const moved = stepFor(
      tree,
      [],
      { type: "answer", node: "cap-look", answer: "yes" },
      { key: "s0", meterId: null, at: "x", enteredBy: "u2", practice: false },
    );
    if (!moved.ok) throw new Error(moved.message);
    const v = overlay(
      { ...server, steps: [{ ...moved.step, pending: false }] },
      [step({ type: "answer", node: "cap-look", answer: "no" })],
      url,
    );
    expect(v.steps).toHaveLength(1);
  });

  it("folds the server's accepted step into the stored run (replacing the phone's by key, marking what an undo took back)", () => {
    const first = stepFor(
      tree,
      [],
      { type: "answer", node: "cap-look", answer: "no" },
      { key: "a", meterId: null, at: "t", enteredBy: "u1", practice: false },
    );
    if (!first.ok) throw new Error(first.message);
    const stored = withAcceptedStep(serverRun(), {
      step: { ...first.step, pending: false },
      replayed: false,
      run: { status: "active", currentNode: "cap-measure", endKind: null, stepCount: 1 },
    });
    expect(stored.steps).toHaveLength(1);
    expect(stored.run.stepCount).toBe(1);
    const replayed = withAcceptedStep(stored, {
      step: { ...first.step, pending: false },
      replayed: true,
      run: { status: "active", currentNode: "cap-measure", endKind: null, stepCount: 1 },
    });
    expect(replayed.steps).toHaveLength(1);
    const undo = stepFor(tree, stored.steps, { type: "undo" }, { key: "b", meterId: null, at: "t", enteredBy: "u1", practice: false });
    if (!undo.ok) throw new Error(undo.message);
    const after = withAcceptedStep(stored, {
      step: undo.step,
      replayed: false,
      run: { status: "active", currentNode: "cap-look", endKind: null, stepCount: 2 },
    });
    expect(after.steps.map((s) => s.undone)).toEqual([true, false]);
  });

  it("a practice run on the phone follows the trainee's call, not the verdict (app/engine/training/practice.ts)", () => {
    const practice = { ...serverRun(), run: { ...serverRun().run, practice: true } };
    // 1.47 µF is inside 1.41–1.59 µF, but the trainee calls it low: the run follows "low" to the capacitor.
    const reading = { type: "reading", node: "cap-measure", reading: "1.47 µF", call: "low" } as LogEntry;
    const v = overlay(practice, [step({ type: "answer", node: "cap-look", answer: "no" }), step(reading)], url);
    expect(v.steps.map((s) => [s.type, s.verdict, s.call, s.to])).toEqual([
      ["answer", null, null, "cap-measure"],
      ["reading", "within", "low", "cap-failed"],
    ]);
    // The same reading without a call is refused on a practice run, and the overlay leaves it out.
    expect(
      overlay(
        practice,
        [step({ type: "answer", node: "cap-look", answer: "no" }), step({ type: "reading", node: "cap-measure", reading: "1.47 µF" })],
        url,
      ).steps,
    ).toHaveLength(1);
  });

  it("says what waits in words", () => {
    const s = (k: OutboxItem["kind"]) => ({ kind: k }) as OutboxItem;
    expect(describeItems([s("step"), s("step"), s("step"), s("photo")])).toBe("3 steps and 1 photo");
    expect(describeItems([s("start"), s("step"), s("note")])).toBe("the run's start, 1 step and 1 note");
    expect(describeItems([s("photo")])).toBe("1 photo");
  });
});
