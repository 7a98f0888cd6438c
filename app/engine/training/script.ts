// A practice scenario's script: the hidden fault (an outcome of one published version) and the
// world the trainee meets on the way — what they observe at each question (and which answer
// that observation means), what the meter shows at each measurement, what each nameplate says.
// The check walks the tree with the scripted world through the engine's own traversal: it must
// reach the hidden fault, with a scripted value at every step on the way, each one readable in
// its step's quantity. Findings are written for a trainer, like the publish gate's for a lead.
import { branchName, describeNode, nodeBranches } from "../graph";
import { Run, type LogEntry, type RunEnd, type RunStep } from "../traversal";
import type { Finding, Tree, TreeNode } from "../types";
import { parseReading } from "../units";

/** What the trainee meets at one step. */
export type Scripted =
  /** What they see, hear or feel on the unit (never the answer's own words), and the answer it means. */
  | { kind: "question"; observation: string; answer: string }
  /** What the meter shows, with its unit: "1.31 µF". */
  | { kind: "measurement"; shows: string }
  /** What the nameplate or label says: "1.5 µF". */
  | { kind: "nameplate"; label: string };

/** The scripted world by node id. Steps the reference path does not need may be scripted too. */
export type World = Record<string, Scripted>;

export interface Script {
  /** The hidden fault: an outcome node of the version. */
  fault: string;
  world: World;
}

export interface ReferenceWalk {
  /** The log a trainee who reads everything right would write (readings judged with each step's own meter). */
  entries: LogEntry[];
  /** The engine's steps of that walk. */
  steps: RunStep[];
  /** Nodes from the start to where the walk stopped. */
  path: string[];
  /** Where the walk ended; null when it stopped at a step the script does not cover. */
  end: RunEnd | null;
}

export interface ScriptCheck {
  ok: boolean;
  findings: Finding[];
  reference: ReferenceWalk;
}

/** Node kinds the script speaks for. */
export const isScriptedKind = (k: TreeNode["kind"]): k is Scripted["kind"] => k === "question" || k === "measurement" || k === "nameplate";

/** The entry a step's script makes (readings with the step's own meter); null when nothing is scripted. */
function entryFor(node: TreeNode, world: World): LogEntry | null {
  switch (node.kind) {
    case "caution":
      return { type: "acknowledge", node: node.id };
    case "step":
      return { type: "continue", node: node.id };
    case "question": {
      const s = world[node.id];
      return s?.kind === "question" ? { type: "answer", node: node.id, answer: s.answer } : null;
    }
    case "measurement": {
      const s = world[node.id];
      if (s?.kind !== "measurement") return null;
      return node.meter
        ? { type: "reading", node: node.id, reading: s.shows, meter: node.meter }
        : { type: "reading", node: node.id, reading: s.shows };
    }
    case "nameplate": {
      const s = world[node.id];
      return s?.kind === "nameplate" ? { type: "nameplate", node: node.id, value: s.label } : null;
    }
    default:
      return null;
  }
}

/**
 * Walk the tree with the scripted world. Stops at an end, at a step with nothing scripted, or at
 * an entry the engine refuses (then `stoppedBy` says why). Re-check loops are bounded by the tree;
 * the walk is also capped at a few times the number of nodes.
 */
export function walkScript(tree: Tree, world: World): ReferenceWalk & { stoppedAt: string | null; stoppedBy: string | null } {
  const run = new Run(tree);
  const entries: LogEntry[] = [];
  let stoppedAt: string | null = null;
  let stoppedBy: string | null = null;
  const cap = tree.nodes.length * 4 + 8;
  for (let i = 0; i < cap; i++) {
    const node = run.currentNode;
    if (!node) break;
    const entry = entryFor(node, world);
    if (!entry) {
      stoppedAt = node.id;
      break;
    }
    const r = run.apply(entry);
    if (!r.ok) {
      stoppedAt = node.id;
      stoppedBy = r.rejection.message;
      break;
    }
    entries.push(entry);
  }
  const s = run.snapshot();
  if (!s.finished && !stoppedAt && s.current) stoppedAt = s.current;
  return { entries, steps: s.steps, path: s.path, end: s.finished, stoppedAt, stoppedBy: stoppedBy ?? s.error ?? null };
}

/** Nodes from which `target` can be reached (itself included), following every branch and re-check exit. */
export function nodesToward(tree: Tree, target: string): Set<string> {
  const into = new Map<string, string[]>();
  for (const n of tree.nodes) {
    for (const { branch } of nodeBranches(n)) {
      for (const to of [branch.to, branch.recheck?.onExceed]) {
        if (to === undefined) continue;
        if (!into.has(to)) into.set(to, []);
        into.get(to)!.push(n.id);
      }
    }
  }
  const seen = new Set<string>([target]);
  const queue = [target];
  while (queue.length) {
    for (const from of into.get(queue.pop()!) ?? []) {
      if (seen.has(from)) continue;
      seen.add(from);
      queue.push(from);
    }
  }
  return seen;
}

/** "‘a’, ‘b’ or ‘c’" */
const orList = (xs: string[]) => (xs.length < 2 ? (xs[0] ?? "") : `${xs.slice(0, -1).join(", ")} or ${xs[xs.length - 1]}`);

const same = (a: string, b: string) => a.trim().toLowerCase() === b.trim().toLowerCase();

function title(tree: Tree, id: string | null | undefined): string {
  const n = id ? tree.nodes.find((x) => x.id === id) : undefined;
  return n ? describeNode(n) : `‘${id ?? "?"}’`;
}

/** What the scripted entry at a step made of it, in words: "the reading 1.50 µF is within 1.41–1.59 µF". */
function choiceWords(step: RunStep): string {
  if (step.verdict)
    return `the scripted reading ${step.verdict.reading.text} is ${step.verdict.verdict}${step.verdict.verdict === "within" ? ` ${step.verdict.limits.text}` : ` (limits ${step.verdict.limits.text})`}`;
  if (step.answer !== undefined) return `the scripted answer ‘${step.answer}’`;
  return "the step";
}

/** Each scripted value on its own: the step exists, has the kind scripted, and the value reads. */
function checkValues(tree: Tree, script: Script, add: (f: Finding) => void): void {
  const byId = new Map(tree.nodes.map((n) => [n.id, n]));
  for (const [id, s] of Object.entries(script.world)) {
    const node = byId.get(id);
    if (!node) {
      add({
        severity: "error",
        code: "script-unknown-step",
        nodeId: id,
        message: `The script speaks for ‘${id}’, which isn't a step of this version: remove it.`,
      });
      continue;
    }
    const at = { nodeId: id };
    if (node.kind !== s.kind) {
      add({
        severity: "error",
        code: "script-kind",
        ...at,
        message: `${describeNode(node)} is not a ${s.kind} step: script it as what it is.`,
      });
      continue;
    }
    if (s.kind === "question" && node.kind === "question") {
      if (!s.observation.trim())
        add({
          severity: "error",
          code: "script-observation",
          ...at,
          field: "observation",
          message: `Say what the trainee sees at ${describeNode(node)}.`,
        });
      else if (node.answers.some((a) => same(a.label, s.observation)))
        add({
          severity: "error",
          code: "script-gives-answer",
          ...at,
          field: "observation",
          message: `The observation at ${describeNode(node)} is an answer's own words: describe what the trainee sees, hears or feels instead.`,
        });
      if (!node.answers.some((a) => a.label === s.answer))
        add({
          severity: "error",
          code: "script-answer",
          ...at,
          field: "answer",
          message: `‘${s.answer}’ isn't an answer to ${describeNode(node)}; the answers are ${node.answers.map((a) => `‘${a.label}’`).join(", ")}.`,
        });
    } else if (s.kind === "measurement" && node.kind === "measurement") {
      const p = parseReading(s.shows, node.quantity, node.unit);
      if (!p.ok)
        add({
          severity: "error",
          code: "script-value",
          ...at,
          field: "shows",
          message: `What the meter shows at ${describeNode(node)} doesn't read: ${p.message}`,
        });
    } else if (s.kind === "nameplate" && node.kind === "nameplate") {
      const p = parseReading(s.label, node.quantity, node.unit);
      if (!p.ok)
        add({
          severity: "error",
          code: "script-value",
          ...at,
          field: "label",
          message: `What the label says at ${describeNode(node)} doesn't read: ${p.message}`,
        });
    }
  }
}

/** Where the walk turned away from the fault: the last step from which the fault was still reachable. */
function turnAway(tree: Tree, walk: ReferenceWalk, toward: Set<string>): Finding | null {
  for (let i = walk.steps.length - 1; i >= 0; i--) {
    const step = walk.steps[i]!;
    if (!toward.has(step.node)) continue;
    if (step.to !== null && toward.has(step.to)) return null;
    const node = tree.nodes.find((n) => n.id === step.node)!;
    const ways = nodeBranches(node)
      .filter((b) => toward.has(b.branch.to) || (b.branch.recheck?.onExceed !== undefined && toward.has(b.branch.recheck.onExceed)))
      .map((b) => `‘${branchName(b.key)}’`);
    const goes = step.to === null ? "ends the walk there" : `leads to ${title(tree, step.to)}`;
    return {
      severity: "error",
      code: "script-leads-elsewhere",
      nodeId: node.id,
      field: node.kind === "question" ? "answer" : node.kind === "measurement" ? "shows" : undefined,
      message: `At ${describeNode(node)} ${choiceWords(step)}, which ${goes}; the hidden fault is reached by ${orList(ways) || "no branch from here"}.`,
    };
  }
  return null;
}

/** Check a scenario's script against its tree version. `ok` when nothing is an error. */
export function checkScript(tree: Tree, script: Script): ScriptCheck {
  const findings: Finding[] = [];
  const add = (f: Finding) => {
    if (f.field === undefined) delete f.field;
    findings.push(f);
  };
  const fault = tree.nodes.find((n) => n.id === script.fault);
  if (!fault || fault.kind !== "outcome") {
    add({
      severity: "error",
      code: "script-fault",
      message: fault
        ? `${describeNode(fault)} is not a root cause: choose an outcome as the hidden fault.`
        : "Choose the hidden fault: one of this version's outcomes.",
    });
  }
  checkValues(tree, script, add);
  const walk = walkScript(tree, script.world);
  const reference: ReferenceWalk = { entries: walk.entries, steps: walk.steps, path: walk.path, end: walk.end };
  if (fault?.kind === "outcome") {
    const toward = nodesToward(tree, fault.id);
    if (!toward.has(tree.start)) {
      add({
        severity: "error",
        code: "script-fault-unreachable",
        nodeId: fault.id,
        message: `${describeNode(fault)} can't be reached from the start of this version.`,
      });
    } else if (walk.stoppedAt) {
      const node = tree.nodes.find((n) => n.id === walk.stoppedAt)!;
      // A step off the way to the fault that has no script: the turn away came first.
      const away = toward.has(node.id) ? null : turnAway(tree, reference, toward);
      if (away) add(away);
      else if (findings.some((f) => f.nodeId === node.id)) {
        // Already said: the scripted value itself is wrong.
      } else if (walk.stoppedBy)
        add({
          severity: "error",
          code: "script-refused",
          nodeId: node.id,
          message: `At ${describeNode(node)} the script can't go on: ${walk.stoppedBy}`,
        });
      else
        add({
          severity: "error",
          code: "script-missing",
          nodeId: node.id,
          field:
            node.kind === "question"
              ? "observation"
              : node.kind === "measurement"
                ? "shows"
                : node.kind === "nameplate"
                  ? "label"
                  : undefined,
          message: `Nothing is scripted for ${describeNode(node)}, which is on the way to the hidden fault: ${node.kind === "question" ? "say what the trainee sees and which answer it means" : node.kind === "measurement" ? "say what the meter shows" : "say what the label says"}.`,
        });
    } else if (!(walk.end?.kind === "outcome" && walk.end.node === fault.id)) {
      const away = turnAway(tree, reference, toward);
      const where = walk.end
        ? walk.end.kind === "outcome"
          ? title(tree, walk.end.node)
          : walk.end.kind === "escalate"
            ? `a hand-over (${title(tree, walk.end.node)})`
            : `the re-check limit at ${title(tree, walk.end.node)}`
        : "nowhere";
      add(
        away
          ? { ...away, message: `${away.message} The script ends at ${where} instead of ${describeNode(fault)}.` }
          : {
              severity: "error",
              code: "script-leads-elsewhere",
              message: `The script ends at ${where} instead of ${describeNode(fault)}.`,
            },
      );
    }
  }
  return { ok: !findings.some((f) => f.severity === "error"), findings, reference };
}
