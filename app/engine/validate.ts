// Validation: the gate before a tree can be published. Findings are written for a lead tech.
// Three jobs, one module each under ./validation: the per-node checks (checks.ts), the graph
// checks on one shared depth-first search (graph.ts on walk.ts), and the data-flow of formula
// variables (dataflow.ts). Everything is linear in the size of the tree; the data-flow check
// costs the sum of each variable's live region, which is linear too when variables are used near
// where they are recorded.
import type { Finding, Tree } from "./types";
import { TreeSchema } from "./schema";
import type { Add } from "./validation/shared";
import { checkNodes } from "./validation/checks";
import { checkGraph } from "./validation/graph";
import { checkDataFlow } from "./validation/dataflow";

export interface ValidationResult {
  findings: Finding[];
  errors: number;
  warnings: number;
  ok: boolean;
}

/** Validate a tree. Returns findings in node order, tree-level findings first. */
export function validateTree(tree: Tree): ValidationResult {
  const findings: Finding[] = [];
  const add: Add = (f) => {
    findings.push(f as Finding);
  };
  const nodes = checkNodes(tree, add);
  if (nodes.start !== undefined) {
    const reached = checkGraph(tree, nodes.duplicate, nodes.start, nodes.edges, nodes.missing, add);
    checkDataFlow(tree, nodes.start, reached, nodes.edges, nodes.definers, add);
  }

  findings.sort((a, b) => (a.nodeIndex ?? -1) - (b.nodeIndex ?? -1));
  let errors = 0;
  for (const f of findings) if (f.severity === "error") errors++;
  return { findings, errors, warnings: findings.length - errors, ok: errors === 0 };
}

/** Shorthand: the error findings only. */
export function errorsOf(findings: Finding[]): Finding[] {
  return findings.filter((f) => f.severity === "error");
}

/**
 * Validate data of unknown shape (a request body, a DB row): first the zod schema, then the
 * tree checks. Shape problems come back as findings with code "shape".
 */
export function validateTreeData(data: unknown): { tree: Tree | null; result: ValidationResult } {
  const parsed = TreeSchema.safeParse(data);
  if (!parsed.success) {
    const findings: Finding[] = parsed.error.issues.map((i) => {
      const f: Finding = { severity: "error", code: "shape", message: `${i.path.map(String).join(".") || "tree"}: ${i.message}` };
      if (i.path[0] === "nodes" && typeof i.path[1] === "number") {
        f.nodeIndex = i.path[1];
        const id = (data as { nodes?: { id?: unknown }[] }).nodes?.[i.path[1]]?.id;
        if (typeof id === "string") f.nodeId = id;
      }
      return f;
    });
    return { tree: null, result: { findings, errors: findings.length, warnings: 0, ok: false } };
  }
  const tree = parsed.data as Tree;
  return { tree, result: validateTree(tree) };
}
