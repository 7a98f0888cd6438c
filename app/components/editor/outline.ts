// The outline view's rows: the draft as an indented list, walked from the first node. A node
// reached a second time is a short reference to where it is written out; branches still to be
// connected show as open rows; nodes nothing leads to are listed after the tree.
import { branchName, nodeBranches } from "~/engine/graph";
import { possibleVerdicts } from "~/engine/limits";
import type { Branch, Tree, TreeNode } from "~/engine/types";

/** Verdict branches sort in this order; answers and "next" keep theirs (a stable sort). */
const VERDICT_ORDER = new Map(["low", "within", "high", "marginal"].map((v, i) => [v, i]));

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

  function visit(
    id: string,
    depth: number,
    parent: OutlineRow | null,
    via: string | null,
    viaKey: string | null,
    loop: boolean,
    key: string,
    detached: boolean,
  ) {
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
    // Branches and the slots still open, in the order the technician meets them (low, within, high…).
    const slots = openSlots(node);
    const order = (k: string) => (VERDICT_ORDER.has(k) ? VERDICT_ORDER.get(k)! : 100);
    const items = [
      ...nodeBranches(node).map((b) => ({ k: b.key, branch: b.branch as Branch | undefined, label: branchName(b.key) })),
      ...slots.map((sl) => ({ k: sl.key, branch: undefined, label: sl.label })),
    ].sort((a, z) => order(a.k) - order(z.k));
    for (const it of items) {
      if (it.branch) visit(it.branch.to, depth + 1, row, it.label, it.k, Boolean(it.branch.recheck), `${key}/${it.k}`, detached);
      else {
        row.children++;
        rows.push({
          key: `${key}/open:${it.k}`,
          depth: depth + 1,
          parent: key,
          via: it.label,
          viaKey: it.k,
          type: "open",
          nodeId: id,
          loop: false,
          children: 0,
          detached,
        });
      }
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
