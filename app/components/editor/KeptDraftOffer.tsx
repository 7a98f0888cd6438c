// Changes this browser kept from an earlier visit that never reached the server: restore or drop.
import { DiffView } from "~/components/DiffView";
import type { Tree } from "~/engine/types";
import { diffTrees } from "~/lib/tree-diff";
import type { KeptDraftHandle } from "./useKeptDraft";

export function KeptDraftOffer({ kept, tree }: { kept: KeptDraftHandle; tree: Tree }) {
  const { offer } = kept;
  if (!offer) return null;
  const at = new Date(offer.at).toLocaleString([], { dateStyle: "medium", timeStyle: "short" });
  return (
    <section role="alert" aria-labelledby="kept-draft-heading" className="space-y-2 border-b-2 border-copper bg-copper-soft px-4 py-3">
      <h2 id="kept-draft-heading" className="text-lg font-bold">
        Changes from {at} were not saved
      </h2>
      <p>This browser kept them when the editor closed. Restore them to carry on (they are saved at once), or throw them away.</p>
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn-primary" onClick={kept.restore}>
          Restore my changes
        </button>
        <button type="button" className="btn-quiet" onClick={kept.discard}>
          Throw them away
        </button>
      </div>
      <details className="rounded-lg bg-card p-3">
        <summary className="cursor-pointer font-semibold">What they change</summary>
        <DiffView diff={diffTrees(tree, offer.tree)} fromLabel="the saved draft" toLabel="your kept changes" />
      </details>
    </section>
  );
}
