// The branches of a node, uniformly: which key leads where.
import type { Branch, TreeNode } from "./types";

export interface NodeBranch {
  /** "next", "low" | "within" | "high" | "marginal", or "answer:<label>". */
  key: string;
  branch: Branch;
}

/** Branches in a stable order: answers as listed; verdicts low, within, high, marginal; next. */
export function nodeBranches(node: TreeNode): NodeBranch[] {
  switch (node.kind) {
    case "question":
      return node.answers.map((a) => ({ key: `answer:${a.label}`, branch: a }));
    case "measurement": {
      const out: NodeBranch[] = [];
      for (const k of ["low", "within", "high", "marginal"] as const) {
        const b = node.branches[k];
        if (b) out.push({ key: k, branch: b });
      }
      return out;
    }
    case "step":
    case "caution":
    case "nameplate":
      return node.next ? [{ key: "next", branch: node.next }] : [];
    case "outcome":
    case "escalate":
      return [];
  }
}

/** How a branch key reads in a message: ‘yes’, ‘low’, ‘next’. */
export function branchName(key: string): string {
  return key.startsWith("answer:") ? key.slice(7) : key;
}

export function isTerminal(node: TreeNode): boolean {
  return node.kind === "outcome" || node.kind === "escalate";
}

/** "Step ‘Check fan rotation’" — how messages name a node. */
export function describeNode(node: Pick<TreeNode, "kind" | "title" | "id">): string {
  const kind = KIND_WORD[node.kind];
  return `${kind} ‘${node.title || node.id}’`;
}

const KIND_WORD: Record<TreeNode["kind"], string> = {
  question: "Question",
  measurement: "Measurement",
  step: "Step",
  caution: "Caution",
  nameplate: "Nameplate input",
  outcome: "Outcome",
  escalate: "Escalation",
};
