// A note on the step on screen.
import { useState } from "react";
import { Labelled } from "~/components/Field";
import type { TreeNode } from "~/engine/types";
import { PanelButtons } from "./PanelButtons";
import type { RunHandle } from "./useRun";

export function NotePanel({ run, node, onClose }: { run: RunHandle; node: TreeNode; onClose: () => void }) {
  const [text, setText] = useState("");
  return (
    <form
      className="card space-y-3"
      onSubmit={(e) => {
        e.preventDefault();
        if (!text.trim()) return;
        run.addNote(node.id, text.trim());
        onClose();
      }}
    >
      <Labelled label={`Note on “${node.title}”`} labelClassName="text-lg">
        {(control) => (
          <textarea {...control} value={text} onChange={(e) => setText(e.target.value)} rows={3} className="field-input py-2" autoFocus />
        )}
      </Labelled>
      <PanelButtons go="Save note" disabled={!text.trim()} onCancel={onClose} />
    </form>
  );
}
