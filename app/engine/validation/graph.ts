// The checks of validation that look at the tree as a graph: what the start can't reach, loops
// that aren't marked as bounded re-checks, and re-check marks on branches that don't loop.
import type { Tree } from "../types";
import { branchName, describeNode } from "../graph";
import { type Add, type Edges, slotKey } from "./shared";
import { type Adjacency, adjacency, components, reachFrom } from "./walk";

export interface Reached {
  /** 1 for nodes reachable from the start. */
  reach: Uint8Array;
  /** Reachable nodes in reverse post-order. */
  order: number[];
  /** Every edge, as adjacency. */
  all: Adjacency;
}

export function checkGraph(tree: Tree, duplicate: Uint8Array, start: number, E: Edges, add: Add): Reached {
  const nodes = tree.nodes;
  const N = nodes.length;
  const all = adjacency(N, E.edgeFrom, E.edgeTo, () => true);

  const { reach, order } = reachFrom(all, N, start);
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
  const plain = adjacency(N, E.edgeFrom, E.edgeTo, (e) => !E.edgeLoop[e]);
  const p = components(plain, N);
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
  const full = components(all, N);
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
  return { reach, order, all };
}

/** One cycle through i inside its component (for the message). */
function sampleCycle(i: number, g: Adjacency, comp: Int32Array): number[] {
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
