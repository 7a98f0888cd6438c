// The engine's findings on the saved draft, errors first, each linking to its node.
import type { Finding, Tree } from "~/engine/types";
import { distinctLabels } from "~/lib/node-labels";
import { inEditorWords } from "./finding-words";

type Props = {
  findings: Finding[];
  tree: Tree;
  /** Why the findings describe an older save than what is on screen, if they do. */
  stale: string | null;
  onGo: (nodeId: string) => void;
};

export function Findings({ findings, tree, stale, onGo }: Props) {
  const sorted = [...findings].sort((a, b) => (a.severity === b.severity ? 0 : a.severity === "error" ? -1 : 1));
  const errors = findings.filter((f) => f.severity === "error").length;
  const warnings = findings.length - errors;
  // Two nodes titled alike (itself a warning) are told apart by their ids.
  const titles = distinctLabels(tree.nodes, (n) => n.title);
  return (
    <section aria-labelledby="checks-heading" className="space-y-2">
      <h2 id="checks-heading" className="text-lg font-bold">
        Checks
      </h2>
      <p aria-live="polite" className="text-base">
        {stale ? (
          <span className="text-ink-soft">{stale}</span>
        ) : errors === 0 && warnings === 0 ? (
          <span className="font-semibold text-within">No problems found.</span>
        ) : (
          <>
            <span className={errors ? "font-semibold text-out" : "text-within"}>
              {errors} error{errors === 1 ? "" : "s"}
            </span>
            {", "}
            <span className={warnings ? "font-semibold text-marginal" : ""}>
              {warnings} warning{warnings === 1 ? "" : "s"}
            </span>
          </>
        )}
      </p>
      {sorted.length > 0 && (
        <ul className="space-y-2">
          {sorted.map((f, i) => {
            const node = f.nodeId ? tree.nodes.find((n) => n.id === f.nodeId) : undefined;
            return (
              <li
                key={`${f.code}-${f.nodeId ?? ""}-${i}`}
                className={`rounded-lg border-l-4 bg-card p-2 ${f.severity === "error" ? "border-out" : "border-marginal"}`}
              >
                <p className="text-base">
                  <strong className={f.severity === "error" ? "text-out" : "text-marginal"}>
                    {f.severity === "error" ? "Error" : "Warning"}:
                  </strong>{" "}
                  {inEditorWords(f, tree)}
                </p>
                {node && (
                  <button
                    type="button"
                    className="mt-1 inline-flex min-h-11 items-center text-left text-base font-semibold text-copper-dark underline underline-offset-2"
                    onClick={() => onGo(node.id)}
                  >
                    Go to ‘{titles.get(node.id)}’
                  </button>
                )}
              </li>
            );
          })}
        </ul>
      )}
    </section>
  );
}
