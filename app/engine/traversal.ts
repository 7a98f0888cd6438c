// Traversal: a tree plus an ordered log of what the technician did → where the run is.
// Undo is an entry in the log, not a deletion, so the same log always replays to the same
// state. Entries that can't apply (wrong node, unreadable reading…) are reported in
// `rejected` and change nothing.
import type { Meter, NodeKind, Tree, TreeNode } from "./types";
import { evaluateReading, type Confirmation, type Verdict } from "./verdict";
import { parseRating } from "./units";
import { branchName, describeNode, nodeBranches } from "./graph";
import type { Branch } from "./types";

export type LogEntry =
  | { type: "answer"; node: string; answer: string }
  /**
   * `confirmed`: the technician confirmed an implausible reading (the verdict's `confirm`); without
   * it a new entry with such a reading is refused with code "needs-confirmation". Replaying a
   * stored log doesn't ask again, so the flag is a record (keep it with the step), not a key.
   */
  | { type: "reading"; node: string; reading: string; meter?: Meter; confirmed?: boolean }
  | { type: "nameplate"; node: string; value: string }
  | { type: "acknowledge"; node: string }
  | { type: "continue"; node: string }
  | { type: "undo" };

export interface RecordedValue {
  /** In the recording node's display unit. */
  value: number;
  unit: string;
  /** "1.5" as shown. */
  display: string;
  si: number;
  siUnit: string;
}

export interface RunStep {
  /** Index of the log entry that made this step. */
  index: number;
  node: string;
  kind: NodeKind;
  entry: Exclude<LogEntry, { type: "undo" }>;
  /** The branch taken: "next", "low"…, or "answer:<label>". */
  branch: string;
  /** Where the run went next; null when the step ended it. */
  to: string | null;
  answer?: string;
  verdict?: Verdict;
  nameplate?: RecordedValue;
  /** Set when the branch taken is a bounded re-check loop. */
  recheck?: { count: number; max: number; exceeded: boolean };
  /** Set when the technician confirmed an implausible reading (verdict.confirm says what was asked). */
  confirmed?: true;
}

export interface RunVariable extends RecordedValue {
  node: string;
}

export type RunEnd =
  | { kind: "outcome"; node: string }
  | { kind: "escalate"; node: string; reason: string }
  /** A re-check loop without an onExceed node went round more than its bound. */
  | { kind: "recheck-limit"; node: string; branch: string; max: number; reason: string };

export interface Rejection {
  index: number;
  entry: LogEntry;
  code:
    | "finished"
    | "wrong-node"
    | "wrong-entry"
    | "unknown-answer"
    | "reading"
    | "no-branch"
    | "broken-tree"
    | "nothing-to-undo"
    /** An implausible reading: ask the technician, then send the entry again with `confirmed: true`. */
    | "needs-confirmation";
  message: string;
  /** For "needs-confirmation": what to ask, and what they probably meant. */
  confirm?: Confirmation;
  /** For "reading": what the technician probably meant, ready to put back in the field. */
  suggestions?: string[];
}

export interface RunState {
  /** The node waiting for input; null once the run has ended (or the tree can't start). */
  current: string | null;
  /** Nodes visited in order, from the start to the current (or final) node. */
  path: string[];
  /** Steps taken and not undone, in order. */
  steps: RunStep[];
  /** Named values recorded so far (nameplate inputs and readings). */
  variables: Record<string, RunVariable>;
  finished: RunEnd | null;
  rejected: Rejection[];
  /** Log indices of steps that were undone. */
  undone: number[];
  /** Set when the tree itself prevents the run (no start node). */
  error?: string;
}

export type ApplyResult = { ok: true; step?: RunStep } | { ok: false; rejection: Rejection };

const indexCache = new WeakMap<Tree, Map<string, TreeNode>>();
function nodeIndex(tree: Tree): Map<string, TreeNode> {
  let m = indexCache.get(tree);
  if (!m) {
    m = new Map();
    for (const n of tree.nodes) if (!m.has(n.id)) m.set(n.id, n);
    indexCache.set(tree, m);
  }
  return m;
}

const NEEDS: Record<NodeKind, { type: LogEntry["type"]; what: string } | null> = {
  question: { type: "answer", what: "an answer" },
  measurement: { type: "reading", what: "a reading" },
  nameplate: { type: "nameplate", what: "a value from the nameplate" },
  caution: { type: "acknowledge", what: "an acknowledgement" },
  step: { type: "continue", what: "a ‘continue’" },
  outcome: null,
  escalate: null,
};

interface Undo {
  step: RunStep;
  variable?: { name: string; previous: RunVariable | undefined };
  loopKey?: string;
  pathAdded: number;
}

/** A run in progress. Mutable inside; snapshot() hands out a copy. */
export class Run {
  private readonly nodes: Map<string, TreeNode>;
  private current: string | null = null;
  private path: string[] = [];
  private history: Undo[] = [];
  private variables = new Map<string, RunVariable>();
  private values: Record<string, number> = Object.create(null) as Record<string, number>;
  private loops = new Map<string, number>();
  private finished: RunEnd | null = null;
  private rejected: Rejection[] = [];
  private undone: number[] = [];
  private error: string | undefined;
  private count = 0;

  constructor(readonly tree: Tree) {
    this.nodes = nodeIndex(tree);
    const start = this.nodes.get(tree.start);
    if (!start) {
      this.error = `The tree's start ‘${tree.start}’ isn't a step in the tree.`;
      return;
    }
    this.enter(start);
  }

  /** Where the run is: the node waiting for input. */
  get currentNode(): TreeNode | null {
    return this.current === null ? null : (this.nodes.get(this.current) ?? null);
  }

  /** The run's variables as plain numbers, for previews of derived limits. */
  get variableValues(): Readonly<Record<string, number>> {
    return this.values;
  }

  private enter(node: TreeNode): void {
    this.path.push(node.id);
    if (node.kind === "outcome") {
      this.finished = { kind: "outcome", node: node.id };
      this.current = null;
    } else if (node.kind === "escalate") {
      this.finished = { kind: "escalate", node: node.id, reason: node.reason };
      this.current = null;
    } else {
      this.current = node.id;
    }
  }

  private reject(
    entry: LogEntry,
    index: number,
    code: Rejection["code"],
    message: string,
    extra?: Pick<Rejection, "confirm" | "suggestions">,
  ): ApplyResult {
    const rejection: Rejection = { index, entry, code, message, ...extra };
    this.rejected.push(rejection);
    return { ok: false, rejection };
  }

  /**
   * Apply the next log entry. A new entry (the default) must carry `confirmed: true` when its
   * reading is implausible; with `replaying`, the entry comes from a log that was accepted entry by
   * entry, so that gate was passed when it was stored and isn't asked again (older logs, stored
   * before the rule, replay as they were accepted).
   */
  apply(entry: LogEntry, how: { replaying?: boolean } = {}): ApplyResult {
    const index = this.count++;
    if (entry.type === "undo") return this.undo(entry, index);
    if (this.error) return this.reject(entry, index, "broken-tree", this.error);
    if (this.finished) return this.reject(entry, index, "finished", "The run has ended: undo to change an earlier step.");
    const node = this.currentNode!;
    if (entry.node !== node.id) {
      return this.reject(entry, index, "wrong-node", `This entry is for ‘${entry.node}’, but the run is at ${describeNode(node)}.`);
    }
    const needs = NEEDS[node.kind]!;
    if (entry.type !== needs.type) {
      return this.reject(entry, index, "wrong-entry", `${describeNode(node)} needs ${needs.what}, not ${NEEDS_WORD[entry.type]}.`);
    }

    let branchKey: string;
    let branch: Branch | undefined;
    const step: Partial<RunStep> = {};
    let variable: { name: string; value: RunVariable } | undefined;

    switch (node.kind) {
      case "question": {
        const e = entry as Extract<LogEntry, { type: "answer" }>;
        let a: (typeof node.answers)[number] | undefined;
        for (const x of node.answers) if (x.label === e.answer) a = a ?? x;
        if (!a) {
          const list = node.answers.map((x) => `‘${x.label}’`).join(", ");
          return this.reject(
            entry,
            index,
            "unknown-answer",
            `‘${e.answer}’ isn't an answer to ${describeNode(node)}; the answers are ${list}.`,
          );
        }
        branchKey = `answer:${a.label}`;
        branch = a;
        step.answer = a.label;
        break;
      }
      case "measurement": {
        const e = entry as Extract<LogEntry, { type: "reading" }>;
        const opts = e.meter ? { variables: this.values, meter: e.meter } : { variables: this.values };
        const r = evaluateReading(node, e.reading, opts);
        if (!r.ok) return this.reject(entry, index, "reading", r.message, r.suggestions ? { suggestions: r.suggestions } : undefined);
        if (r.verdict.confirm) {
          if (e.confirmed !== true && !how.replaying)
            return this.reject(entry, index, "needs-confirmation", r.verdict.confirm.message, { confirm: r.verdict.confirm });
          if (e.confirmed === true) step.confirmed = true;
        }
        branchKey = r.verdict.verdict;
        branch = node.branches[r.verdict.verdict];
        step.verdict = r.verdict;
        // An overload has no value to record for later formulas.
        if (node.variable && !r.verdict.reading.overload) {
          const rd = r.verdict.reading;
          variable = {
            name: node.variable,
            value: { value: rd.value, unit: node.unit, display: rd.display, si: rd.si, siUnit: rd.siUnit, node: node.id },
          };
        }
        break;
      }
      case "nameplate": {
        const e = entry as Extract<LogEntry, { type: "nameplate" }>;
        const p = parseRating(e.value, node.quantity, node.unit);
        if (!p.ok) return this.reject(entry, index, "reading", p.message, p.suggestions ? { suggestions: p.suggestions } : undefined);
        const rec: RecordedValue = { value: p.value, unit: node.unit, display: p.display, si: p.si, siUnit: p.siUnit };
        step.nameplate = rec;
        variable = { name: node.variable, value: { ...rec, node: node.id } };
        branchKey = "next";
        branch = node.next;
        break;
      }
      default: {
        branchKey = "next";
        branch = node.kind === "step" || node.kind === "caution" ? node.next : undefined;
      }
    }

    if (!branch) {
      return this.reject(
        entry,
        index,
        "no-branch",
        `${describeNode(node)} has nowhere to go for ‘${branchName(branchKey)}’: the tree needs fixing.`,
      );
    }

    // Bounded re-check loops.
    let to: string | null = branch.to;
    let loopKey: string | undefined;
    let end: RunEnd | undefined;
    if (branch.recheck) {
      loopKey = `${node.id}\u0000${branchKey}`;
      const count = (this.loops.get(loopKey) ?? 0) + 1;
      const exceeded = count > branch.recheck.max;
      step.recheck = { count, max: branch.recheck.max, exceeded };
      if (exceeded) {
        if (branch.recheck.onExceed) to = branch.recheck.onExceed;
        else {
          to = null;
          end = {
            kind: "recheck-limit",
            node: node.id,
            branch: branchKey,
            max: branch.recheck.max,
            reason: `Re-checked ${branch.recheck.max} time${branch.recheck.max === 1 ? "" : "s"} at ${describeNode(node)} without settling it: hand the call to a lead.`,
          };
        }
      }
    }
    const target = to === null ? null : this.nodes.get(to);
    if (to !== null && !target) {
      return this.reject(
        entry,
        index,
        "broken-tree",
        `${describeNode(node)} sends ‘${branchName(branchKey)}’ to ‘${to}’, which isn't in the tree.`,
      );
    }

    // Commit.
    if (loopKey) this.loops.set(loopKey, step.recheck!.count);
    const done: RunStep = {
      index,
      node: node.id,
      kind: node.kind,
      entry,
      branch: branchKey,
      to,
      ...step,
    };
    const undo: Undo = { step: done, pathAdded: 0 };
    if (loopKey) undo.loopKey = loopKey;
    if (variable) {
      undo.variable = { name: variable.name, previous: this.variables.get(variable.name) };
      this.variables.set(variable.name, variable.value);
      this.values[variable.name] = variable.value.value;
    }
    this.history.push(undo);
    if (target) {
      this.enter(target);
      undo.pathAdded = 1;
    } else {
      this.current = null;
      this.finished = end!;
    }
    return { ok: true, step: done };
  }

  private undo(entry: LogEntry, index: number): ApplyResult {
    const last = this.history.pop();
    if (!last) return this.reject(entry, index, "nothing-to-undo", "Nothing to undo: the run is at its first step.");
    if (last.pathAdded) this.path.pop();
    if (last.loopKey) {
      const c = (this.loops.get(last.loopKey) ?? 1) - 1;
      if (c > 0) this.loops.set(last.loopKey, c);
      else this.loops.delete(last.loopKey);
    }
    if (last.variable) {
      const { name, previous } = last.variable;
      if (previous) {
        this.variables.set(name, previous);
        this.values[name] = previous.value;
      } else {
        this.variables.delete(name);
        delete this.values[name];
      }
    }
    this.finished = null;
    this.current = last.step.node;
    this.undone.push(last.step.index);
    return { ok: true };
  }

  snapshot(): RunState {
    const state: RunState = {
      current: this.current,
      path: [...this.path],
      steps: this.history.map((h) => h.step),
      variables: Object.fromEntries(this.variables),
      finished: this.finished,
      rejected: [...this.rejected],
      undone: [...this.undone],
    };
    if (this.error) state.error = this.error;
    return state;
  }
}

const NEEDS_WORD: Record<LogEntry["type"], string> = {
  answer: "an answer",
  reading: "a reading",
  nameplate: "a nameplate value",
  acknowledge: "an acknowledgement",
  continue: "a ‘continue’",
  undo: "an undo",
};

const REPLAYING = { replaying: true } as const;

/** Start a run at the tree's first node. */
export function startRun(tree: Tree): Run {
  return new Run(tree);
}

/** Replay a whole log. Deterministic: the same tree and log always give the same state. */
export function replay(tree: Tree, log: readonly LogEntry[]): RunState {
  const run = new Run(tree);
  for (const e of log) run.apply(e, REPLAYING);
  return run.snapshot();
}

/**
 * Would this entry apply after the log? For a server accepting one step from the phone:
 * replay the stored log, try the new entry, and store it only when ok.
 */
export function tryEntry(
  tree: Tree,
  log: readonly LogEntry[],
  entry: LogEntry,
): { ok: true; step?: RunStep; state: RunState } | { ok: false; rejection: Rejection; state: RunState } {
  const run = new Run(tree);
  for (const e of log) run.apply(e, REPLAYING);
  const r = run.apply(entry);
  const state = run.snapshot();
  if (r.ok) return r.step ? { ok: true, step: r.step, state } : { ok: true, state };
  state.rejected.pop();
  return { ok: false, rejection: r.rejection, state };
}

/** Branches leaving the run's current node, for a runner to show (answers in order). */
export function choicesAt(node: TreeNode): string[] {
  return nodeBranches(node).map((b) => branchName(b.key));
}
