// The tree editor: a canvas and an outline of one draft, the node panel, the checks, autosave
// with optimistic concurrency and the publish gate. The canvas (reactflow) is loaded lazily, in
// the browser only; everything else renders on the server too. This file lays the panes out; the
// hooks beside it keep the state (useAutosave, useChecks, useConflict, useSelection).
import { lazy, Suspense, useReducer, useState, type ReactNode } from "react";
import { Announcer } from "~/components/Announcer";
import type { Tree } from "~/engine/types";
import { uploadImage, type Validation } from "./api";
import { draftReducer, initDraft, type Layout } from "./draft";
import { EditorHeader } from "./EditorHeader";
import { Findings } from "./Findings";
import { KeptDraftOffer } from "./KeptDraftOffer";
import { NodeForm } from "./NodeForm";
import { Outline } from "./Outline";
import { Palette } from "./Palette";
import type { PublishError } from "./PublishButton";
import { SaveProblems } from "./SaveProblems";
import { TreeForm } from "./TreeForm";
import { useAutosave } from "./useAutosave";
import { useChecks } from "./useChecks";
import { useConflict } from "./useConflict";
import { useKeptDraft } from "./useKeptDraft";
import { useSelection, type Pane } from "./useSelection";

const Canvas = lazy(() => import("./Canvas"));

export type EditorProps = {
  treeId: string;
  versionId: string;
  revision: number;
  tree: Tree;
  layout: Layout;
  validation: Validation;
  /** The number the draft gets when published. */
  nextNumber: number;
  basedOn: number | null;
  /** The shop's time zone, for the times the editor shows (a second editor's save). */
  timeZone: string;
  publishError?: PublishError;
};

export function Editor(props: EditorProps) {
  const { treeId, versionId } = props;
  const [state, dispatch] = useReducer(draftReducer, undefined, () => initDraft(props.tree, props.layout));
  // Bumped when the draft is replaced wholesale, so the forms start again from the new values.
  const [formEpoch, setFormEpoch] = useState(0);
  const save = useAutosave(treeId, versionId, state, props.revision);
  const { checks, checking, marks, blocked, stale } = useChecks(treeId, state.tree, save, props);
  const conflict = useConflict(treeId, state, dispatch, save, () => setFormEpoch((e) => e + 1));
  const kept = useKeptDraft(treeId, versionId, props.tree, state, save, dispatch, () => setFormEpoch((e) => e + 1));
  const view = useSelection(state.tree, dispatch);
  const { pane, setPane, centerView } = view;
  const selectedNode = state.tree.nodes.find((n) => n.id === state.selected) ?? null;
  const upload = (file: File) => uploadImage(treeId, file);

  const tab = (p: Pane, label: ReactNode) => (
    <button
      type="button"
      role="tab"
      aria-selected={pane === p}
      aria-controls={`pane-${p}`}
      className={`min-h-12 flex-1 rounded-lg px-2 text-base font-semibold ${pane === p ? "bg-copper-soft text-copper-dark" : "text-ink"}`}
      onClick={() => setPane(p)}
    >
      {label}
    </button>
  );
  const showCenter = pane === "outline" || pane === "canvas";
  // Past the canvas's many Tab stops, to the node form (on a phone, its tab).
  const skipCanvas = () => {
    setPane("node");
    requestAnimationFrame(() => document.getElementById("pane-node")?.focus());
  };

  return (
    <div className="flex min-h-dvh flex-col lg:h-dvh">
      <EditorHeader
        treeId={treeId}
        tree={state.tree}
        nextNumber={props.nextNumber}
        basedOn={props.basedOn}
        save={save}
        blocked={blocked}
        publishError={props.publishError}
      />
      <SaveProblems save={save} conflict={conflict} tree={state.tree} timeZone={props.timeZone} />
      <KeptDraftOffer kept={kept} tree={state.tree} />

      <div role="tablist" aria-label="Editor panes" className="flex gap-1 border-b border-rule bg-card px-2 py-1 lg:hidden">
        {tab("outline", "Outline")}
        {tab("node", selectedNode ? "Node" : "Details")}
        {tab("checks", <>Checks{checks.errors > 0 && !checking ? ` (${checks.errors})` : ""}</>)}
        {tab("canvas", "Canvas")}
      </div>

      <main className="grid min-h-0 flex-1 lg:grid-cols-[17rem_minmax(0,1fr)_27rem]">
        <aside
          id="pane-checks"
          className={`${pane === "checks" ? "block" : "hidden"} space-y-6 overflow-y-auto p-3 lg:block lg:border-r lg:border-rule`}
        >
          <Findings findings={checks.findings} tree={state.tree} stale={stale} onGo={(id) => view.open(id)} />
          <div className="hidden lg:block">
            <Palette onAdd={view.add} />
          </div>
        </aside>

        <section
          id={`pane-${centerView}`}
          tabIndex={-1}
          aria-label={centerView === "canvas" ? "Canvas" : "Outline"}
          className={`${showCenter ? "flex" : "hidden"} min-h-0 flex-col outline-none lg:flex`}
        >
          <div className="hidden gap-1 border-b border-rule px-3 py-2 lg:flex" role="group" aria-label="How to show the draft">
            {(["canvas", "outline"] as const).map((v) => (
              <button
                key={v}
                type="button"
                aria-pressed={view.wideView === v}
                className={`min-h-11 rounded-lg px-3 font-semibold ${view.wideView === v ? "bg-copper-soft text-copper-dark" : ""}`}
                onClick={() => view.setWideView(v)}
              >
                {v === "canvas" ? "Canvas" : "Outline"}
              </button>
            ))}
          </div>
          {centerView === "outline" ? (
            <div className="flex-1 space-y-6 overflow-y-auto p-3">
              <Outline tree={state.tree} selected={state.selected} marks={marks} onOpen={view.open} />
              <div className="lg:hidden">
                <Palette onAdd={view.add} />
              </div>
            </div>
          ) : (
            <div className="relative h-[70dvh] min-h-[28rem] lg:h-auto lg:flex-1">
              <SkipCanvas onSkip={skipCanvas} />
              {view.mounted ? (
                <Suspense fallback={<p className="p-4 text-ink-soft">Loading the canvas…</p>}>
                  <Canvas
                    tree={state.tree}
                    layout={state.layout}
                    selected={state.selected}
                    marks={marks}
                    dispatch={view.act}
                    onOpen={(id) => view.open(id)}
                  />
                </Suspense>
              ) : (
                <p className="p-4 text-ink-soft">Loading the canvas…</p>
              )}
            </div>
          )}
        </section>

        <aside
          id="pane-node"
          tabIndex={-1}
          aria-label={selectedNode ? "Node" : "Tree details"}
          className={`${pane === "node" ? "block" : "hidden"} overflow-y-auto border-rule p-3 outline-none lg:block lg:border-l`}
        >
          {selectedNode ? (
            <div className="space-y-3">
              <div className="flex flex-wrap gap-2">
                <button type="button" className="btn-quiet min-h-11 px-3 text-base lg:hidden" onClick={() => setPane("outline")}>
                  ← Outline
                </button>
                <button type="button" className="btn-quiet min-h-11 px-3 text-base" onClick={() => dispatch({ type: "select", id: null })}>
                  Tree details
                </button>
              </div>
              <NodeForm
                key={`${selectedNode.id}:${formEpoch}`}
                node={selectedNode}
                tree={state.tree}
                dispatch={view.act}
                findings={checks.findings.filter((f) => f.nodeId === selectedNode.id)}
                upload={upload}
                focusField={view.focusField}
                onDeleted={view.deleted}
              />
            </div>
          ) : (
            <TreeForm key={formEpoch} tree={state.tree} dispatch={view.act} upload={upload} />
          )}
        </aside>
      </main>
      <Announcer />
    </div>
  );
}

/** A skip link over the canvas, shown when it has keyboard focus. */
function SkipCanvas({ onSkip }: { onSkip: () => void }) {
  return (
    <button
      type="button"
      onClick={onSkip}
      className="sr-only z-20 rounded-lg bg-ink px-4 py-2 font-semibold text-white focus:not-sr-only focus:absolute focus:left-2 focus:top-14"
    >
      Skip the canvas: go to the node form
    </button>
  );
}
