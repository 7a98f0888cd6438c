// The checks of validation that look at the tree as a graph: what the start can't reach (folded
// into the missing branch target that cut it off), loops that aren't marked as bounded re-checks
// (pointed at the branch that closes them), and re-check marks on branches that don't loop.
import type { Finding, Tree } from "../types";
import { branchName, describeNode } from "../graph";
import { type Add, type Edges, slotKey } from "./shared";
import type { MissingTarget } from "./checks";
import { type Adjacency, adjacency, components, reachFrom } from "./walk";

export interface Reached {
  /** 1 for nodes reachable from the start. */
  reach: Uint8Array;
  /** Reachable nodes in reverse post-order. */
  order: number[];
  /** Every edge, as adjacency. */
  all: Adjacency;
}

export function checkGraph(
  tree: Tree,
  duplicate: Uint8Array,
  start: number,
  E: Edges,
  missing: readonly MissingTarget[],
  add: Add,
): Reached {
  const nodes = tree.nodes;
  const N = nodes.length;
  const all = adjacency(N, E.edgeFrom, E.edgeTo, () => true);

  const { reach, order } = reachFrom(all, N, start);
  if (order.length < N) unreachable(tree, all, reach, duplicate, missing, add);

  // Cycles: without the marked re-check branches the graph must have none. The search starts at
  // the start, so the branch it finds closing a loop is the one that goes back along the way a
  // technician walks; each loop is reported once, at that branch.
  const plain = adjacency(N, E.edgeFrom, E.edgeTo, (e) => !E.edgeLoop[e]);
  const back: { from: number; k: number; loop: number[] }[] = [];
  const p = components(plain, N, [start], (v, w, k, onPath, walk) => {
    if (onPath) back.push({ from: v, k, loop: Array.from(walk.nodes.subarray(walk.position[w]!, walk.depth + 1)) });
  });
  const reported = new Uint8Array(p.count);
  for (const b of back) {
    const c = p.comp[b.from]!;
    if (reported[c]) continue;
    reported[c] = 1;
    const n = nodes[b.from]!;
    const key = slotKey(n, E.edgeSlot[plain.eid[b.k]!]!);
    const ids = [...b.loop, b.loop[0]!].map((j) => nodes[j]!.id).join(" → ");
    add({
      severity: "error",
      code: "cycle",
      nodeId: n.id,
      nodeIndex: b.from,
      field: key,
      message: `These steps loop with no limit: ${ids}. ‘${branchName(key)}’ of ${describeNode(n)} goes back to ‘${nodes[b.loop[0]!]!.id}’: mark it as a re-check loop, like ‘(re-check up to 2 times, then escalate-id)’, or remove it.`,
    });
  }
  // Re-check branches that don't actually loop back.
  const full = components(all, N, [start]);
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

/**
 * What the start can't reach, told once per cause. The unreachable part splits into regions, each
 * behind a first node nothing leads to. A region whose first node's id is close to a missing
 * branch target ("cap-mesure" for "cap-measure") is that typo's consequence: it is folded into
 * the missing target's finding. Any other region is one warning at its first node, covering the
 * nodes behind it.
 */
function unreachable(
  tree: Tree,
  all: Adjacency,
  reach: Uint8Array,
  duplicate: Uint8Array,
  missing: readonly MissingTarget[],
  add: Add,
): void {
  const nodes = tree.nodes;
  const N = nodes.length;
  const indegree = new Int32Array(N);
  for (let k = 0; k < all.adj.length; k++) indegree[all.adj[k]!]!++;
  // Region owners: a breadth-first walk from each first node claims what it reaches first.
  const owner = new Int32Array(N).fill(-1);
  const regions: { root: number; members: number[] }[] = [];
  const claim = (root: number) => {
    const members = [root];
    owner[root] = root;
    for (let q = 0; q < members.length; q++) {
      const v = members[q]!;
      for (let k = all.off[v]!; k < all.off[v + 1]!; k++) {
        const w = all.adj[k]!;
        if (reach[w] || duplicate[w] || owner[w] !== -1) continue;
        owner[w] = root;
        members.push(w);
      }
    }
    regions.push({ root, members });
  };
  for (let i = 0; i < N; i++) if (!reach[i] && !duplicate[i] && indegree[i] === 0) claim(i);
  // Loops nothing leads into have no such first node: start them at their first node in the file.
  for (let i = 0; i < N; i++) if (!reach[i] && !duplicate[i] && owner[i] === -1) claim(i);

  const folded = new Map<MissingTarget, { root: number; members: number[] }[]>();
  const pairs = missing.length * regions.length;
  for (const r of regions) {
    const id = nodes[r.root]!.id;
    let best: MissingTarget | undefined;
    let bestDistance = Infinity;
    if (pairs <= 20_000) {
      for (const m of missing) {
        const d = editDistance(m.target, id, Math.max(2, Math.floor(id.length / 3)));
        if (d < bestDistance) {
          best = m;
          bestDistance = d;
        }
      }
    }
    if (best) {
      const list = folded.get(best) ?? [];
      list.push(r);
      folded.set(best, list);
      continue;
    }
    const n = nodes[r.root]!;
    const behind = r.members.length - 1;
    const f: Finding = {
      severity: "warning",
      code: "unreachable",
      nodeId: n.id,
      nodeIndex: r.root,
      message:
        behind === 0
          ? `${describeNode(n)} can't be reached from the start: link to it from another step or delete it.`
          : `${describeNode(n)} can't be reached from the start, nor can the ${count(behind, "step")} after it: link to it from another step or delete them.`,
    };
    if (behind > 0) f.covers = r.members.slice(1).map((j) => nodes[j]!.id);
    add(f);
  }
  for (const [m, rs] of folded) {
    const ids = rs.flatMap((r) => r.members).map((j) => nodes[j]!.id);
    const first = nodes[rs[0]!.root]!.id;
    const rest = ids.length - 1;
    m.finding.message =
      m.finding.message.replace(/\.$/, "") +
      ` — did you mean ‘${first}’? Until it is fixed, ‘${first}’${rest > 0 ? ` and the ${count(rest, "step")} after it` : ""} can't be reached.`;
    m.finding.covers = ids;
  }
}

function count(n: number, word: string): string {
  return `${n.toLocaleString("en-US")} ${word}${n === 1 ? "" : "s"}`;
}

/** Edit distance (insertions, deletions, substitutions, adjacent swaps), or Infinity when above `max`. */
export function editDistance(a: string, b: string, max: number): number {
  if (Math.abs(a.length - b.length) > max) return Infinity;
  let prev2 = new Array<number>(b.length + 1).fill(0);
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const cur = new Array<number>(b.length + 1);
    cur[0] = i;
    let rowMin = i;
    for (let j = 1; j <= b.length; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let d = Math.min(prev[j]! + 1, cur[j - 1]! + 1, prev[j - 1]! + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) d = Math.min(d, prev2[j - 2]! + 1);
      cur[j] = d;
      if (d < rowMin) rowMin = d;
    }
    if (rowMin > max) return Infinity;
    prev2 = prev;
    prev = cur;
  }
  return prev[b.length]! <= max ? prev[b.length]! : Infinity;
}
