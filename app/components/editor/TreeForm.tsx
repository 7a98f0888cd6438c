// The tree's own details: title, equipment category, symptom, equipment covered, introduction and
// first node. Checked with the engine's tree schema before they reach the draft.
import { useId } from "react";
import { normaliseBody } from "~/engine/schema";
import type { Tree } from "~/engine/types";
import { BodyField, type UploadImage } from "./BodyField";
import { nodeOptionLabels } from "./BranchFields";
import type { DraftAction } from "./draft";
import { SelectField, TextField, treeCommitter } from "./fields";
import { CATEGORY_OPTIONS } from "./kinds";

export function TreeForm({ tree, dispatch, upload }: { tree: Tree; dispatch: (a: DraftAction) => void; upload?: UploadImage }) {
  const headingId = useId();
  type Fields = Extract<DraftAction, { type: "tree-fields" }>["fields"];
  const tryFields = (fields: Fields) => {
    const candidate = { ...tree, ...fields } as Tree;
    for (const k of ["equipment", "description"] as const) if (!candidate[k]) delete candidate[k];
    return treeCommitter(() => dispatch({ type: "tree-fields", fields }))(candidate);
  };
  return (
    <form aria-labelledby={headingId} className="space-y-4" onSubmit={(e) => e.preventDefault()} noValidate>
      <h2 id={headingId} className="text-xl font-bold">
        Tree details
      </h2>
      <TextField label="Title" initial={tree.title} onText={(raw) => tryFields({ title: raw.trim() })} />
      <SelectField
        label="Equipment category"
        value={tree.category}
        options={CATEGORY_OPTIONS}
        onChange={(category) => tryFields({ category })}
      />
      <TextField label="Symptom the customer reports" initial={tree.symptom} onText={(raw) => tryFields({ symptom: raw.trim() })} />
      <TextField
        label="Equipment covered (optional)"
        hint="Models or families this tree is for."
        initial={tree.equipment ?? ""}
        onText={(raw) => tryFields({ equipment: raw.trim() })}
      />
      {tree.nodes.length > 0 && (
        <SelectField
          label="First node"
          value={tree.nodes.some((n) => n.id === tree.start) ? tree.start : ""}
          options={[
            ...(tree.nodes.some((n) => n.id === tree.start) ? [] : [{ value: "", label: "Choose the first node…" }]),
            ...[...nodeOptionLabels(tree.nodes)].map(([value, label]) => ({ value, label })),
          ]}
          onChange={(start) => start && tryFields({ start })}
        />
      )}
      <BodyField
        label="Introduction"
        hint="Shown before the first node: when to use this tree, and what it covers."
        initial={tree.description ?? ""}
        upload={upload}
        onText={(raw) => tryFields({ description: normaliseBody(raw) })}
      />
    </form>
  );
}
