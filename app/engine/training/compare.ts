// The review of a practice run: the trainee's path set beside the reference path (the walk the
// scripted world leads to), aligned step by step. The two walks share a start and, step for step,
// the same branch leads to the same node, so they agree up to the first step where the trainee's
// branch differs from the reference's — the first wrong turn. After it, steps are aligned by node
// (a longest common subsequence), so a trainee who comes back onto the reference path lines up
// again; what is left are steps the reference did not need and steps the trainee never reached.
// Beside that: every reading the trainee misjudged (their call against the engine's verdict),
// every observation read differently from the script, every undo, and time per step from the
// phone's clock.
import type { RunEnd, RunStep } from "../traversal";
import type { NodeKind, Tree, VerdictKind } from "../types";
import { parseReading } from "../units";
import type { Verdict } from "../verdict";
import { PracticeRun, type PracticeEntry } from "./practice";
import { walkScript, type Script } from "./script";

export interface TraineeRun {
  log: readonly PracticeEntry[];
  /** The phone's clock for each log entry (ms since the epoch); null where it is not known. */
  at: readonly (number | null)[];
  /** When the run started (ms since the epoch). */
  startedAt: number;
}

/** One step of either walk, as the review shows it. */
export interface ReviewStep {
  /** Index of the log entry (the trainee's log, or the reference walk's). */
  index: number;
  node: string;
  kind: NodeKind;
  /** The branch taken: "next", "low"…, or "answer:<label>"; for a practice reading the trainee's call. */
  branch: string;
  to: string | null;
  answer?: string;
  /** The trainee's own call on a reading. */
  call?: VerdictKind;
  /** The engine's verdict on a reading (limits, meter and message inside). */
  verdict?: Verdict;
  /** A nameplate value as recorded, "1.5 µF". */
  recorded?: string;
  /** Time on this step: from the entry before (or the run's start) to this one, by the phone's clock. */
  spentMs: number | null;
}

export interface StepFlags {
  /** A reading whose call differs from the engine's verdict. */
  misjudged?: true;
  /** An answer that differs from what the observation means. */
  misread?: true;
  /** A value typed differently from what the meter or label showed. */
  mistyped?: true;
}

export type RowKind = "same" | "turn" | "trainee-only" | "reference-only";

export interface ReviewRow {
  /** same: both walks took this step the same way; turn: both stood here and went different ways;
   * trainee-only: a step the reference did not need; reference-only: one the trainee never reached. */
  kind: RowKind;
  node: string;
  trainee?: ReviewStep & StepFlags;
  reference?: ReviewStep;
}

export interface MisjudgedReading {
  index: number;
  node: string;
  call: VerdictKind;
  verdict: Verdict;
  /** Taken back later by an undo (the misjudgement still happened). */
  undone: boolean;
}

export interface UndoEntry {
  index: number;
  /** The log index of the step it took back. */
  undid: number;
  node: string;
  spentMs: number | null;
}

export interface PracticeReview {
  rows: ReviewRow[];
  /** The first step where the trainee's branch differs from the reference's. */
  firstWrongTurn: {
    row: number;
    node: string;
    index: number;
    referenceIndex: number;
    trainee: string;
    reference: string;
    traineeTo: string | null;
    referenceTo: string | null;
  } | null;
  misjudged: MisjudgedReading[];
  misread: { index: number; node: string; answer: string; scripted: string; undone: boolean }[];
  undos: UndoEntry[];
  /** Entries taken back by an undo, as they were (for the timeline). */
  undone: (ReviewStep & StepFlags)[];
  /** From the run's start to the last entry. */
  totalMs: number | null;
  /** From the run's start to the step that reached the cause; null unless it ended at an outcome. */
  timeToCauseMs: number | null;
  end: RunEnd | null;
  referenceEnd: RunEnd | null;
  fault: string;
  rightFault: boolean;
}

function reviewStep(s: RunStep, spentMs: number | null): ReviewStep {
  const out: ReviewStep = { index: s.index, node: s.node, kind: s.kind, branch: s.branch, to: s.to, spentMs };
  if (s.answer !== undefined) out.answer = s.answer;
  if (s.verdict) out.verdict = s.verdict;
  if (s.nameplate) out.recorded = `${s.nameplate.display} ${s.nameplate.unit}`;
  const e = s.entry as PracticeEntry;
  if (e.type === "reading") out.call = e.call;
  return out;
}

/** Time on each entry by the phone's clock: from the entry before (the run's start for the first). */
function spentTimes(run: TraineeRun): (number | null)[] {
  let prev: number | null = run.startedAt;
  return run.log.map((_, i) => {
    const t = run.at[i] ?? null;
    const spent = t !== null && prev !== null && t >= prev ? t - prev : null;
    if (t !== null) prev = t;
    return spent;
  });
}

function sameValue(typedSi: number, scripted: string, quantity: Parameters<typeof parseReading>[1], unit: string): boolean {
  const p = parseReading(scripted, quantity, unit);
  if (!p.ok) return true;
  return Math.abs(typedSi - p.si) <= 1e-9 * Math.max(Math.abs(typedSi), Math.abs(p.si));
}

/** Longest common subsequence of two node sequences, as pairs of indices. */
function lcs(a: readonly string[], b: readonly string[]): [number, number][] {
  const n = a.length;
  const m = b.length;
  const t: number[][] = Array.from({ length: n + 1 }, () => new Array<number>(m + 1).fill(0));
  for (let i = n - 1; i >= 0; i--)
    for (let j = m - 1; j >= 0; j--) t[i]![j] = a[i] === b[j] ? t[i + 1]![j + 1]! + 1 : Math.max(t[i + 1]![j]!, t[i]![j + 1]!);
  const pairs: [number, number][] = [];
  let i = 0;
  let j = 0;
  while (i < n && j < m) {
    if (a[i] === b[j]) pairs.push([i++, j++]);
    else if (t[i + 1]![j]! >= t[i]![j + 1]!) i++;
    else j++;
  }
  return pairs;
}

/** Review a practice run against its scenario's script on the same tree version. */
export function reviewPractice(tree: Tree, script: Script, trainee: TraineeRun): PracticeReview {
  const byId = new Map(tree.nodes.map((n) => [n.id, n]));
  const reference = walkScript(tree, script.world);
  const spent = spentTimes(trainee);

  // Replay the trainee's log, keeping every step as it was applied (undone ones too).
  const run = new PracticeRun(tree);
  const applied = new Map<number, RunStep>();
  trainee.log.forEach((e) => {
    const r = run.apply(e);
    if (r.ok && r.step) applied.set(r.step.index, r.step);
  });
  const state = run.snapshot();

  const flagged = (s: RunStep): ReviewStep & StepFlags => {
    const step: ReviewStep & StepFlags = reviewStep(s, spent[s.index] ?? null);
    const node = byId.get(s.node);
    const world = script.world[s.node];
    if (step.call && step.verdict && step.call !== step.verdict.verdict) step.misjudged = true;
    if (world?.kind === "question" && step.answer !== undefined && step.answer !== world.answer) step.misread = true;
    if (
      world?.kind === "measurement" &&
      node?.kind === "measurement" &&
      step.verdict &&
      !sameValue(step.verdict.reading.si, world.shows, node.quantity, node.unit)
    )
      step.mistyped = true;
    if (
      world?.kind === "nameplate" &&
      node?.kind === "nameplate" &&
      s.nameplate &&
      !sameValue(s.nameplate.si, world.label, node.quantity, node.unit)
    )
      step.mistyped = true;
    return step;
  };

  const ref = reference.steps.map((s) => reviewStep(s, null));
  const mine = state.steps.map(flagged);
  const rows: ReviewRow[] = [];
  let firstWrongTurn: PracticeReview["firstWrongTurn"] = null;
  const pair = (r: ReviewStep, t: ReviewStep & StepFlags) => {
    const kind: RowKind = r.branch === t.branch ? "same" : "turn";
    if (kind === "turn" && !firstWrongTurn)
      firstWrongTurn = {
        row: rows.length,
        node: t.node,
        index: t.index,
        referenceIndex: r.index,
        trainee: t.branch,
        reference: r.branch,
        traineeTo: t.to,
        referenceTo: r.to,
      };
    rows.push({ kind, node: t.node, trainee: t, reference: r });
  };

  // The shared start: the same node and the same branch, step for step.
  let k = 0;
  while (k < ref.length && k < mine.length && ref[k]!.node === mine[k]!.node && ref[k]!.branch === mine[k]!.branch)
    pair(ref[k]!, mine[k++]!);
  if (k < ref.length && k < mine.length && ref[k]!.node === mine[k]!.node) pair(ref[k]!, mine[k++]!);
  // After the first wrong turn: aligned by node, unmatched steps on their own rows (the trainee's first).
  const restRef = ref.slice(k);
  const restMine = mine.slice(k);
  let i = 0;
  let j = 0;
  for (const [a, b] of [
    ...lcs(
      restRef.map((s) => s.node),
      restMine.map((s) => s.node),
    ),
    [restRef.length, restMine.length] as [number, number],
  ]) {
    for (; j < b; j++) rows.push({ kind: "trainee-only", node: restMine[j]!.node, trainee: restMine[j]! });
    for (; i < a; i++) rows.push({ kind: "reference-only", node: restRef[i]!.node, reference: restRef[i]! });
    if (a < restRef.length && b < restMine.length) pair(restRef[i++]!, restMine[j++]!);
  }

  const undoneSet = new Set(state.undone);
  const misjudged: MisjudgedReading[] = [];
  const misread: PracticeReview["misread"] = [];
  const undone: (ReviewStep & StepFlags)[] = [];
  for (const [index, s] of [...applied].sort((x, y) => x[0] - y[0])) {
    const f = flagged(s);
    const gone = undoneSet.has(index);
    if (gone) undone.push(f);
    if (f.misjudged) misjudged.push({ index, node: s.node, call: f.call!, verdict: f.verdict!, undone: gone });
    if (f.misread)
      misread.push({ index, node: s.node, answer: f.answer!, scripted: (script.world[s.node] as { answer: string }).answer, undone: gone });
  }

  // Undo entries, each with the step it took back (replayed in order: a stack of standing steps).
  const undos: UndoEntry[] = [];
  const stack: number[] = [];
  trainee.log.forEach((e, index) => {
    if (e.type === "undo") {
      const undid = stack.pop();
      if (undid !== undefined) undos.push({ index, undid, node: applied.get(undid)!.node, spentMs: spent[index] ?? null });
    } else if (applied.has(index)) stack.push(index);
  });

  const lastAt = [...trainee.at].reverse().find((t) => t !== null) ?? null;
  const end = state.finished;
  let timeToCauseMs: number | null = null;
  if (end?.kind === "outcome") {
    const last = state.steps[state.steps.length - 1];
    const t = last ? (trainee.at[last.index] ?? null) : null;
    if (t !== null && t >= trainee.startedAt) timeToCauseMs = t - trainee.startedAt;
  }
  return {
    rows,
    firstWrongTurn,
    misjudged,
    misread,
    undos,
    undone,
    totalMs: lastAt !== null && lastAt >= trainee.startedAt ? lastAt - trainee.startedAt : null,
    timeToCauseMs,
    end,
    referenceEnd: reference.end,
    fault: script.fault,
    rightFault: end?.kind === "outcome" && end.node === script.fault,
  };
}

/** The middle value (the mean of the two middle ones for an even count); null for none. */
export function median(xs: readonly number[]): number | null {
  if (!xs.length) return null;
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}
