// The outline view's rows: the draft as an indented list, walked from the first node. A node
// reached a second time is a short reference to where it is written out; branches still to be
// connected show as open rows; nodes nothing leads to are listed after the tree.
import { branchName, nodeBranches } from "~/engine/graph";
import { possibleVerdicts } from "~/engine/limits";
import type { Tree, TreeNode } from "~/engine/types";

export type OutlineRow = {
  key: string;
  /** 1 for top-level rows (aria-level). */
  depth: number;
  parent: string | null;
  /** The branch that leads here: an answer's label, a verdict, "next"; null at the top. */
  via: string | null;
  /** The branch key on the parent node ("answer:yes", "low", "next"). */
  viaKey: string | null;
  /** node: written out here; ref: written out elsewhere; missing: no node has that id; open: a branch still to connect. */
  type: "node" | "ref" | "missing" | "open";
  /** The node shown (node/ref), the missing id, or for open rows the node whose branch it is. */
  nodeId: string;
  loop: boolean;
  children: number;
  /** Top-level rows after the tree itself: not reachable from the first node. */
  detached: boolean;
};

function openSlots(n: TreeNode): { key: string; label: string }[] {
  switch (n.kind) {
    case "question":
      return n.answers.length < 2 ? [{ key: "answer:", label: "another answer" }] : [];
    case "measurement":
      return possibleVerdicts(n.limits, n.acceptance === "guarded")
        .filter((v) => !n.branches[v])
        .map((v) => ({ key: v, label: v }));
    case "step":
    case "caution":
    case "nameplate":
      return n.next ? [] : [{ key: "next", label: "next" }];
    default:
      return [];
  }
}

export function outlineRows(tree: Tree): OutlineRow[] {
  const byId = new Map(tree.nodes.map((n) => [n.id, n]));
  const placed = new Set<string>();
  const rows: OutlineRow[] = [];

  function visit(id: string, depth: number, parent: OutlineRow | null, via: string | null, viaKey: string | null, loop: boolean, key: string, detached: boolean) {
    const node = byId.get(id);
    const base = { key, depth, parent: parent?.key ?? null, via, viaKey, nodeId: id, loop, children: 0, detached };
    if (parent) parent.children++;
    if (!node) {
      rows.push({ ...base, type: "missing" });
      return;
    }
    if (placed.has(id)) {
      rows.push({ ...base, type: "ref" });
      return;
    }
    placed.add(id);
    const row: OutlineRow = { ...base, type: "node" };
    rows.push(row);
    for (const { key: bkey, branch } of nodeBranches(node)) {
      visit(branch.to, depth + 1, row, branchName(bkey), bkey, Boolean(branch.recheck), `${key}/${bkey}`, detached);
    }
    for (const slot of openSlots(node)) {
      row.children++;
      rows.push({ key: `${key}/open:${slot.key}`, depth: depth + 1, parent: key, via: slot.label, viaKey: slot.key, type: "open", nodeId: id, loop: false, children: 0, detached });
    }
  }

  if (byId.has(tree.start)) visit(tree.start, 1, null, null, null, false, "start", false);
  for (const n of tree.nodes) if (!placed.has(n.id)) visit(n.id, 1, null, null, null, false, `detached:${n.id}`, true);
  return rows;
}

/** Rows left visible when the rows in `collapsed` hide their descendants. */
export function visibleRows(rows: OutlineRow[], collapsed: ReadonlySet<string>): OutlineRow[] {
  const hidden = new Set<string>();
  const out: OutlineRow[] = [];
  for (const r of rows) {
    if (r.parent && (hidden.has(r.parent) || collapsed.has(r.parent))) {
      hidden.add(r.key);
      continue;
    }
    out.push(r);
  }
  return out;
}
