// The engine's checks, said in the editor's words. The engine writes its findings for the tree
// file and its command line ("add ‘- low → …’"); someone on the canvas or in the node form needs
// "connect the Low branch to a node". This layer rewrites the findings whose advice is file syntax
// (from their code, node and field) and leaves the rest as the engine wrote them. The engine's
// own messages stay as they are for the CLI and the import page.
import type { Finding, Tree, TreeNode } from "~/engine/types";
import { KIND_LABEL } from "./kinds";

const VERDICTS = ["low", "within", "high", "marginal"] as const;

/** How the editor names a branch: the Low branch, the answer ‘yes’, the next step. */
export function branchWords(key: string): string {
  if (key.startsWith("answer:")) return `the answer ‘${key.slice(7)}’`;
  if (key === "next") return "its next step";
  if ((VERDICTS as readonly string[]).includes(key)) return `the ${key.charAt(0).toUpperCase()}${key.slice(1)} branch`;
  return `‘${key}’`;
}

function nodeWords(n: TreeNode | undefined, id?: string): string {
  return n ? `${KIND_LABEL[n.kind].toLowerCase()} ‘${n.title || n.id}’` : `‘${id ?? "?"}’`;
}

const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

export function inEditorWords(f: Finding, tree: Tree): string {
  const byId = new Map(tree.nodes.map((n) => [n.id, n]));
  const node = f.nodeId ? byId.get(f.nodeId) : undefined;
  const name = nodeWords(node, f.nodeId);
  switch (f.code) {
    case "missing-branch": {
      // The verdict is named in the engine's advice (‘- low → …’) or its wording (on a low reading).
      const v =
        /‘- (low|within|high|marginal) →/.exec(f.message)?.[1] ??
        /on an? (low|high|marginal) reading/.exec(f.message)?.[1] ??
        (/within limits/.test(f.message) ? "within" : null);
      if (!v) break;
      return `Connect ${branchWords(v)} of the ${name} to a node: a ${v === "within" ? "reading within limits" : `${v} reading`} has nowhere to go yet.`;
    }
    case "unused-branch":
      if (f.field === "marginal")
        return `The Marginal branch of the ${name} is never taken: only guarded acceptance gives marginal readings. Set “Judging readings near a limit” to guarded and give the meter's accuracy, or disconnect the branch.`;
      if (f.field) return `${cap(branchWords(f.field))} of the ${name} is never taken with these limits: disconnect it.`;
      break;
    case "dead-end":
      if (node?.kind === "measurement") return `The ${name} leads nowhere: connect its Low, Within and High branches to nodes.`;
      if (node?.kind === "question") return `The ${name} leads nowhere: add answers, each leading to a node.`;
      if (node) return `The ${name} leads nowhere: choose its next node, or make it an outcome.`;
      break;
    case "unknown-target":
      if (f.field && /re-check limit is reached/.test(f.message))
        return `When the re-check limit of ${branchWords(f.field)} in the ${name} is reached, it goes to a node that no longer exists: choose another under “Then go to”.`;
      if (f.field) return `${cap(branchWords(f.field))} of the ${name} leads to a node that no longer exists: choose where it leads.`;
      break;
    case "cycle": {
      const ids = /loop with no limit: (.+?)\. /.exec(f.message)?.[1]?.split(" → ");
      if (!ids) break;
      const titles = ids.map((id) => `‘${byId.get(id)?.title ?? id}’`).join(" → ");
      // The engine points at the branch that closes the loop (its node and field).
      const closing = f.field ? `${cap(branchWords(f.field))} of the ${name}` : "the branch that goes back";
      return `These nodes go round in a loop with no limit: ${titles}. On ${closing}, tick “Goes back to check again” and set how many times, or connect it elsewhere.`;
    }
    case "recheck-not-a-loop": {
      const back = /but ‘(.+)’ never leads back/.exec(f.message)?.[1];
      if (!f.field || back === undefined) break;
      return `${cap(branchWords(f.field))} of the ${name} is marked “Goes back to check again”, but ${nodeWords(byId.get(back), back)} never leads back to it: untick it.`;
    }
    case "unreachable":
      return `Nothing leads to the ${name} from the first node: connect a branch to it, or delete it.`;
    case "empty-tree":
      return "The tree has no nodes yet: add the first one under “Add a node”.";
    case "start-missing":
      return "The tree's first node is missing: choose one under Tree details.";
    case "shape": {
      // A path into the tree ("nodes.3.title: …"): name the node instead.
      const m = /^nodes\.(\d+)(?:\.([\w.]+))?: (.*)$/.exec(f.message);
      const n = m ? tree.nodes[Number(m[1])] : undefined;
      if (m && n) return `${cap(nodeWords(n))}${m[2] ? ` (${m[2].replace(/\./g, " ")})` : ""}: ${m[3]}`;
      break;
    }
  }
  return f.message;
}
