// The node panel: a form per kind of node. Text is checked with the engine's zod schemas as it is
// typed; branches are picked from the draft's nodes (or make a new one); a measurement shows a
// live preview of the verdict a sample reading would get.
import { useEffect, useId, useRef, useState } from "react";
import { possibleVerdicts } from "~/engine/limits";
import { NodeIdSchema, normaliseBody } from "~/engine/schema";
import { QUANTITY_INFO, resolveUnit } from "~/engine/units";
import {
  HAZARDS,
  QUANTITIES,
  VERDICTS,
  type Finding,
  type Hazard,
  type Quantity,
  type Tree,
  type TreeNode,
  type VerdictKind,
} from "~/engine/types";
import { Field } from "~/components/Field";
import { useAsk } from "~/components/useAsk";
import { AnswersField, BranchField } from "./BranchFields";
import { BodyField, type UploadImage } from "./BodyField";
import type { DraftAction } from "./draft";
import { nodeCommitter, SelectField, sentence, TextField } from "./fields";
import { inEditorWords } from "./finding-words";
import { KIND_LABEL, KIND_MARK } from "./kinds";
import { LimitPreview } from "./LimitPreview";
import { LimitsFields } from "./LimitsFields";

const TITLE_LABEL: Record<TreeNode["kind"], string> = {
  question: "Question to ask",
  measurement: "What to measure",
  step: "What to do",
  caution: "The caution",
  nameplate: "What to read off the nameplate",
  outcome: "Root cause",
  escalate: "Why it ends here",
};

const VERDICT_HINT: Record<VerdictKind, string> = {
  low: "Below the lowest good reading.",
  within: "Inside the limits.",
  high: "Above the highest good reading.",
  marginal: "Inside, but within the meter's accuracy of a limit (guarded acceptance).",
};

export const QUANTITY_OPTIONS = QUANTITIES.map((q) => ({
  value: q,
  label: `${q.charAt(0).toUpperCase()}${q.slice(1)} (${QUANTITY_INFO[q].units.join(", ")})`,
}));
const HAZARD_OPTIONS = [{ value: "", label: "Not given" }, ...HAZARDS.map((h) => ({ value: h, label: h.replace("-", " ") }))];

/** `node` with an optional text field set, or removed when blank. */
function withOptional<N extends TreeNode>(node: N, key: string, value: string | undefined): N {
  const out = { ...node } as Record<string, unknown>;
  if (value === undefined || value === "") delete out[key];
  else out[key] = value;
  return out as N;
}

type Props = {
  node: TreeNode;
  tree: Tree;
  dispatch: (a: DraftAction) => void;
  findings: Finding[];
  upload?: UploadImage;
  /** A branch to bring into view and focus when the form opens ("low", "next", "answer:"), or "title". */
  focusField?: string;
  /** After a confirmed delete: the editor moves focus to where the work goes on. */
  onDeleted?: (node: TreeNode) => void;
};

export function NodeForm({ node, tree, dispatch, findings, upload, focusField, onDeleted }: Props) {
  const tryNode = nodeCommitter((n) => dispatch({ type: "update-node", node: n }));
  const isStart = tree.start === node.id;
  const headingId = useId();
  const formRef = useRef<HTMLFormElement>(null);
  useEffect(() => {
    if (!focusField) return;
    const sel = focusField === "title" ? `[data-field="title"] input` : `[data-branch="${CSS.escape(focusField)}"] :is(select, input)`;
    const el = formRef.current?.querySelector<HTMLElement>(sel);
    el?.scrollIntoView({ block: "center" });
    el?.focus();
    // A new node's default title is selected, so typing replaces it.
    if (focusField === "title" && el instanceof HTMLInputElement) el.select();
  }, [focusField]);
  return (
    <form ref={formRef} aria-labelledby={headingId} className="space-y-4" onSubmit={(e) => e.preventDefault()} noValidate>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id={headingId} className="text-xl font-bold">
          <span aria-hidden="true" className="mr-2 inline-flex size-8 items-center justify-center rounded-md border border-ink text-base">
            {KIND_MARK[node.kind]}
          </span>
          {KIND_LABEL[node.kind]}
        </h2>
        {isStart ? (
          <span className="rounded-md bg-copper-soft px-2 py-1 text-sm font-semibold text-copper-dark">First node of the tree</span>
        ) : (
          <button
            type="button"
            className="btn-quiet min-h-11 px-3 text-base"
            onClick={() => dispatch({ type: "tree-fields", fields: { start: node.id } })}
          >
            Make this the first node
          </button>
        )}
      </div>
      {findings.length > 0 && (
        <ul aria-label="Checks on this node" className="space-y-1">
          {findings.map((f, i) => (
            <li
              key={i}
              className={`rounded-md px-3 py-2 text-base ${f.severity === "error" ? "bg-out-soft text-out" : "bg-marginal-soft text-marginal"}`}
            >
              <strong>{f.severity === "error" ? "Error: " : "Warning: "}</strong>
              {inEditorWords(f, tree)}
            </li>
          ))}
        </ul>
      )}
      <div data-field="title">
        <TextField label={TITLE_LABEL[node.kind]} initial={node.title} onText={(raw) => tryNode({ ...node, title: raw.trim() })} />
      </div>
      <IdField node={node} tree={tree} dispatch={dispatch} />
      <KindFields node={node} tree={tree} tryNode={tryNode} dispatch={dispatch} />
      <BodyField
        label="Instructions and notes"
        initial={node.body ?? ""}
        upload={upload}
        onText={(raw) => tryNode(withOptional(node, "body", normaliseBody(raw)))}
      />
      <Branches node={node} tree={tree} dispatch={dispatch} />
      <DeleteNode node={node} dispatch={dispatch} onDeleted={onDeleted} />
    </form>
  );
}

function KindFields({
  node,
  tree,
  tryNode,
  dispatch,
}: {
  node: TreeNode;
  tree: Tree;
  tryNode: (n: TreeNode) => string | null;
  dispatch: (a: DraftAction) => void;
}) {
  switch (node.kind) {
    case "question":
      return <AnswersField node={node} tree={tree} dispatch={dispatch} />;
    case "measurement":
    case "nameplate": {
      // A unit of another quantity is replaced by the new quantity's usual one.
      const fits = (quantity: Quantity) => resolveUnit(node.unit, quantity)?.kind === QUANTITY_INFO[quantity].kind;
      const setQuantity = (quantity: Quantity) =>
        tryNode({ ...node, quantity, unit: fits(quantity) ? node.unit : QUANTITY_INFO[quantity].units[0]! } as TreeNode);
      return (
        <>
          <div className="grid gap-3 sm:grid-cols-[1fr_9rem]">
            <SelectField label="Quantity" value={node.quantity} options={QUANTITY_OPTIONS} onChange={setQuantity} />
            <TextField
              key={node.quantity}
              label="Unit"
              initial={node.unit}
              suggestions={QUANTITY_INFO[node.quantity].units}
              onText={(raw) => tryNode({ ...node, unit: raw.trim() })}
            />
          </div>
          {node.kind === "measurement" ? (
            <>
              <LimitsFields node={node} tryNode={tryNode} />
              <LimitPreview node={node} tree={tree} />
              <TextField
                label="Keep the reading as (optional)"
                hint="A name later limits can use in a formula, like supply_volts."
                initial={node.variable ?? ""}
                onText={(raw) => tryNode(withOptional(node, "variable", raw.trim()))}
              />
            </>
          ) : (
            <TextField
              label="Keep the value as"
              hint="The name later limits use in a formula, like rated_uf."
              initial={node.variable}
              onText={(raw) => tryNode({ ...node, variable: raw.trim() })}
            />
          )}
        </>
      );
    }
    case "caution":
      return (
        <SelectField<"" | Hazard>
          label="Hazard"
          value={node.hazard ?? ""}
          options={HAZARD_OPTIONS as { value: "" | Hazard; label: string }[]}
          onChange={(h) => tryNode(withOptional(node, "hazard", h))}
        />
      );
    case "outcome":
      return (
        <>
          <TextField
            label="Remedy"
            hint="What the technician does about it."
            initial={node.remedy}
            onText={(raw) => tryNode({ ...node, remedy: raw.trim() })}
          />
          <TextField
            label="Parts (one per line)"
            initial={node.parts.join("\n")}
            multiline
            rows={3}
            onText={(raw) =>
              tryNode({
                ...node,
                parts: raw
                  .split("\n")
                  .map((p) => p.trim())
                  .filter(Boolean),
              })
            }
          />
        </>
      );
    case "escalate":
      return (
        <TextField label="What the lead needs to know" initial={node.reason} onText={(raw) => tryNode({ ...node, reason: raw.trim() })} />
      );
    default:
      return null;
  }
}

function Branches({ node, tree, dispatch }: { node: TreeNode; tree: Tree; dispatch: (a: DraftAction) => void }) {
  if (node.kind === "measurement") {
    const possible = possibleVerdicts(node.limits, node.acceptance === "guarded");
    const shown = VERDICTS.filter((v) => possible.includes(v) || node.branches[v]);
    return (
      <fieldset className="space-y-3">
        <legend className="text-lg font-bold">Where each verdict leads</legend>
        {shown.map((v) => (
          <BranchField
            key={v}
            tree={tree}
            node={node}
            branchKey={v}
            label={`On a ${v} reading, go to`}
            hint={possible.includes(v) ? VERDICT_HINT[v] : "These limits never give this verdict: disconnect it."}
            branch={node.branches[v]}
            dispatch={dispatch}
          />
        ))}
      </fieldset>
    );
  }
  if (node.kind === "step" || node.kind === "caution" || node.kind === "nameplate") {
    return (
      <fieldset className="space-y-3">
        <legend className="text-lg font-bold">Then</legend>
        <BranchField tree={tree} node={node} branchKey="next" label="Next, go to" branch={node.next} dispatch={dispatch} />
      </fieldset>
    );
  }
  return null;
}

function IdField({ node, tree, dispatch }: { node: TreeNode; tree: Tree; dispatch: (a: DraftAction) => void }) {
  const [raw, setRaw] = useState(node.id);
  const [error, setError] = useState<string | null>(null);
  const rename = () => {
    const next = raw.trim();
    if (next === node.id) return setError(null);
    const r = NodeIdSchema.safeParse(next);
    if (!r.success) return setError(sentence(r.error.issues[0]?.message ?? "That id isn't accepted."));
    if (tree.nodes.some((n) => n.id === next)) return setError(`Another node already has the id ‘${next}’.`);
    setError(null);
    dispatch({ type: "rename-node", from: node.id, to: next });
  };
  return (
    <div className="space-y-2">
      <Field
        label="Node id"
        name="node-id"
        hint="Names this node in the tree file and in run records. Links to it follow a change."
        className="[&_input]:font-mono [&_input]:text-base"
        value={raw}
        error={error ?? undefined}
        onChange={(e) => setRaw(e.target.value)}
        onKeyDown={(e) => {
          if (e.key === "Enter") {
            e.preventDefault();
            rename();
          }
        }}
      />
      <button type="button" className="btn-quiet min-h-11 px-3 text-base" onClick={rename} disabled={raw.trim() === node.id}>
        Change id
      </button>
    </div>
  );
}

/** Delete asks first. Focus follows: onto "Keep it" when asked, back to the button when kept. */
function DeleteNode({
  node,
  dispatch,
  onDeleted,
}: {
  node: TreeNode;
  dispatch: (a: DraftAction) => void;
  onDeleted?: (node: TreeNode) => void;
}) {
  const { asking, setAsking, asker: ask, answer: keep } = useAsk();
  const questionId = useId();
  return (
    <div className="border-t border-rule pt-3">
      {asking ? (
        <div role="group" aria-label="Confirm deleting this node" aria-describedby={questionId} className="space-y-2">
          <p id={questionId}>
            Delete ‘{node.title}’? Branches that lead to it are disconnected; answers that lead to it keep their text and need a new target.
          </p>
          <div className="flex gap-2">
            <button
              type="button"
              className="btn min-h-11 bg-out px-4 text-base text-white"
              onClick={() => {
                dispatch({ type: "delete-node", id: node.id });
                onDeleted?.(node);
              }}
            >
              Delete node
            </button>
            <button ref={keep} type="button" className="btn-quiet min-h-11 px-4 text-base" onClick={() => setAsking(false)}>
              Keep it
            </button>
          </div>
        </div>
      ) : (
        <button ref={ask} type="button" className="btn-quiet min-h-11 px-4 text-base text-out" onClick={() => setAsking(true)}>
          Delete this node…
        </button>
      )}
    </div>
  );
}
