// Hand the run to a lead, or abandon it: both need a reason in a few words.
import { useState } from "react";
import { Labelled } from "~/components/Field";
import { PanelButtons } from "./PanelButtons";
import type { RunHandle } from "./useRun";

export function ReasonPanel({
  run,
  kind,
  preset,
  onClose,
}: {
  run: RunHandle;
  kind: "escalate" | "abandon";
  preset: string;
  onClose: () => void;
}) {
  const [reason, setReason] = useState(preset);
  const [error, setError] = useState<string | null>(null);
  const words =
    kind === "escalate"
      ? { title: "Ask a lead to take over", label: "What should the lead look at?", go: "Send to a lead" }
      : { title: "Abandon this run", label: "Why is the run stopping here?", go: "Abandon the run" };
  return (
    <form
      className="card space-y-3 border-2 border-ink"
      onSubmit={(e) => {
        e.preventDefault();
        if (reason.trim().length < 3) return setError("Give a reason in a few words.");
        void run.setStatus({ action: kind, reason: reason.trim() }).then(onClose, () => undefined);
      }}
    >
      <h2 className="text-xl font-bold">{words.title}</h2>
      <Labelled label={words.label} error={error}>
        {(control) => (
          <textarea
            {...control}
            value={reason}
            onChange={(e) => (setReason(e.target.value), setError(null))}
            rows={3}
            className="field-input py-2"
            autoFocus
          />
        )}
      </Labelled>
      <PanelButtons go={words.go} danger={kind === "abandon"} disabled={run.statusPending} onCancel={onClose} />
    </form>
  );
}
