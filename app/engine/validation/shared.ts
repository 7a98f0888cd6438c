// What the validation modules pass between them: how a finding is added, the tree's edges as
// parallel arrays, and how a branch slot is named in a finding.
import type { Branch, Finding, TreeNode } from "../types";

export type Add = (f: Omit<Finding, "nodeIndex"> & { nodeIndex?: number }) => void;

/**
 * The branches that lead somewhere, as parallel arrays (no object per edge): from node, to node,
 * whether the branch is a marked re-check loop, and the slot it sits in on its node (a branch's
 * key is recovered from (from, slot) only when a message needs it).
 */
export interface Edges {
  edgeFrom: number[];
  edgeTo: number[];
  edgeLoop: boolean[];
  edgeSlot: number[];
}

export const VERDICT_SLOTS = ["low", "within", "high", "marginal"] as const;

/** How many branch slots a node has: answers, four verdicts, or one `next`. */
export function slotCount(n: TreeNode): number {
  return n.kind === "question" ? n.answers.length : n.kind === "measurement" ? 4 : n.kind === "outcome" || n.kind === "escalate" ? 0 : 1;
}

/** The branch in a slot, if any. */
export function branchAt(n: TreeNode, slot: number): Branch | undefined {
  if (n.kind === "question") return n.answers[slot];
  if (n.kind === "measurement") return n.branches[VERDICT_SLOTS[slot]!];
  return n.kind === "step" || n.kind === "caution" || n.kind === "nameplate" ? n.next : undefined;
}

/** The Finding.field key of a node's branch slot: "answer:<label>", "low"…, "next". */
export function slotKey(n: TreeNode, slot: number): string {
  if (n.kind === "question") return `answer:${n.answers[slot]?.label ?? ""}`;
  if (n.kind === "measurement") return VERDICT_SLOTS[slot]!;
  return "next";
}
