// Validation: the gate before a tree can be published. Findings are written for a lead tech.
// Everything here is linear in the size of the tree; the data-flow check costs the sum of each
// variable's live region (see dataFlow), which is linear too when variables are used near
// where they are recorded.
import type { Branch, Finding, Limits, LimitValue, MeasurementNode, Quantity, Tree, TreeNode } from "./types";
import { QUANTITY_INFO, kindNoun, resolveUnit, convertQty } from "./units";
import { compileFormula, isReservedName } from "./formula";
import { limitFormulas, possibleVerdicts } from "./limits";
import { branchName, describeNode } from "./graph";
import { TreeSchema } from "./schema";

export interface ValidationResult {
  findings: Finding[];
  errors: number;
  warnings: number;
  ok: boolean;
}

type Add = (f: Omit<Finding, "nodeIndex"> & { nodeIndex?: number }) => void;

const VERDICT_WORD: Record<string, string> = {
  low: "a low reading",
  within: "a reading within limits",
  high: "a high reading",
  marginal: "a marginal reading",
};

// --- per-node checks ---------------------------------------------------------------------------

function checkUnit(node: TreeNode & { quantity: Quantity; unit: string }, i: number, add: Add): boolean {
  const r = resolveUnit(node.unit, node.quantity);
  const info = QUANTITY_INFO[node.quantity];
  if (!r) {
    add({
      severity: "error",
      code: "unit-unknown",
      nodeId: node.id,
      nodeIndex: i,
      field: "unit",
      message: `${describeNode(node)} uses the unit ‘${node.unit}’, which Cluepath doesn't know: for ${info.noun} use ${info.units.join(", ")}.`,
    });
    return false;
  }
  if (r.kind !== info.kind || (node.quantity === "temperature" && !r.absoluteTemperature)) {
    add({
      severity: "error",
      code: "unit-quantity",
      nodeId: node.id,
      nodeIndex: i,
      field: "unit",
      message: `${describeNode(node)} records ${info.noun}, but its unit ‘${node.unit}’ is ${kindNoun(r.kind)}: use ${info.units.join(", ")}.`,
    });
    return false;
  }
  return true;
}

function limitValues(l: Limits): LimitValue[] {
  return l.kind === "range" ? [l.min, l.max] : l.kind === "atLeast" ? [l.min] : l.kind === "atMost" ? [l.max] : [l.nominal];
}

function checkMeasurement(node: MeasurementNode, i: number, add: Add): void {
  const at = { nodeId: node.id, nodeIndex: i };
  const unitOk = checkUnit(node, i, add);
  const L = node.limits;
  const display = unitOk ? resolveUnit(node.unit, node.quantity)! : null;

  // Units of limit values.
  const fixed: (number | null)[] = [];
  for (const v of limitValues(L)) {
    let x: number | null = null;
    if (v.unit !== undefined) {
      const r = resolveUnit(v.unit, node.quantity);
      if (!r) {
        add({ severity: "error", code: "unit-unknown", ...at, field: "limits", message: `A limit of ${describeNode(node)} is in ‘${v.unit}’, which Cluepath doesn't know.` });
      } else if (display && (r.kind !== display.kind || r.absoluteTemperature !== display.absoluteTemperature)) {
        add({
          severity: "error",
          code: "limit-dimension",
          ...at,
          field: "limits",
          message: `A limit of ${describeNode(node)} is in ${v.unit} (${kindNoun(r.kind)}), but the step measures ${QUANTITY_INFO[node.quantity].noun} in ${node.unit}.`,
        });
      } else if (display && "value" in v) {
        x = convertQty(v.value, r.qty, display.qty);
      }
    } else if ("value" in v) {
      x = v.value;
    }
    fixed.push(x);
    if ("formula" in v) checkFormula(v.formula, node, i, "limits", add);
  }

  if (L.kind === "range") {
    const [a, b] = fixed;
    if (a != null && b != null) {
      if (a > b) {
        add({
          severity: "error",
          code: "limits-inverted",
          ...at,
          field: "limits",
          message: `${describeNode(node)} has its minimum above its maximum (${describeValue(L.min, node.unit)} to ${describeValue(L.max, node.unit)}): swap them.`,
        });
      } else if (a === b) {
        add({ severity: "warning", code: "limits-zero-width", ...at, field: "limits", message: `${describeNode(node)} has the same minimum and maximum: no real reading will land exactly on it.` });
      }
    }
  }
  if (L.kind === "nominal") {
    const t = L.tolerance;
    if (t.kind === "percent" || t.kind === "absolute") {
      if (t.plus < 0 || t.minus < 0) {
        add({
          severity: "error",
          code: "negative-tolerance",
          ...at,
          field: "limits",
          message: `${describeNode(node)} has a negative tolerance: write it as a size, like ± 6 % (or +10 % / −5 % when the sides differ).`,
        });
      }
      if (t.kind === "percent" && t.minus > 100) {
        add({ severity: "warning", code: "tolerance-below-zero", ...at, field: "limits", message: `${describeNode(node)} allows more than −100 %, so its lower limit is below zero.` });
      }
      if (t.kind === "percent" && node.quantity === "temperature") {
        add({
          severity: "warning",
          code: "percent-of-temperature",
          ...at,
          field: "limits",
          message: `${describeNode(node)} gives a temperature tolerance in percent, which changes with the scale (°F or °C): write it in degrees, like ± 15 °F.`,
        });
      }
      if (t.kind === "absolute" && t.unit !== undefined) {
        const r = resolveUnit(t.unit, node.quantity, true);
        const d = resolveUnit(node.unit, node.quantity, true);
        if (!r) add({ severity: "error", code: "unit-unknown", ...at, field: "limits", message: `The tolerance of ${describeNode(node)} is in ‘${t.unit}’, which Cluepath doesn't know.` });
        else if (d && r.kind !== d.kind) {
          add({
            severity: "error",
            code: "limit-dimension",
            ...at,
            field: "limits",
            message: `The tolerance of ${describeNode(node)} is in ${t.unit} (${kindNoun(r.kind)}), but the step measures ${QUANTITY_INFO[node.quantity].noun}.`,
          });
        }
      }
    }
  }

  // Meter and acceptance.
  const m = node.meter;
  if (m) {
    if (m.percent < 0 || m.counts < 0 || m.resolution <= 0) {
      add({
        severity: "error",
        code: "meter-invalid",
        ...at,
        field: "meter",
        message: `The meter accuracy of ${describeNode(node)} needs a percentage and counts of zero or more and a resolution above zero, like ±(1 % + 3 counts) at 0.1 ${node.unit}.`,
      });
    }
    if (m.unit !== undefined) {
      const r = resolveUnit(m.unit, node.quantity, true);
      if (!r || (display && r.kind !== display.kind)) {
        add({
          severity: "error",
          code: "limit-dimension",
          ...at,
          field: "meter",
          message: `The meter resolution of ${describeNode(node)} is in ‘${m.unit}’, which isn't ${QUANTITY_INFO[node.quantity].noun} unit.`,
        });
      }
    }
  }
  const guarded = node.acceptance === "guarded";
  if (guarded && !m) {
    add({
      severity: "warning",
      code: "guarded-without-meter",
      ...at,
      field: "acceptance",
      message: `${describeNode(node)} uses guarded acceptance but gives no meter accuracy: verdicts stay simple unless the technician enters their meter's accuracy.`,
    });
  }

  // Verdict branches.
  const possible = possibleVerdicts(L, guarded);
  for (const v of possible) {
    if (!node.branches[v]) {
      add({
        severity: "error",
        code: "missing-branch",
        ...at,
        message: `${describeNode(node)} has nowhere to go on ${VERDICT_WORD[v]}: add ‘- ${v} → …’.`,
      });
    }
  }
  for (const v of ["low", "high", "marginal"] as const) {
    if (node.branches[v] && !possible.includes(v)) {
      const why =
        v === "marginal"
          ? "only guarded acceptance gives marginal readings (add ‘- acceptance: guarded’ and a meter)"
          : v === "high"
            ? "‘at least’ limits never read high"
            : "‘at most’ limits never read low";
      add({ severity: "warning", code: "unused-branch", ...at, field: v, message: `${describeNode(node)} has a ‘${v}’ branch that is never taken: ${why}.` });
    }
  }
}

function checkFormula(src: string, node: TreeNode, i: number, field: string, add: Add): void {
  const c = compileFormula(src);
  if (!c.ok) {
    add({
      severity: "error",
      code: c.code === "unknown-function" ? "formula-function" : "formula-syntax",
      nodeId: node.id,
      nodeIndex: i,
      field,
      message: `The formula ‘${src}’ in ${describeNode(node)} can't be used: ${c.message}.`,
    });
  }
}

function describeValue(v: LimitValue, unit: string): string {
  return "formula" in v ? `\`${v.formula}\`` : `${v.value} ${v.unit ?? unit}`;
}

// --- the whole tree ------------------------------------------------------------------------------

/** Validate a tree. Returns findings in node order, tree-level findings first. */
export function validateTree(tree: Tree): ValidationResult {
  const findings: Finding[] = [];
  const add: Add = (f) => {
    findings.push(f as Finding);
  };
  const nodes = tree.nodes;
  const N = nodes.length;

  // Ids.
  const index = new Map<string, number>();
  const duplicate = new Uint8Array(N);
  for (let i = 0; i < N; i++) {
    const n = nodes[i]!;
    const first = index.get(n.id);
    if (first !== undefined) {
      duplicate[i] = 1;
      add({
        severity: "error",
        code: "duplicate-id",
        nodeId: n.id,
        nodeIndex: i,
        message: `Two steps use the id ‘${n.id}’ (${describeNode(nodes[first]!)} and ${describeNode(n)}): give each its own id.`,
      });
    } else index.set(n.id, i);
  }
  const start = index.get(tree.start);
  if (N === 0) {
    add({ severity: "error", code: "empty-tree", message: "The tree has no steps yet: add a first step." });
  } else if (start === undefined) {
    add({ severity: "error", code: "start-missing", message: `The tree starts at ‘${tree.start}’, but no step has that id.` });
  }

  // Per node: kinds, units, limits, branches, variables. Nothing is allocated per node unless
  // there is something to report (names and keys are built only for messages).
  const definers = new Map<string, { index: number; quantity: Quantity; unit: string }>();
  // Edges as parallel arrays; a branch's key is recovered from (from, slot) only for messages.
  const edgeFrom: number[] = [];
  const edgeTo: number[] = [];
  const edgeLoop: boolean[] = [];
  const edgeSlot: number[] = [];

  const branchAt = (n: TreeNode, slot: number): Branch | undefined => {
    if (n.kind === "question") return n.answers[slot];
    if (n.kind === "measurement") return n.branches[VERDICT_SLOTS[slot]!];
    return n.kind === "step" || n.kind === "caution" || n.kind === "nameplate" ? n.next : undefined;
  };
  const slots = (n: TreeNode): number => (n.kind === "question" ? n.answers.length : n.kind === "measurement" ? 4 : n.kind === "outcome" || n.kind === "escalate" ? 0 : 1);

  // (Helpers instead of per-node closures: nothing is built per node unless it is reported.)
  const at = (i: number) => ({ nodeId: nodes[i]!.id, nodeIndex: i });
  const nameOf = (i: number) => describeNode(nodes[i]!);
  for (let i = 0; i < N; i++) {
    const n = nodes[i]!;

    switch (n.kind) {
      case "question": {
        if (n.answers.length === 1) {
          add({ severity: "error", code: "too-few-answers", ...at(i), message: `${nameOf(i)} has only one answer: a question needs two or more (or make it a step).` });
        }
        for (let k = 1; k < n.answers.length; k++) {
          const label = n.answers[k]!.label;
          for (let j = 0; j < k; j++) {
            if (n.answers[j]!.label === label) {
              add({ severity: "error", code: "duplicate-answer", ...at(i), field: `answer:${label}`, message: `${nameOf(i)} lists the answer ‘${label}’ twice.` });
              break;
            }
          }
        }
        break;
      }
      case "measurement":
        checkMeasurement(n, i, add);
        break;
      case "nameplate":
        checkUnit(n, i, add);
        break;
      default:
        break;
    }

    // Variables recorded here.
    if ((n.kind === "measurement" || n.kind === "nameplate") && n.variable !== undefined) {
      const variable = n.variable;
      if (isReservedName(variable)) {
        add({ severity: "error", code: "variable-reserved", ...at(i), field: "variable", message: `${nameOf(i)} records ‘${variable}’, which is the name of a formula function: pick another name.` });
      }
      const prev = definers.get(variable);
      if (!prev) definers.set(variable, { index: i, quantity: n.quantity, unit: n.unit });
      else if (prev.unit !== n.unit || prev.quantity !== n.quantity) {
        add({
          severity: "error",
          code: "variable-units",
          ...at(i),
          field: "variable",
          message: `‘${variable}’ is recorded in ${prev.unit} by ${describeNode(nodes[prev.index]!)} but in ${n.unit} by ${nameOf(i)}: formulas would mix units, so use one unit or two names.`,
        });
      }
    }

    // Branches.
    const count = slots(n);
    let any = false;
    for (let slot = 0; slot < count; slot++) {
      const branch = branchAt(n, slot);
      if (!branch) continue;
      any = true;
      const to = index.get(branch.to);
      if (to === undefined) {
        const key = slotKey(n, slot);
        add({
          severity: "error",
          code: "unknown-target",
          ...at(i),
          field: key,
          message: `${nameOf(i)} sends ‘${branchName(key)}’ to ‘${branch.to}’, but no step has that id.`,
        });
      } else {
        edgeFrom.push(i);
        edgeTo.push(to);
        edgeLoop.push(branch.recheck !== undefined);
        edgeSlot.push(slot);
      }
      if (branch.recheck) {
        const r = branch.recheck;
        if (!Number.isInteger(r.max) || r.max < 1) {
          const key = slotKey(n, slot);
          add({ severity: "error", code: "recheck-bound", ...at(i), field: key, message: `The re-check loop on ‘${branchName(key)}’ in ${nameOf(i)} needs a limit of 1 or more times.` });
        }
        if (r.onExceed !== undefined) {
          const ex = index.get(r.onExceed);
          if (ex === undefined) {
            add({
              severity: "error",
              code: "unknown-target",
              ...at(i),
              field: slotKey(n, slot),
              message: `${nameOf(i)} goes to ‘${r.onExceed}’ when the re-check limit is reached, but no step has that id.`,
            });
          } else {
            edgeFrom.push(i);
            edgeTo.push(ex);
            edgeLoop.push(false);
            edgeSlot.push(slot);
          }
        }
      }
    }
    if (!any && n.kind !== "outcome" && n.kind !== "escalate") {
      const fix =
        n.kind === "question"
          ? "add answers, each with a next step"
          : n.kind === "measurement"
            ? "add branches for low, within and high"
            : "add a next step or make it an outcome";
      add({ severity: "error", code: "dead-end", ...at(i), message: `${nameOf(i)} has no way on: ${fix}.` });
    }
  }

  if (start !== undefined) graphChecks(tree, duplicate, start, { edgeFrom, edgeTo, edgeLoop, edgeSlot }, definers, add);

  findings.sort((a, b) => (a.nodeIndex ?? -1) - (b.nodeIndex ?? -1));
  let errors = 0;
  for (const f of findings) if (f.severity === "error") errors++;
  return { findings, errors, warnings: findings.length - errors, ok: errors === 0 };
}

interface Edges {
  edgeFrom: number[];
  edgeTo: number[];
  edgeLoop: boolean[];
  edgeSlot: number[];
}

const VERDICT_SLOTS = ["low", "within", "high", "marginal"] as const;

/** The Finding.field key of a node's branch slot: "answer:<label>", "low"…, "next". */
function slotKey(n: TreeNode, slot: number): string {
  if (n.kind === "question") return `answer:${n.answers[slot]?.label ?? ""}`;
  if (n.kind === "measurement") return VERDICT_SLOTS[slot]!;
  return "next";
}

function csr(N: number, from: number[], to: number[], keep: (e: number) => boolean, reverse = false) {
  const off = new Int32Array(N + 1);
  const E = from.length;
  for (let e = 0; e < E; e++) if (keep(e)) off[(reverse ? to[e]! : from[e]!) + 1]!++;
  for (let i = 0; i < N; i++) off[i + 1]! += off[i]!;
  const adj = new Int32Array(off[N]!);
  const eid = new Int32Array(off[N]!);
  const fill = off.slice(0, N);
  for (let e = 0; e < E; e++) {
    if (!keep(e)) continue;
    const a = reverse ? to[e]! : from[e]!;
    const k = fill[a]!++;
    adj[k] = reverse ? from[e]! : to[e]!;
    eid[k] = e;
  }
  return { off, adj, eid };
}

/** Strongly connected components (iterative Tarjan). comp[i] = component id; size per component. */
function scc(N: number, g: { off: Int32Array; adj: Int32Array }): { comp: Int32Array; size: Int32Array; count: number } {
  const idx = new Int32Array(N).fill(-1);
  const low = new Int32Array(N);
  const onStack = new Uint8Array(N);
  const stack = new Int32Array(N);
  let sp = 0;
  const comp = new Int32Array(N).fill(-1);
  const callNode = new Int32Array(N);
  const callEdge = new Int32Array(N);
  let counter = 0;
  let count = 0;
  const sizes: number[] = [];
  for (let s = 0; s < N; s++) {
    if (idx[s] !== -1) continue;
    let depth = 0;
    callNode[0] = s;
    callEdge[0] = g.off[s]!;
    idx[s] = low[s] = counter++;
    stack[sp++] = s;
    onStack[s] = 1;
    while (depth >= 0) {
      const v = callNode[depth]!;
      const e = callEdge[depth]!;
      if (e < g.off[v + 1]!) {
        callEdge[depth] = e + 1;
        const w = g.adj[e]!;
        if (idx[w] === -1) {
          idx[w] = low[w] = counter++;
          stack[sp++] = w;
          onStack[w] = 1;
          depth++;
          callNode[depth] = w;
          callEdge[depth] = g.off[w]!;
        } else if (onStack[w]) {
          if (idx[w]! < low[v]!) low[v] = idx[w]!;
        }
      } else {
        if (low[v] === idx[v]) {
          let size = 0;
          let w: number;
          do {
            w = stack[--sp]!;
            onStack[w] = 0;
            comp[w] = count;
            size++;
          } while (w !== v);
          sizes.push(size);
          count++;
        }
        depth--;
        if (depth >= 0) {
          const u = callNode[depth]!;
          if (low[v]! < low[u]!) low[u] = low[v]!;
        }
      }
    }
  }
  return { comp, size: Int32Array.from(sizes), count };
}

function graphChecks(
  tree: Tree,
  duplicate: Uint8Array,
  start: number,
  E: Edges,
  definers: Map<string, { index: number }>,
  add: Add,
): void {
  const nodes = tree.nodes;
  const N = nodes.length;
  const all = csr(N, E.edgeFrom, E.edgeTo, () => true);

  // Reachability (BFS) and reverse post-order (iterative DFS) from the start.
  const reach = new Uint8Array(N);
  const order: number[] = [];
  {
    const stackN = new Int32Array(N);
    const stackE = new Int32Array(N);
    let d = 0;
    stackN[0] = start;
    stackE[0] = all.off[start]!;
    reach[start] = 1;
    while (d >= 0) {
      const v = stackN[d]!;
      const e = stackE[d]!;
      if (e < all.off[v + 1]!) {
        stackE[d] = e + 1;
        const w = all.adj[e]!;
        if (!reach[w]) {
          reach[w] = 1;
          d++;
          stackN[d] = w;
          stackE[d] = all.off[w]!;
        }
      } else {
        order.push(v);
        d--;
      }
    }
    order.reverse();
  }
  for (let i = 0; i < N; i++) {
    if (!reach[i] && !duplicate[i]) {
      const n = nodes[i]!;
      add({
        severity: "warning",
        code: "unreachable",
        nodeId: n.id,
        nodeIndex: i,
        message: `${describeNode(n)} can't be reached from the start: link to it from another step or delete it.`,
      });
    }
  }

  // Cycles: without the marked re-check branches the graph must have none.
  const plain = csr(N, E.edgeFrom, E.edgeTo, (e) => !E.edgeLoop[e]);
  const p = scc(N, plain);
  const reported = new Uint8Array(p.count);
  for (let i = 0; i < N; i++) {
    const c = p.comp[i]!;
    let cyclic = p.size[c]! > 1;
    if (!cyclic) {
      for (let k = plain.off[i]!; k < plain.off[i + 1]!; k++) if (plain.adj[k] === i) cyclic = true;
    }
    if (!cyclic || reported[c]) continue;
    reported[c] = 1;
    const loop = sampleCycle(i, plain, p.comp);
    const n = nodes[i]!;
    add({
      severity: "error",
      code: "cycle",
      nodeId: n.id,
      nodeIndex: i,
      message: `These steps loop with no limit: ${loop.map((j) => nodes[j]!.id).join(" → ")}. Mark the branch that goes back as a re-check loop, like ‘(re-check up to 2 times, then escalate-id)’, or remove it.`,
    });
  }
  // Re-check branches that don't actually loop back.
  const full = scc(N, all);
  for (let e = 0; e < E.edgeFrom.length; e++) {
    if (!E.edgeLoop[e]) continue;
    const a = E.edgeFrom[e]!;
    const b = E.edgeTo[e]!;
    if (full.comp[a] !== full.comp[b]) {
      const n = nodes[a]!;
      add({
        severity: "warning",
        code: "recheck-not-a-loop",
        nodeId: n.id,
        nodeIndex: a,
        field: slotKey(n, E.edgeSlot[e]!),
        message: `${describeNode(n)} marks ‘${branchName(slotKey(n, E.edgeSlot[e]!))}’ as a re-check loop, but ‘${nodes[b]!.id}’ never leads back to it.`,
      });
    }
  }

  dataFlow(tree, start, reach, order, all, E, definers, add);
}

/** One cycle through i inside its component (for the message). */
function sampleCycle(i: number, g: { off: Int32Array; adj: Int32Array }, comp: Int32Array): number[] {
  const c = comp[i]!;
  const prev = new Map<number, number>();
  const queue = [i];
  for (let q = 0; q < queue.length; q++) {
    const v = queue[q]!;
    for (let k = g.off[v]!; k < g.off[v + 1]!; k++) {
      const w = g.adj[k]!;
      if (comp[w] !== c) continue;
      if (w === i) {
        const back: number[] = [];
        for (let x = v; x !== i; x = prev.get(x)!) back.push(x);
        return [i, ...back.reverse(), i];
      }
      if (!prev.has(w)) {
        prev.set(w, v);
        queue.push(w);
      }
    }
  }
  return [i, i];
}

/**
 * Must-be-recorded analysis: a formula's variable has to be recorded on every path from the
 * start into the node that uses it (IN(n) = ⋂ OUT(pred), OUT(n) = IN(n) ∪ DEF(n), IN(start) = ∅,
 * greatest fixed point). Solved one variable at a time on its live region only:
 *
 *  1. Walk backwards from the variable's uses, never past a node that records it. If the walk
 *     never reaches the start, every path into every use records it first: done.
 *  2. Otherwise solve the one-bit equations above on that region (in reverse post-order, to a
 *     fixed point; the only cycles are re-check loops, so 2–3 passes) and flag the uses it
 *     leaves undefined.
 *
 * The cost is the sum of the live regions — proportional to the tree when variables are used
 * near where they are recorded, as they are in practice — rather than nodes × variables.
 */
function dataFlow(
  tree: Tree,
  start: number,
  reach: Uint8Array,
  order: number[],
  all: { off: Int32Array; adj: Int32Array },
  E: Edges,
  definers: Map<string, { index: number }>,
  add: Add,
): void {
  const nodes = tree.nodes;
  const N = nodes.length;
  // Uses per variable (reachable nodes only).
  const uses = new Map<string, number[]>();
  for (const i of order) {
    const n = nodes[i]!;
    if (n.kind !== "measurement") continue;
    const seen = new Set<string>();
    for (const src of limitFormulas(n.limits)) {
      const c = compileFormula(src);
      if (!c.ok) continue;
      for (const name of c.formula.variables) {
        if (seen.has(name)) continue;
        seen.add(name);
        if (!definers.has(name)) {
          add({
            severity: "error",
            code: "unknown-variable",
            nodeId: n.id,
            nodeIndex: i,
            field: "limits",
            message: `${describeNode(n)} uses ‘${name}’ in its limits, but no nameplate input or measurement records ‘${name}’.`,
          });
          continue;
        }
        let u = uses.get(name);
        if (!u) uses.set(name, (u = []));
        u.push(i);
      }
    }
  }
  if (uses.size === 0) return;

  // Which used variable (by number) each node records, so the walks below don't touch nodes.
  const varNo = new Map<string, number>();
  for (const name of uses.keys()) varNo.set(name, varNo.size);
  const records = new Int32Array(N).fill(-1);
  for (let i = 0; i < N; i++) {
    const n = nodes[i]!;
    const v = n.kind === "measurement" || n.kind === "nameplate" ? n.variable : undefined;
    if (v !== undefined) records[i] = varNo.get(v) ?? -1;
  }
  const preds = csr(N, E.edgeFrom, E.edgeTo, (e) => reach[E.edgeFrom[e]!] === 1, true);
  const rpo = new Int32Array(N).fill(-1);
  order.forEach((v, k) => (rpo[v] = k));
  const stamp = new Int32Array(N); // region membership, per variable
  const value = new Uint8Array(N); // IN(n) for the variable being solved
  let round = 0;
  let examples = 0;

  for (const [name, useList] of uses) {
    round++;
    const vn = varNo.get(name)!;
    // 1. Live region: backwards from the uses, stopping at nodes that record the variable.
    const region: number[] = [];
    for (const u of useList) {
      if (stamp[u] !== round) {
        stamp[u] = round;
        region.push(u);
      }
    }
    let hitsStart = false;
    for (let q = 0; q < region.length; q++) {
      const x = region[q]!;
      if (x === start) {
        hitsStart = true;
        continue;
      }
      for (let k = preds.off[x]!; k < preds.off[x + 1]!; k++) {
        const p = preds.adj[k]!;
        if (stamp[p] === round || records[p] === vn) continue;
        stamp[p] = round;
        region.push(p);
      }
    }
    if (!hitsStart) continue;

    // 2. One-bit must-analysis on the region, greatest fixed point.
    region.sort((x, y) => rpo[x]! - rpo[y]!);
    for (const x of region) value[x] = x === start ? 0 : 1;
    let changed = true;
    while (changed) {
      changed = false;
      for (const x of region) {
        if (x === start) continue;
        let v = 1;
        for (let k = preds.off[x]!; k < preds.off[x + 1]! && v; k++) {
          const p = preds.adj[k]!;
          if (records[p] === vn) continue;
          if (stamp[p] === round && !value[p]) v = 0;
        }
        if (v !== value[x]) {
          value[x] = v;
          changed = true;
        }
      }
    }
    for (const u of useList) {
      if (value[u]) continue;
      const n = nodes[u]!;
      // An example path costs a search of the tree: give one for the first few findings only.
      const path = ++examples <= 20 ? pathAvoiding(start, u, name, nodes, all) : null;
      const via = path ? ` — for example ${path.map((j) => nodes[j]!.id).join(" → ")}` : "";
      add({
        severity: "error",
        code: "variable-not-always-set",
        nodeId: n.id,
        nodeIndex: u,
        field: "limits",
        message: `${describeNode(n)} uses ‘${name}’ in its limits, but some ways into it don't record ‘${name}’ first${via}. Record it earlier on every path, or use fixed limits.`,
      });
    }
  }
}

/** A path from start to target on which no node before target records `name` (for messages). */
function pathAvoiding(start: number, target: number, name: string, nodes: TreeNode[], g: { off: Int32Array; adj: Int32Array }): number[] | null {
  const records = (i: number) => {
    const n = nodes[i]!;
    return (n.kind === "measurement" || n.kind === "nameplate") && n.variable === name;
  };
  if (records(start) && start !== target) return null;
  const prev = new Int32Array(nodes.length).fill(-2);
  prev[start] = -1;
  const queue = [start];
  for (let q = 0; q < queue.length; q++) {
    const v = queue[q]!;
    for (let k = g.off[v]!; k < g.off[v + 1]!; k++) {
      const w = g.adj[k]!;
      if (prev[w] !== -2) continue;
      prev[w] = v;
      if (w === target) {
        const path: number[] = [];
        for (let x = w; x !== -1; x = prev[x]!) path.push(x);
        return path.reverse();
      }
      if (!records(w)) queue.push(w);
    }
  }
  return target === start ? [start] : null;
}

/** Shorthand: the error findings only. */
export function errorsOf(findings: Finding[]): Finding[] {
  return findings.filter((f) => f.severity === "error");
}

/**
 * Validate data of unknown shape (a request body, a DB row): first the zod schema, then the
 * tree checks. Shape problems come back as findings with code "shape".
 */
export function validateTreeData(data: unknown): { tree: Tree | null; result: ValidationResult } {
  const parsed = TreeSchema.safeParse(data);
  if (!parsed.success) {
    const findings: Finding[] = parsed.error.issues.map((i) => {
      const f: Finding = { severity: "error", code: "shape", message: `${i.path.map(String).join(".") || "tree"}: ${i.message}` };
      if (i.path[0] === "nodes" && typeof i.path[1] === "number") {
        f.nodeIndex = i.path[1];
        const id = (data as { nodes?: { id?: unknown }[] }).nodes?.[i.path[1]]?.id;
        if (typeof id === "string") f.nodeId = id;
      }
      return f;
    });
    return { tree: null, result: { findings, errors: findings.length, warnings: 0, ok: false } };
  }
  const tree = parsed.data as Tree;
  return { tree, result: validateTree(tree) };
}
