// The data-flow check of validation: a formula's variable must be recorded on every path from the
// start into the node that uses it.
import type { Tree, TreeNode } from "../types";
import { compileFormula } from "../formula";
import { limitFormulas } from "../limits";
import { describeNode } from "../graph";
import type { Add, Edges } from "./shared";
import { type Adjacency, adjacency } from "./walk";
import type { Reached } from "./graph";

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
export function checkDataFlow(
  tree: Tree,
  start: number,
  reached: Reached,
  E: Edges,
  definers: ReadonlyMap<string, unknown>,
  add: Add,
): void {
  const { reach, order, all } = reached;
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
  const preds = adjacency(N, E.edgeFrom, E.edgeTo, (e) => reach[E.edgeFrom[e]!] === 1, true);
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
function pathAvoiding(start: number, target: number, name: string, nodes: TreeNode[], g: Adjacency): number[] | null {
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
