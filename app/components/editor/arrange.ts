// Auto-arrange: a top-to-bottom layered layout of the draft with dagre. Re-check loops are left
// out of the ranking so they don't pull a node above the one it came from.
import dagre from "@dagrejs/dagre";
import { nodeBranches } from "~/engine/graph";
import type { Tree } from "~/engine/types";
import type { Layout } from "./draft";
import { NODE_HEIGHT, NODE_WIDTH } from "./layout";

export function arrange(tree: Tree): Layout {
  const g = new dagre.graphlib.Graph();
  g.setGraph({ rankdir: "TB", nodesep: 40, ranksep: 70, marginx: 20, marginy: 20 });
  g.setDefaultEdgeLabel(() => ({}));
  const ids = new Set(tree.nodes.map((n) => n.id));
  for (const n of tree.nodes) g.setNode(n.id, { width: NODE_WIDTH, height: NODE_HEIGHT });
  for (const n of tree.nodes) {
    for (const { branch } of nodeBranches(n)) {
      if (!ids.has(branch.to) || branch.recheck || branch.to === n.id) continue;
      g.setEdge(n.id, branch.to);
    }
  }
  dagre.layout(g);
  const out: Layout = {};
  for (const n of tree.nodes) {
    const p = g.node(n.id) as { x: number; y: number } | undefined;
    // dagre gives centres; the canvas places nodes by their top-left corner.
    if (p) out[n.id] = { x: Math.round(p.x - NODE_WIDTH / 2), y: Math.round(p.y - NODE_HEIGHT / 2) };
  }
  return out;
}

/** The layout with every node placed: saved positions kept, the rest arranged. */
export function completeLayout(tree: Tree, layout: Layout): Layout {
  if (tree.nodes.every((n) => layout[n.id])) return layout;
  const auto = arrange(tree);
  const out: Layout = {};
  for (const n of tree.nodes) out[n.id] = layout[n.id] ?? auto[n.id] ?? { x: 0, y: 0 };
  return out;
}
