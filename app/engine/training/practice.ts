// Practice runs: the trainee makes their own call on each reading — low, within, high, marginal —
// and the run follows that call, so a misjudged reading leads down the wrong branch as it would
// on site. The engine still judges every reading, and its verdict is kept beside the call.
//
// This is built on the engine's own traversal, unchanged: the walk runs on a practice copy of the
// tree in which every verdict of a measurement leads to a hidden "call" question whose answers
// are the measurement's branches. A practice reading is then two engine entries (the reading,
// judged and recorded as on a real run, and the trainee's call), and an undo takes both back.
// What comes out is the shape a real run has: one step per practice entry, the verdict the
// engine's, the branch the trainee's.
import { describeNode, nodeBranches } from "../graph";
import { Run, type ApplyResult, type LogEntry, type Rejection, type RunEnd, type RunState, type RunStep } from "../traversal";
import { VERDICTS, type MeasurementNode, type QuestionNode, type Tree, type TreeNode, type VerdictKind } from "../types";

/** A reading in a practice run, with the trainee's own call on it. */
export type PracticeReading = Extract<LogEntry, { type: "reading" }> & { call: VerdictKind };
/** What a practice run's log holds: a real run's entries, with a call on every reading. */
export type PracticeEntry = Exclude<LogEntry, { type: "reading" }> | PracticeReading;

/** A character no node id can hold (ids are letters, digits and dashes), so call nodes never clash. */
const CALL = "\u0000call";
const callNodeOf = (id: string) => id + CALL;
const isCallNode = (id: string) => id.endsWith(CALL);
const measurementOf = (id: string) => id.slice(0, -CALL.length);

/** The calls a trainee can make on a measurement: the verdicts its tree has a branch for. */
export function callsAt(node: MeasurementNode): VerdictKind[] {
  return nodeBranches(node).map((b) => b.key as VerdictKind);
}

const practiceTrees = new WeakMap<Tree, Tree>();

/** The tree with a call question after each measurement (cached per tree object). */
function practiceTree(tree: Tree): Tree {
  let t = practiceTrees.get(tree);
  if (t) return t;
  const nodes: TreeNode[] = [];
  for (const n of tree.nodes) {
    if (n.kind !== "measurement") {
      nodes.push(n);
      continue;
    }
    const callId = callNodeOf(n.id);
    // Every verdict is accepted (the trainee decides where to go), so a verdict the tree has no
    // branch for is still recorded.
    const measurement: MeasurementNode = { ...n, branches: Object.fromEntries(VERDICTS.map((v) => [v, { to: callId }])) };
    const call: QuestionNode = {
      id: callId,
      kind: "question",
      title: n.title,
      answers: nodeBranches(n).map((b) => ({ ...b.branch, label: b.key })),
    };
    nodes.push(measurement, call);
  }
  t = { ...tree, nodes };
  practiceTrees.set(tree, t);
  return t;
}

type PracticeApply = ApplyResult;

/** A practice run in progress: the engine's Run on the practice tree, seen as the original tree. */
export class PracticeRun {
  private readonly run: Run;
  private readonly byId: Map<string, TreeNode>;
  private count = 0;
  /** Engine entry index → practice entry index. */
  private readonly toPractice: number[] = [];
  /** Standing practice steps, newest last: whether each is a reading with its call (two engine steps). */
  private readonly standing: boolean[] = [];
  /** Engine indices of readings taken back because their call was refused. */
  private readonly withdrawn = new Set<number>();
  private readonly rejected: Rejection[] = [];
  /** The practice entries applied, by index (a merged step carries the trainee's own entry). */
  private readonly entries: PracticeEntry[] = [];

  constructor(readonly tree: Tree) {
    this.run = new Run(practiceTree(tree));
    this.byId = new Map();
    for (const n of tree.nodes) if (!this.byId.has(n.id)) this.byId.set(n.id, n);
  }

  private engine(entry: LogEntry, index: number): ApplyResult {
    this.toPractice.push(index);
    return this.run.apply(entry);
  }

  private reject(
    index: number,
    entry: LogEntry,
    code: Rejection["code"],
    message: string,
    extra?: Pick<Rejection, "confirm" | "suggestions">,
  ): PracticeApply {
    const rejection: Rejection = { index, entry, code, message, ...extra };
    this.rejected.push(rejection);
    return { ok: false, rejection };
  }

  /** Apply the next practice entry. */
  apply(entry: PracticeEntry): PracticeApply {
    const index = this.count++;
    this.entries.push(entry);
    if (entry.type === "undo") {
      const pair = this.standing.pop();
      const r = this.engine({ type: "undo" }, index);
      if (!r.ok) return this.reject(index, entry, r.rejection.code, r.rejection.message);
      if (pair) this.engine({ type: "undo" }, index);
      return { ok: true };
    }
    if (entry.type !== "reading") {
      const r = this.engine(entry, index);
      if (!r.ok) return this.reject(index, entry, r.rejection.code, r.rejection.message);
      if (r.step) this.standing.push(false);
      return r.step ? { ok: true, step: { ...r.step, index } } : { ok: true };
    }
    const { call, ...reading } = entry;
    const judged = this.engine(reading, index);
    if (!judged.ok) {
      // What to ask about an implausible reading, or what was probably meant, goes with the refusal.
      const { confirm, suggestions } = judged.rejection;
      return this.reject(index, entry, judged.rejection.code, judged.rejection.message, {
        ...(confirm ? { confirm } : {}),
        ...(suggestions ? { suggestions } : {}),
      });
    }
    const node = this.byId.get(entry.node) as MeasurementNode;
    const calls = callsAt(node);
    const called = call ? this.engine({ type: "answer", node: callNodeOf(node.id), answer: call }, index) : null;
    if (!called?.ok) {
      // Take the reading back: nothing of a refused entry stays.
      this.withdrawn.add(judged.step!.index);
      this.engine({ type: "undo" }, index);
      const offered = calls.map((c) => `‘${c}’`).join(", ");
      if (!call) return this.reject(index, entry, "wrong-entry", `Make your own call on this reading (${offered}) before it is judged.`);
      const r = called!.ok ? null : called!.rejection;
      if (r && r.code !== "unknown-answer")
        return this.reject(index, entry, r.code, r.message.replace(`Question ‘${node.title || node.id}’`, describeNode(node)));
      return this.reject(
        index,
        entry,
        "unknown-answer",
        `‘${call}’ isn't a branch of ${describeNode(node)}; make your call from ${offered}.`,
      );
    }
    this.standing.push(true);
    return { ok: true, step: merge(judged.step!, called.step!, index, entry) };
  }

  snapshot(): RunState {
    const s = this.run.snapshot();
    const steps: RunStep[] = [];
    s.steps.forEach((step, i) => {
      const index = this.toPractice[step.index]!;
      const entry = this.entries[index]!;
      // A call step follows its reading: the two are one practice step.
      if (isCallNode(step.node)) steps[steps.length - 1] = merge(s.steps[i - 1]!, step, index, entry as PracticeReading);
      else steps.push({ ...step, index, entry: entry as RunStep["entry"] });
    });
    const undone: number[] = [];
    for (const i of s.undone) {
      if (this.withdrawn.has(i)) continue;
      const p = this.toPractice[i]!;
      if (undone[undone.length - 1] !== p) undone.push(p);
    }
    const state: RunState = {
      current: s.current,
      path: s.path.filter((id) => !isCallNode(id)),
      steps,
      variables: s.variables,
      finished: this.end(s.finished),
      rejected: [...this.rejected],
      undone,
    };
    if (s.error) state.error = s.error;
    return state;
  }

  /** A re-check limit reached on a call's branch is the measurement's. */
  private end(f: RunEnd | null): RunEnd | null {
    if (!f || f.kind !== "recheck-limit" || !isCallNode(f.node)) return f;
    const node = this.byId.get(measurementOf(f.node))!;
    const call = practiceTree(this.tree).nodes.find((n) => n.id === f.node)!;
    return {
      ...f,
      node: node.id,
      branch: f.branch.replace(/^answer:/, ""),
      reason: f.reason.replace(describeNode(call), describeNode(node)),
    };
  }
}

/** One step for a reading and its call: the engine's verdict, the trainee's branch. */
function merge(reading: RunStep, call: RunStep, index: number, entry: PracticeReading): RunStep {
  const step: RunStep = { ...reading, index, entry, branch: call.answer!, to: call.to };
  if (call.recheck) step.recheck = call.recheck;
  return step;
}

/** Replay a practice log. Deterministic, like the engine's replay. */
export function practiceReplay(tree: Tree, log: readonly PracticeEntry[]): RunState {
  const run = new PracticeRun(tree);
  for (const e of log) run.apply(e);
  return run.snapshot();
}

/** Would this practice entry apply after the log? As the engine's tryEntry, for practice runs. */
export function practiceTryEntry(
  tree: Tree,
  log: readonly PracticeEntry[],
  entry: PracticeEntry,
): { ok: true; step?: RunStep; state: RunState } | { ok: false; rejection: Rejection; state: RunState } {
  const run = new PracticeRun(tree);
  for (const e of log) run.apply(e);
  const r = run.apply(entry);
  const state = run.snapshot();
  if (r.ok) return r.step ? { ok: true, step: r.step, state } : { ok: true, state };
  state.rejected.pop();
  return { ok: false, rejection: r.rejection, state };
}
