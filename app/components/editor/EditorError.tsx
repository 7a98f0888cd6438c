// The editor's error screen (the route's error boundary): says what happened in plain words, and
// when this browser kept changes that were not saved, says so, offers them as a tree file, and
// opening the editor again offers to restore them.
import { useEffect, useState } from "react";
import { serializeTree } from "~/engine/markdown/serialize";
import { readKept, unsavedKey } from "~/lib/kept";
import { downloadText } from "./download";
import type { KeptDraft } from "./useKeptDraft";

export function EditorError({
  treeId,
  title,
  detail,
  again,
}: {
  treeId: string | undefined;
  title: string;
  detail: string;
  again: boolean;
}) {
  // Read after hydration: the server never sees this browser's storage.
  const [kept, setKept] = useState<KeptDraft | null | undefined>(undefined);
  useEffect(() => setKept(treeId ? readKept<KeptDraft>(unsavedKey(treeId)) : null), [treeId]);
  return (
    <main className="mx-auto max-w-xl space-y-4 p-6">
      <h1 className="text-2xl font-bold">{title}</h1>
      <p className="text-lg">{detail}</p>
      {kept && (
        <section aria-labelledby="kept-here" className="space-y-2 rounded-xl border-2 border-copper bg-copper-soft p-3">
          <h2 id="kept-here" className="text-lg font-bold">
            Your unsaved changes are kept in this browser
          </h2>
          <p>
            “{kept.tree.title}”, as it was at {new Date(kept.at).toLocaleTimeString([], { hour: "2-digit", minute: "2-digit" })}.{" "}
            {again
              ? "Open the editor again to restore them, or download them as a tree file."
              : "Download them as a tree file to keep them."}
          </p>
          <button
            type="button"
            className="btn-quiet"
            onClick={() =>
              downloadText(
                `${
                  kept.tree.title
                    .toLowerCase()
                    .replace(/[^a-z0-9]+/g, "-")
                    .slice(0, 60) || "tree"
                }-unsaved.md`,
                serializeTree(kept.tree),
              )
            }
          >
            Download my changes (.md)
          </button>
        </section>
      )}
      <p className="flex flex-wrap gap-3">
        {again && (
          <button type="button" className="btn-primary" onClick={() => window.location.reload()}>
            Open the editor again
          </button>
        )}
        <a className="btn-quiet" href={treeId ? `/trees/${treeId}` : "/trees"}>
          Back to the tree
        </a>
      </p>
    </main>
  );
}
