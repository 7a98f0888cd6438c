// What changed between two versions of a tree: nodes added, removed and changed, with the changed
// fields written out (limits "191 V to 218 V", branches "low → x").
// Pure (no DB), so the diff page, the API and the editor's conflict view share it.
import { branchName, describeNode, nodeBranches } from "../engine/graph";
import { formatBranch, formatLimits, formatMeter } from "../engine/markdown/syntax";
import { computeLimits } from "../engine/limits";
import type { MeasurementNode, Tree, TreeNode } from "../engine/types";

export type FieldChange = { field: string; label: string; before: string | null; after: string | null };
export type NodeRef = { id: string; kind: TreeNode["kind"]; title: string; name: string };
export type NodeChange = NodeRef & { fields: FieldChange[] };
export type TreeDiff = {
  tree: FieldChange[];
  added: NodeRef[];
  removed: NodeRef[];
  changed: NodeChange[];
  /** Nodes whose place in the list moved but whose content is the same are not changes. */
  unchanged: number;
  same: boolean;
};

const TREE_FIELDS: [keyof Tree, string][] = [
  ["title", "Title"],
  ["category", "Equipment category"],
  ["symptom", "Symptom"],
  ["equipment", "Equipment covered"],
  ["start", "First step"],
  ["description", "Introduction"],
];

/** Limits as the technician reads them ("1.41–1.59 µF (1.5 µF ± 6 %)"); as in the tree file when they need the run's values. */
export function limitsText(n: MeasurementNode): string {
  const c = computeLimits(n);
  if (!c.ok) return formatLimits(n.limits);
  return c.limits.fixed ? c.limits.text : `${c.limits.text} (${c.limits.derivation})`;
}

/** A node as labelled text fields, in a stable order. Absent fields are left out. */
export function nodeFields(n: TreeNode): [field: string, label: string, value: string][] {
  const f: [string, string, string][] = [
    ["kind", "Kind", n.kind],
    ["title", n.kind === "outcome" ? "Root cause" : "Title", n.title],
  ];
  if (n.body !== undefined) f.push(["body", "Instructions", n.body]);
  switch (n.kind) {
    case "question":
      // One field, so a change of order (the order the technician sees) counts too.
      if (n.answers.length) f.push(["answers", "Answers", n.answers.map((a) => formatBranch(a.label, a)).join("\n")]);
      break;
    case "measurement":
      f.push(["quantity", "Quantity", n.quantity], ["unit", "Unit", n.unit], ["limits", "Limits", limitsText(n)]);
      if (n.meter) f.push(["meter", "Meter accuracy", formatMeter(n.meter)]);
      if (n.acceptance) f.push(["acceptance", "Acceptance", n.acceptance]);
      if (n.variable !== undefined) f.push(["variable", "Records as", n.variable]);
      break;
    case "nameplate":
      f.push(["variable", "Records as", n.variable], ["quantity", "Quantity", n.quantity], ["unit", "Unit", n.unit]);
      break;
    case "caution":
      if (n.hazard) f.push(["hazard", "Hazard", n.hazard]);
      break;
    case "outcome":
      f.push(["remedy", "Remedy", n.remedy]);
      if (n.parts.length) f.push(["parts", "Parts", n.parts.join("\n")]);
      break;
    case "escalate":
      f.push(["reason", "Reason", n.reason]);
      break;
    default:
      break;
  }
  for (const { key, branch } of nodeBranches(n)) {
    if (n.kind === "question") break;
    f.push([`branch:${key}`, key === "next" ? "Next" : `On ${key}`, formatBranch(branchName(key), branch)]);
  }
  return f;
}

function ref(n: TreeNode): NodeRef {
  return { id: n.id, kind: n.kind, title: n.title, name: describeNode(n) };
}

function changes(before: [string, string, string][], after: [string, string, string][]): FieldChange[] {
  const a = new Map(before.map(([k, l, v]) => [k, { l, v }]));
  const b = new Map(after.map(([k, l, v]) => [k, { l, v }]));
  const keys = [...new Set([...a.keys(), ...b.keys()])];
  const out: FieldChange[] = [];
  for (const k of keys) {
    const x = a.get(k);
    const y = b.get(k);
    if (x?.v === y?.v) continue;
    out.push({ field: k, label: (y ?? x)!.l, before: x?.v ?? null, after: y?.v ?? null });
  }
  return out;
}

/** The difference from `a` (older) to `b` (newer). Nodes are matched by id. */
export function diffTrees(a: Tree, b: Tree): TreeDiff {
  const tree: FieldChange[] = [];
  for (const [k, label] of TREE_FIELDS) {
    const x = a[k] === undefined ? null : String(a[k]);
    const y = b[k] === undefined ? null : String(b[k]);
    if (x !== y) tree.push({ field: k, label, before: x, after: y });
  }
  const inA = new Map(a.nodes.map((n) => [n.id, n]));
  const inB = new Map(b.nodes.map((n) => [n.id, n]));
  const added = b.nodes.filter((n) => !inA.has(n.id)).map(ref);
  const removed = a.nodes.filter((n) => !inB.has(n.id)).map(ref);
  const changed: NodeChange[] = [];
  let unchanged = 0;
  for (const n of b.nodes) {
    const old = inA.get(n.id);
    if (!old) continue;
    const fields = changes(nodeFields(old), nodeFields(n));
    if (fields.length) changed.push({ ...ref(n), fields });
    else unchanged++;
  }
  return { tree, added, removed, changed, unchanged, same: !tree.length && !added.length && !removed.length && !changed.length };
}
