// Where a branch leads: an existing node, a new node of any kind (made and linked once the author
// confirms), or nowhere yet; and, for a branch that goes back to measure again, its re-check limit.
import { useRef, useState } from "react";
import type { Answer, Branch, NodeKind, Tree, TreeNode } from "~/engine/types";
import { Field } from "~/components/Field";
import { SelectField } from "~/components/FormFields";
import { announce } from "~/components/Announcer";
import { distinctLabels } from "~/lib/node-labels";
import { newTitle, type DraftAction } from "./draft";
import { Check } from "./fields";
import { branchWords } from "./finding-words";
import { KIND_LABEL, PALETTE_KINDS } from "./kinds";

const NONE = "";
const NEW = "new:";

/** Every node of the draft as a choice: kind and title, and the id too where two read the same. */
export function nodeOptionLabels(nodes: readonly TreeNode[]): Map<string, string> {
  return distinctLabels(nodes, (n) => `${KIND_LABEL[n.kind]}: ${n.title}`);
}

type Pick = { to: string } | { kind: NodeKind } | null;

type TargetProps = {
  label: string;
  tree: Tree;
  value: string | undefined;
  /** A "New …" option chosen but not made yet: the select keeps showing it. */
  newKind?: NodeKind | null;
  /** Offer "not connected" (absent for answers, which always lead somewhere). */
  allowNone?: boolean;
  /** Offer "a new …" for each kind. */
  offerNew?: boolean;
  onPick: (pick: Pick) => void;
  hint?: string;
};

/** A select of every node in the draft, plus "a new …" for each kind. Choosing never makes a node by itself. */
export function TargetSelect({ label, tree, value, newKind = null, allowNone = true, offerNew = true, onPick, hint }: TargetProps) {
  const missing = value !== undefined && !tree.nodes.some((n) => n.id === value);
  const labels = nodeOptionLabels(tree.nodes);
  return (
    <SelectField
      label={label}
      name={label}
      hint={hint}
      value={newKind ? `${NEW}${newKind}` : (value ?? NONE)}
      onChange={(e) => {
        const v = e.target.value;
        if (v === NONE) onPick(null);
        else if (v.startsWith(NEW)) onPick({ kind: v.slice(NEW.length) as NodeKind });
        else onPick({ to: v });
      }}
    >
      {(allowNone || value === undefined) && <option value={NONE}>{allowNone ? "Not connected yet" : "Choose where it leads…"}</option>}
      {missing && <option value={value}>Missing node ‘{value}’ — choose another</option>}
      <optgroup label="Nodes in this tree">
        {tree.nodes.map((n) => (
          <option key={n.id} value={n.id}>
            {labels.get(n.id)}
          </option>
        ))}
      </optgroup>
      {offerNew && (
        <optgroup label="Make a new node">
          {PALETTE_KINDS.map((k) => (
            <option key={k} value={`${NEW}${k}`}>
              New {KIND_LABEL[k].toLowerCase()}
            </option>
          ))}
        </optgroup>
      )}
    </SelectField>
  );
}

/** Focus the select inside `wrap` once the screen has settled. */
const focusSelect = (wrap: HTMLElement | null) => requestAnimationFrame(() => wrap?.querySelector("select")?.focus());

type BranchTargetProps = {
  label: string;
  tree: Tree;
  node: TreeNode;
  branchKey: string;
  value: string | undefined;
  hint?: string;
  dispatch: (a: DraftAction) => void;
};

/**
 * Where one branch leads. An existing node is linked at once; a "New …" option only asks, and
 * the node is made when the author confirms (an arrow key passing over the option makes nothing).
 */
function BranchTarget({ label, tree, node, branchKey, value, hint, dispatch }: BranchTargetProps) {
  const [pending, setPending] = useState<NodeKind | null>(null);
  const wrap = useRef<HTMLDivElement>(null);
  const make = () => {
    if (!pending) return;
    const title = newTitle(tree, pending);
    dispatch({ type: "add-node", kind: pending, link: { from: node.id, key: branchKey }, select: false });
    announce(`Made a new ${KIND_LABEL[pending].toLowerCase()}, ‘${title}’, and connected ${branchWords(branchKey)} to it.`);
    setPending(null);
    focusSelect(wrap.current);
  };
  return (
    <div ref={wrap} className="space-y-2">
      <TargetSelect
        label={label}
        tree={tree}
        value={value}
        newKind={pending}
        allowNone={node.kind !== "question"}
        hint={hint}
        onPick={(pick) => {
          setPending(pick && "kind" in pick ? pick.kind : null);
          if (pick === null) dispatch({ type: "set-branch", from: node.id, key: branchKey, to: null });
          else if ("to" in pick) dispatch({ type: "set-branch", from: node.id, key: branchKey, to: pick.to });
        }}
      />
      {pending && (
        <div
          role="group"
          aria-label={`Make a new ${KIND_LABEL[pending].toLowerCase()}`}
          className="flex flex-wrap items-center gap-2 rounded-lg bg-copper-soft p-2"
        >
          <p className="basis-full text-base">
            A new {KIND_LABEL[pending].toLowerCase()} will be made, and {branchWords(branchKey)} connected to it.
          </p>
          <button type="button" className="btn-primary min-h-11 px-3 text-base" onClick={make}>
            Make it and connect
          </button>
          <button
            type="button"
            className="btn-quiet min-h-11 px-3 text-base"
            onClick={() => {
              setPending(null);
              focusSelect(wrap.current);
            }}
          >
            Cancel
          </button>
        </div>
      )}
    </div>
  );
}

type BranchProps = {
  tree: Tree;
  node: TreeNode;
  branchKey: string;
  label: string;
  branch: Branch | undefined;
  dispatch: (a: DraftAction) => void;
  hint?: string;
};

/** One branch of a node: where it goes and, optionally, its re-check loop. */
export function BranchField({ tree, node, branchKey, label, branch, dispatch, hint }: BranchProps) {
  return (
    <div className="space-y-2 rounded-lg border border-rule p-3" data-branch={branchKey}>
      <BranchTarget label={label} tree={tree} node={node} branchKey={branchKey} value={branch?.to} hint={hint} dispatch={dispatch} />
      {branch && <RecheckFields tree={tree} node={node} branchKey={branchKey} branch={branch} dispatch={dispatch} />}
    </div>
  );
}

function RecheckFields({
  tree,
  node,
  branchKey,
  branch,
  dispatch,
}: {
  tree: Tree;
  node: TreeNode;
  branchKey: string;
  branch: Branch;
  dispatch: (a: DraftAction) => void;
}) {
  const [maxRaw, setMaxRaw] = useState(String(branch.recheck?.max ?? 2));
  const set = (recheck: Branch["recheck"] | null) =>
    dispatch({ type: "set-branch", from: node.id, key: branchKey, to: branch.to, recheck });
  const r = branch.recheck;
  const maxError = r && !/^[1-9]\d?$/.test(maxRaw.trim()) ? "Enter how many times, from 1 to 99." : null;
  return (
    <div className="space-y-2">
      <Check
        label="Goes back to check again"
        hint="A re-check loop: taken at most a set number of times in one run."
        checked={Boolean(r)}
        onChange={(on) => set(on ? { max: Number(maxRaw) || 2 } : null)}
      />
      {r && (
        <div className="grid gap-2 sm:grid-cols-2">
          <Field
            label="At most (times)"
            name="recheck-max"
            inputMode="numeric"
            value={maxRaw}
            error={maxError ?? undefined}
            onChange={(e) => {
              setMaxRaw(e.target.value);
              if (/^[1-9]\d?$/.test(e.target.value.trim())) set({ ...r, max: Number(e.target.value) });
            }}
          />
          <TargetSelect
            label="Then go to"
            tree={tree}
            value={r.onExceed}
            offerNew={false}
            onPick={(pick) => {
              if (pick === null) set({ max: r.max });
              else if ("to" in pick) set({ ...r, onExceed: pick.to });
            }}
          />
        </div>
      )}
    </div>
  );
}

/** A question's answers: label, where each leads, order; and a row to add one. */
export function AnswersField({
  tree,
  node,
  dispatch,
}: {
  tree: Tree;
  node: Extract<TreeNode, { kind: "question" }>;
  dispatch: (a: DraftAction) => void;
}) {
  const [label, setLabel] = useState("");
  const [target, setTarget] = useState<{ to: string } | { kind: NodeKind } | null>(null);
  const [error, setError] = useState<string | null>(null);
  const addRow = useRef<HTMLDivElement>(null);
  // Stable keys for the rows, so a label being typed keeps its input (and focus).
  const keys = useRef<string[]>([]);
  const fresh = () => Math.random().toString(36).slice(2);
  if (keys.current.length !== node.answers.length) keys.current = node.answers.map(fresh);
  const update = (answers: Answer[], nextKeys = keys.current) => {
    keys.current = nextKeys;
    dispatch({ type: "update-node", node: { ...node, answers } });
  };
  const move = (i: number, by: number) => {
    const a = [...node.answers];
    const k = [...keys.current];
    const [x] = a.splice(i, 1);
    const [kx] = k.splice(i, 1);
    a.splice(i + by, 0, x!);
    k.splice(i + by, 0, kx!);
    update(a, k);
  };
  const add = () => {
    const l = label.trim();
    if (!l) return setError("Type the answer the technician will tap.");
    if (/[\r\n]/.test(l) || l.length > 500) return setError("Keep the answer to one short line.");
    if (node.answers.some((a) => a.label === l)) return setError(`There is already an answer ‘${l}’.`);
    if (!target) return setError("Choose where this answer leads.");
    keys.current = [...keys.current, fresh()];
    if ("to" in target) {
      dispatch({ type: "add-answer", from: node.id, label: l, to: target.to });
      announce(`Added the answer ‘${l}’, leading to ‘${tree.nodes.find((n) => n.id === target.to)?.title ?? target.to}’.`);
    } else {
      const title = newTitle(tree, target.kind);
      dispatch({ type: "add-node", kind: target.kind, link: { from: node.id, key: `answer:${l}`, label: l }, select: false });
      announce(`Added the answer ‘${l}’, leading to a new ${KIND_LABEL[target.kind].toLowerCase()}, ‘${title}’.`);
    }
    setLabel("");
    setTarget(null);
    setError(null);
    // The next answer starts where this one did.
    requestAnimationFrame(() => addRow.current?.querySelector("input")?.focus());
  };
  return (
    <fieldset className="space-y-3">
      <legend className="text-lg font-bold">Answers</legend>
      {node.answers.length === 0 && <p className="text-ink-soft">No answers yet. A question needs two or more.</p>}
      <ol className="space-y-3">
        {node.answers.map((a, i) => (
          <li key={keys.current[i]} className="space-y-2 rounded-lg border border-rule p-3" data-branch={`answer:${a.label}`}>
            <AnswerLabel node={node} index={i} onRename={(l) => update(node.answers.map((x, j) => (j === i ? { ...x, label: l } : x)))} />
            <BranchTarget
              label={`‘${a.label}’ leads to`}
              tree={tree}
              node={node}
              branchKey={`answer:${a.label}`}
              value={a.to}
              dispatch={dispatch}
            />
            <div className="flex flex-wrap gap-2">
              <button
                type="button"
                className="btn-quiet min-h-11 px-3 text-base"
                disabled={i === 0}
                onClick={() => move(i, -1)}
                aria-label={`Move ‘${a.label}’ up`}
              >
                Up
              </button>
              <button
                type="button"
                className="btn-quiet min-h-11 px-3 text-base"
                disabled={i === node.answers.length - 1}
                onClick={() => move(i, 1)}
                aria-label={`Move ‘${a.label}’ down`}
              >
                Down
              </button>
              <button
                type="button"
                className="btn-quiet min-h-11 px-3 text-base text-out"
                onClick={() =>
                  update(
                    node.answers.filter((_, j) => j !== i),
                    keys.current.filter((_, j) => j !== i),
                  )
                }
                aria-label={`Remove the answer ‘${a.label}’`}
              >
                Remove
              </button>
            </div>
          </li>
        ))}
      </ol>
      <div ref={addRow} className="space-y-2 rounded-lg border border-dashed border-ink-soft p-3" data-branch="answer:">
        <p className="font-semibold">Add an answer</p>
        <Field
          label="Answer text"
          name="answer-text"
          value={label}
          placeholder="e.g. yes, one slow, both stopped"
          onChange={(e) => setLabel(e.target.value)}
          onKeyDown={(e) => {
            if (e.key === "Enter") {
              e.preventDefault();
              add();
            }
          }}
        />
        <TargetSelect
          label="The new answer leads to"
          tree={tree}
          value={target && "to" in target ? target.to : undefined}
          newKind={target && "kind" in target ? target.kind : null}
          allowNone={false}
          onPick={setTarget}
        />
        {target && "kind" in target && (
          <p className="text-sm text-ink-soft">A new {KIND_LABEL[target.kind].toLowerCase()} will be made for it.</p>
        )}
        {error && (
          <p className="field-error" role="alert">
            {error}
          </p>
        )}
        <button type="button" className="btn-quiet" onClick={add}>
          Add answer
        </button>
      </div>
    </fieldset>
  );
}

function AnswerLabel({
  node,
  index,
  onRename,
}: {
  node: Extract<TreeNode, { kind: "question" }>;
  index: number;
  onRename: (label: string) => void;
}) {
  const [raw, setRaw] = useState(node.answers[index]!.label);
  const [error, setError] = useState<string | null>(null);
  return (
    <Field
      label={`Answer ${index + 1}`}
      name={`answer-${index + 1}`}
      value={raw}
      error={error ?? undefined}
      onChange={(e) => {
        setRaw(e.target.value);
        const l = e.target.value.trim();
        const err = !l
          ? "An answer can't be empty."
          : node.answers.some((a, j) => j !== index && a.label === l)
            ? `There is already an answer ‘${l}’.`
            : null;
        setError(err);
        if (!err) onRename(l);
      }}
    />
  );
}
