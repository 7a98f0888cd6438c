// The editor's top bar: back to the tree page, the draft's title and save state, and Publish.
import { Link } from "react-router";
import type { Tree } from "~/engine/types";
import { PublishButton, type PublishError } from "./PublishButton";
import { statusText, type Autosave } from "./useAutosave";

type Props = {
  treeId: string;
  tree: Tree;
  nextNumber: number;
  basedOn: number | null;
  save: Autosave;
  blocked: string | null;
  publishError?: PublishError;
};

export function EditorHeader({ treeId, tree, nextNumber, basedOn, save, blocked, publishError }: Props) {
  const bad = save.status === "conflict" || save.status === "gone";
  return (
    <header className="flex flex-wrap items-start gap-x-4 gap-y-1 border-b border-rule bg-card px-3 py-2 lg:items-center">
      <Link to={`/trees/${treeId}`} className="min-h-11 py-2 font-semibold lg:order-first">
        ← Tree page
      </Link>
      <div className="order-last min-w-0 basis-full lg:order-none lg:basis-auto lg:flex-1">
        <h1 className="text-lg font-bold leading-tight lg:truncate">{tree.title}</h1>
        <p className="text-sm text-ink-soft">
          Draft of version {nextNumber}
          {basedOn !== null && <> · started from version {basedOn}</>} ·{" "}
          <span role="status" aria-live="polite" className={bad ? "font-semibold text-out" : ""}>
            {statusText(save.status, save.unsaved)}
          </span>
        </p>
      </div>
      <div className="ml-auto">
        <PublishButton blocked={blocked} nextNumber={nextNumber} revision={save.savedRevision} error={publishError} tree={tree} />
      </div>
    </header>
  );
}
