// Publish: held back with the reason beside it until the saved draft passes its checks; a dialog
// asks for the change note and posts to the route's action.
import { useEffect, useRef } from "react";
import { Form, useNavigation } from "react-router";
import { TextAreaField } from "~/components/FormFields";
import type { Finding, Tree } from "~/engine/types";
import { inEditorWords } from "./finding-words";

export type PublishError = { message: string; findings?: Finding[] };

export function PublishButton({
  blocked,
  nextNumber,
  revision,
  error,
  tree,
}: {
  blocked: string | null;
  nextNumber: number;
  revision: number;
  error?: PublishError;
  tree: Tree;
}) {
  const dialog = useRef<HTMLDialogElement>(null);
  const busy = useNavigation().state !== "idle";
  useEffect(() => {
    if (error && !dialog.current?.open) dialog.current?.showModal();
  }, [error]);
  return (
    <div className="flex flex-col items-end gap-1">
      <button
        type="button"
        className="btn-primary min-h-11"
        disabled={blocked !== null}
        aria-describedby="publish-blocked"
        onClick={() => dialog.current?.showModal()}
      >
        Publish…
      </button>
      <p id="publish-blocked" className="max-w-64 text-right text-sm text-ink-soft">
        {blocked ?? `Ready to publish as version ${nextNumber}.`}
      </p>
      <dialog
        ref={dialog}
        aria-labelledby="publish-heading"
        className="m-auto w-[min(34rem,92vw)] rounded-xl border border-rule p-0 backdrop:bg-ink/40"
      >
        <Form method="post" className="space-y-3 p-4">
          <h2 id="publish-heading" className="text-xl font-bold">
            Publish version {nextNumber}
          </h2>
          <p>Once published, this version never changes. Technicians start new runs on it; later edits go into a new draft.</p>
          <input type="hidden" name="intent" value="publish" />
          <input type="hidden" name="revision" value={revision} />
          <TextAreaField label="What changed, and why" name="changeNote" required maxLength={500} className="[&_textarea]:text-base" />
          {error && (
            <div role="alert" className="rounded-lg bg-out-soft p-3 text-out">
              <p className="font-semibold">{error.message}</p>
              {error.findings && (
                <ul className="list-disc pl-5">
                  {error.findings.map((f, i) => (
                    <li key={i}>{inEditorWords(f, tree)}</li>
                  ))}
                </ul>
              )}
            </div>
          )}
          <div className="flex flex-wrap gap-2">
            <button className="btn-primary" disabled={busy || blocked !== null}>
              Publish version {nextNumber}
            </button>
            <button type="button" className="btn-quiet" onClick={() => dialog.current?.close()}>
              Not yet
            </button>
          </div>
        </Form>
      </dialog>
    </div>
  );
}
