// Where a technician stands in a tree: how many more steps, at fewest and at most, before an answer
// (an outcome or a hand-over). Re-check loops are left out, so the bounds are for a straight walk.
import { nodeBranches } from "~/engine/graph";
import type { Tree, TreeNode } from "~/engine/types";

type ToGo = { min: number; max: number } | null;
/** Answers by tree object and node: a published tree never changes, and the runner asks on every render. */
const known = new WeakMap<Tree, Map<string, ToGo>>();

export function stepsToGo(tree: Tree, from: string): ToGo {
  let forTree = known.get(tree);
  if (!forTree) known.set(tree, (forTree = new Map()));
  if (forTree.has(from)) return forTree.get(from)!;
  const answer = walkToGo(tree, from);
  forTree.set(from, answer);
  return answer;
}

function walkToGo(tree: Tree, from: string): ToGo {
  const byId = new Map<string, TreeNode>(tree.nodes.map((n) => [n.id, n]));
  const memo = new Map<string, { min: number; max: number }>();
  const visiting = new Set<string>();
  const walk = (id: string): { min: number; max: number } | null => {
    const node = byId.get(id);
    if (!node) return null;
    if (node.kind === "outcome" || node.kind === "escalate") return { min: 0, max: 0 };
    const hit = memo.get(id);
    if (hit) return hit;
    if (visiting.has(id)) return null;
    visiting.add(id);
    let min = Infinity;
    let max = -Infinity;
    for (const { branch } of nodeBranches(node)) {
      if (branch.recheck) continue;
      const r = walk(branch.to);
      if (!r) continue;
      min = Math.min(min, r.min + 1);
      max = Math.max(max, r.max + 1);
    }
    visiting.delete(id);
    const out = Number.isFinite(min) ? { min, max } : null;
    if (out) memo.set(id, out);
    return out;
  };
  return walk(from);
}
