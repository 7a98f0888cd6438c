// Pure mapping between the engine's Tree and its storage rows (nodes and branches as rows, so
// analytics can join runs to nodes). rowsToTree(treeToRows(t)) gives t back; a unit test checks it.
import { nodeBranches } from "../engine/graph";
import type { Branch, Tree, TreeNode } from "../engine/types";

export type VersionFields = Pick<Tree, "title" | "category" | "symptom" | "equipment" | "description" | "start">;
export type NodeRow = {
  nodeKey: string;
  position: number;
  kind: TreeNode["kind"];
  title: string;
  body: string | null;
  data: Record<string, unknown>;
};
export type BranchRow = {
  fromKey: string;
  branchKey: string;
  position: number;
  toKey: string;
  recheckMax: number | null;
  recheckOnExceed: string | null;
};

export function treeToRows(tree: Tree): { version: VersionFields; nodes: NodeRow[]; branches: BranchRow[] } {
  const nodes: NodeRow[] = [];
  const branches: BranchRow[] = [];
  tree.nodes.forEach((node, position) => {
    const { id, kind, title, body, ...rest } = node as TreeNode & Record<string, unknown>;
    const data: Record<string, unknown> = { ...rest };
    delete data.answers;
    delete data.branches;
    delete data.next;
    nodes.push({ nodeKey: id, position, kind, title, body: body ?? null, data });
    nodeBranches(node).forEach(({ key, branch }, i) => {
      branches.push({
        fromKey: id,
        branchKey: key,
        position: i,
        toKey: branch.to,
        recheckMax: branch.recheck?.max ?? null,
        recheckOnExceed: branch.recheck?.onExceed ?? null,
      });
    });
  });
  const version: VersionFields = { title: tree.title, category: tree.category, symptom: tree.symptom, start: tree.start };
  if (tree.equipment !== undefined) version.equipment = tree.equipment;
  if (tree.description !== undefined) version.description = tree.description;
  return { version, nodes, branches };
}

function toBranch(row: BranchRow): Branch {
  const b: Branch = { to: row.toKey };
  if (row.recheckMax !== null) {
    b.recheck = { max: row.recheckMax };
    if (row.recheckOnExceed !== null) b.recheck.onExceed = row.recheckOnExceed;
  }
  return b;
}

export function rowsToTree(version: VersionFields, nodeRows: NodeRow[], branchRows: BranchRow[]): Tree {
  const byFrom = new Map<string, BranchRow[]>();
  for (const b of [...branchRows].sort((a, z) => a.position - z.position)) {
    const list = byFrom.get(b.fromKey) ?? [];
    list.push(b);
    byFrom.set(b.fromKey, list);
  }
  const nodes = [...nodeRows]
    .sort((a, z) => a.position - z.position)
    .map((row): TreeNode => {
      const base: Record<string, unknown> = { id: row.nodeKey, kind: row.kind, title: row.title };
      if (row.body !== null) base.body = row.body;
      Object.assign(base, row.data);
      const out = byFrom.get(row.nodeKey) ?? [];
      switch (row.kind) {
        case "question":
          base.answers = out.filter((b) => b.branchKey.startsWith("answer:")).map((b) => ({ label: b.branchKey.slice(7), ...toBranch(b) }));
          break;
        case "measurement":
          base.branches = Object.fromEntries(out.map((b) => [b.branchKey, toBranch(b)]));
          break;
        case "step":
        case "caution":
        case "nameplate": {
          const next = out.find((b) => b.branchKey === "next");
          if (next) base.next = toBranch(next);
          break;
        }
        default:
          break;
      }
      return base as unknown as TreeNode;
    });
  const tree: Tree = { title: version.title, category: version.category, symptom: version.symptom, start: version.start, nodes };
  if (version.equipment !== undefined && version.equipment !== null) tree.equipment = version.equipment;
  if (version.description !== undefined && version.description !== null) tree.description = version.description;
  return tree;
}
