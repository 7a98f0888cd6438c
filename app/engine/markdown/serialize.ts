// Canonical form of a tree file. See ./parse for the format.
import type { Tree, TreeNode } from "../types";
import { unitQuantity } from "../units";
import { formatBranch, formatLimits, formatMeter } from "./syntax";

export const KIND_HEADING: Record<TreeNode["kind"], string> = {
  question: "Question",
  measurement: "Measurement",
  step: "Step",
  caution: "Caution",
  nameplate: "Nameplate",
  outcome: "Outcome",
  escalate: "Escalate",
};

const VERDICT_ORDER = ["low", "within", "high", "marginal"] as const;

/** The quantity line is left out when the unit already says it. */
function quantityLine(f: string[], quantity: string, unit: string): void {
  if (unitQuantity(unit) !== quantity) f.push(`- quantity: ${quantity}`);
}

function nodeFields(n: TreeNode, f: string[]): void {
  switch (n.kind) {
    case "question":
      for (const a of n.answers) f.push("- " + formatBranch(a.label, a));
      break;
    case "measurement":
      quantityLine(f, n.quantity, n.unit);
      f.push(`- unit: ${n.unit}`);
      f.push(`- limits: ${formatLimits(n.limits)}`);
      if (n.meter) f.push(`- meter: ${formatMeter(n.meter)}`);
      if (n.acceptance) f.push(`- acceptance: ${n.acceptance}`);
      if (n.variable !== undefined) f.push(`- variable: ${n.variable}`);
      for (const k of VERDICT_ORDER) {
        const b = n.branches[k];
        if (b) f.push("- " + formatBranch(k, b));
      }
      break;
    case "nameplate":
      f.push(`- variable: ${n.variable}`);
      quantityLine(f, n.quantity, n.unit);
      f.push(`- unit: ${n.unit}`);
      if (n.next) f.push("- " + formatBranch("next", n.next));
      break;
    case "caution":
      if (n.hazard) f.push(`- hazard: ${n.hazard}`);
      if (n.next) f.push("- " + formatBranch("next", n.next));
      break;
    case "step":
      if (n.next) f.push("- " + formatBranch("next", n.next));
      break;
    case "outcome":
      f.push(`- remedy: ${n.remedy}`);
      for (const p of n.parts) f.push(`- part: ${p}`);
      break;
    case "escalate":
      f.push(`- reason: ${n.reason}`);
      break;
  }
}

/** The canonical Markdown form of a tree. parseTree(serializeTree(t)) gives t back. */
export function serializeTree(tree: Tree): string {
  const out: string[] = [];
  out.push(`# ${tree.title}`);
  out.push(`- category: ${tree.category}`);
  out.push(`- symptom: ${tree.symptom}`);
  if (tree.equipment !== undefined) out.push(`- equipment: ${tree.equipment}`);
  out.push(`- start: ${tree.start}`);
  out.push("");
  if (tree.description !== undefined) out.push(tree.description, "");
  for (const n of tree.nodes) {
    out.push(`## ${KIND_HEADING[n.kind]} \`${n.id}\`: ${n.title}`);
    nodeFields(n, out);
    out.push("");
    if (n.body !== undefined) out.push(n.body, "");
  }
  while (out.length && out[out.length - 1] === "") out.pop();
  return out.join("\n") + "\n";
}
