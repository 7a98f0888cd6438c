// The editor's draft state and every change the canvas, the outline and the node forms can make
// to it, as one pure reducer: both views edit the same draft through the same actions.
import { nodeBranches } from "~/engine/graph";
import type { Answer, Branch, NodeKind, Tree, TreeNode, VerdictKind } from "~/engine/types";
import { defaultTitle, newNode } from "./kinds";
import { placeNew } from "./layout";

export type Layout = Record<string, { x: number; y: number }>;

export type DraftState = {
  tree: Tree;
  layout: Layout;
  selected: string | null;
  /** Counts every change to tree or layout; autosave compares it with what was saved. */
  change: number;
};

/** Where a new node gets attached: a branch key of an existing node ("next", "low", "answer:yes"). */
export type Link = { from: string; key: string; label?: string };

export type DraftAction =
  | { type: "select"; id: string | null }
  | { type: "tree-fields"; fields: Partial<Pick<Tree, "title" | "category" | "symptom" | "equipment" | "description" | "start">> }
  | { type: "add-node"; kind: NodeKind; link?: Link; at?: { x: number; y: number }; select?: boolean }
  | { type: "update-node"; node: TreeNode }
  | { type: "rename-node"; from: string; to: string }
  | { type: "delete-node"; id: string }
  | { type: "set-branch"; from: string; key: string; to: string | null; recheck?: Branch["recheck"] | null }
  | { type: "add-answer"; from: string; label: string; to: string }
  | { type: "move"; positions: Layout }
  | { type: "replace"; tree: Tree; layout: Layout };

export function initDraft(tree: Tree, layout: Layout): DraftState {
  return { tree, layout, selected: null, change: 0 };
}

/** "Check fan capacitor" → "check-fan-capacitor", made unique among `taken`. */
export function uniqueId(base: string, taken: Iterable<string>): string {
  const used = new Set(taken);
  const slug =
    base
      .toLowerCase()
      .normalize("NFKD")
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-+|-+$/g, "")
      .slice(0, 40)
      .replace(/-+$/, "") || "node";
  if (!used.has(slug)) return slug;
  for (let i = 2; ; i++) if (!used.has(`${slug}-${i}`)) return `${slug}-${i}`;
}

/** The title a new node of `kind` gets: the kind's default, numbered when the draft already has it ("New root cause 2"). */
export function newTitle(tree: Tree, kind: NodeKind): string {
  const base = defaultTitle(kind);
  const used = new Set(tree.nodes.map((n) => n.title));
  if (!used.has(base)) return base;
  for (let i = 2; ; i++) if (!used.has(`${base} ${i}`)) return `${base} ${i}`;
}

function uniqueVariable(tree: Tree): string {
  const used = new Set(tree.nodes.flatMap((n) => ("variable" in n && n.variable ? [n.variable] : [])));
  if (!used.has("rated_value")) return "rated_value";
  for (let i = 2; ; i++) if (!used.has(`rated_value_${i}`)) return `rated_value_${i}`;
}

/** A copy of `node` with its branch `key` pointing at `to` (null removes it). Answers need a target, so null drops the answer. */
export function withBranch(node: TreeNode, key: string, to: string | null, recheck?: Branch["recheck"] | null): TreeNode {
  const make = (old?: Branch): Branch | undefined => {
    if (to === null) return undefined;
    const b: Branch = { to };
    const r = recheck === undefined ? old?.recheck : (recheck ?? undefined);
    if (r) b.recheck = r;
    return b;
  };
  switch (node.kind) {
    case "question": {
      if (!key.startsWith("answer:")) return node;
      const label = key.slice(7);
      const answers: Answer[] = [];
      for (const a of node.answers) {
        if (a.label !== label) answers.push(a);
        else {
          const b = make(a);
          if (b) answers.push({ label, ...b });
        }
      }
      return { ...node, answers };
    }
    case "measurement": {
      const k = key as VerdictKind;
      if (!["low", "within", "high", "marginal"].includes(k)) return node;
      const branches = { ...node.branches };
      const b = make(branches[k]);
      if (b) branches[k] = b;
      else delete branches[k];
      return { ...node, branches };
    }
    case "step":
    case "caution":
    case "nameplate": {
      if (key !== "next") return node;
      const { next, ...rest } = node;
      const b = make(next);
      return (b ? { ...rest, next: b } : rest) as TreeNode;
    }
    default:
      return node;
  }
}

function mapBranches(node: TreeNode, f: (b: Branch) => Branch): TreeNode {
  let out = node;
  for (const { key, branch } of nodeBranches(node)) {
    const nb = f(branch);
    if (nb !== branch) out = withBranch(out, key, nb.to, nb.recheck ?? null);
  }
  return out;
}

function replaceNode(tree: Tree, id: string, node: TreeNode): Tree {
  return { ...tree, nodes: tree.nodes.map((n) => (n.id === id ? node : n)) };
}

function changed(state: DraftState, tree: Tree, layout = state.layout, selected = state.selected): DraftState {
  return { tree, layout, selected, change: state.change + 1 };
}

export function draftReducer(state: DraftState, action: DraftAction): DraftState {
  const { tree } = state;
  switch (action.type) {
    case "select":
      return { ...state, selected: action.id };
    case "tree-fields": {
      const next = { ...tree, ...action.fields } as Tree;
      for (const k of ["equipment", "description"] as const) if (!next[k]) delete next[k];
      return changed(state, next);
    }
    case "add-node": {
      const id = uniqueId(
        `${action.kind === "measurement" ? "measure" : action.kind}`,
        tree.nodes.map((n) => n.id),
      );
      const node = newNode(action.kind, id, uniqueVariable(tree), newTitle(tree, action.kind));
      let nodes = [...tree.nodes, node];
      if (action.link) {
        const { from, key, label } = action.link;
        nodes = nodes.map((n) => {
          if (n.id !== from) return n;
          if (n.kind === "question" && label !== undefined) return { ...n, answers: [...n.answers, { label, to: id }] };
          return withBranch(n, key, id);
        });
      }
      const hasStart = tree.nodes.some((n) => n.id === tree.start);
      const next: Tree = { ...tree, nodes, start: hasStart ? tree.start : id };
      const parent = action.link ? tree.nodes.find((n) => n.id === action.link!.from) : undefined;
      const siblings = parent ? nodeBranches(parent).map(({ branch }) => branch.to) : [];
      const layout = { ...state.layout, [id]: action.at ?? placeNew(state.layout, action.link?.from, siblings) };
      return changed(state, next, layout, action.select === false ? state.selected : id);
    }
    case "update-node": {
      const old = tree.nodes.find((n) => n.id === action.node.id);
      if (!old) return state;
      return changed(state, replaceNode(tree, old.id, action.node));
    }
    case "rename-node": {
      const { from, to } = action;
      if (from === to || tree.nodes.some((n) => n.id === to)) return state;
      const retarget = (b: Branch): Branch => {
        if (b.to !== from && b.recheck?.onExceed !== from) return b;
        const nb: Branch = { to: b.to === from ? to : b.to };
        if (b.recheck) nb.recheck = { ...b.recheck, ...(b.recheck.onExceed === from ? { onExceed: to } : {}) };
        return nb;
      };
      const nodes = tree.nodes.map((n) => mapBranches(n.id === from ? { ...n, id: to } : n, retarget));
      const layout = { ...state.layout };
      if (layout[from]) {
        layout[to] = layout[from]!;
        delete layout[from];
      }
      return changed(
        state,
        { ...tree, nodes, start: tree.start === from ? to : tree.start },
        layout,
        state.selected === from ? to : state.selected,
      );
    }
    case "delete-node": {
      const { id } = action;
      // Branches into the deleted node go too; an answer keeps its label and its now-missing
      // target, so the checks list it and the author can send it somewhere else.
      const nodes = tree.nodes
        .filter((n) => n.id !== id)
        .map((n) => {
          let out = n;
          for (const { key, branch } of nodeBranches(n)) {
            if (branch.to === id && n.kind !== "question") out = withBranch(out, key, null);
            else if (branch.recheck?.onExceed === id) out = withBranch(out, key, branch.to, { max: branch.recheck.max });
          }
          return out;
        });
      const layout = { ...state.layout };
      delete layout[id];
      const start = tree.start === id && nodes[0] ? nodes[0].id : tree.start;
      return changed(state, { ...tree, nodes, start }, layout, state.selected === id ? null : state.selected);
    }
    case "set-branch": {
      const from = tree.nodes.find((n) => n.id === action.from);
      if (!from) return state;
      return changed(state, replaceNode(tree, from.id, withBranch(from, action.key, action.to, action.recheck)));
    }
    case "add-answer": {
      const from = tree.nodes.find((n) => n.id === action.from);
      if (!from || from.kind !== "question" || from.answers.some((a) => a.label === action.label)) return state;
      return changed(state, replaceNode(tree, from.id, { ...from, answers: [...from.answers, { label: action.label, to: action.to }] }));
    }
    case "move":
      return changed(state, tree, { ...state.layout, ...action.positions });
    case "replace":
      return {
        tree: action.tree,
        layout: action.layout,
        selected: action.tree.nodes.some((n) => n.id === state.selected) ? state.selected : null,
        change: state.change + 1,
      };
  }
}
