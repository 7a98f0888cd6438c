// The tree editor: a canvas and an outline of one draft, the node panel, the checks, autosave
// with optimistic concurrency and the publish gate. The canvas (reactflow) is loaded lazily, in
// the browser only; everything else renders on the server too.
import { keepPreviousData, useMutation, useQuery } from "@tanstack/react-query";
import { lazy, Suspense, useCallback, useEffect, useMemo, useReducer, useRef, useState, type ReactNode } from "react";
import { Form, Link, useNavigation } from "react-router";
import { DiffView } from "~/components/DiffView";
import { serializeTree } from "~/engine/markdown/serialize";
import type { Finding, NodeKind, Tree } from "~/engine/types";
import { diffTrees } from "~/lib/tree-diff";
import { fetchDraft, fetchValidation, saveDraft, SaveError, uploadImage, type Conflict, type Validation } from "./api";
import { draftReducer, initDraft, type DraftAction, type Layout } from "./draft";
import { Findings } from "./Findings";
import { NodeForm } from "./NodeForm";
import { Outline, type NodeMarks } from "./Outline";
import { Palette } from "./Palette";
import { TreeForm } from "./TreeForm";

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
  publishError?: { message: string; findings?: Finding[] };
};

type Status = "idle" | "saving" | "error" | "conflict" | "gone";
type Pane = "outline" | "canvas" | "node" | "checks";

function download(name: string, text: string) {
  const url = URL.createObjectURL(new Blob([text], { type: "text/markdown;charset=utf-8" }));
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  a.click();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

function time(iso: string) {
  return new Date(iso).toLocaleTimeString([], { hour: "2-digit", minute: "2-digit" });
}

export function Editor(props: EditorProps) {
  const { treeId, versionId } = props;
  const [state, dispatch] = useReducer(draftReducer, undefined, () => initDraft(props.tree, props.layout));
  const stateRef = useRef(state);
  stateRef.current = state;
  const [savedRevision, setSavedRevision] = useState(props.revision);
  const [savedChange, setSavedChange] = useState(0);
  const [status, setStatus] = useState<Status>("idle");
  const [problem, setProblem] = useState<string | null>(null);
  const [conflict, setConflict] = useState<Conflict | null>(null);
  const [formEpoch, setFormEpoch] = useState(0);
  const [pane, setPane] = useState<Pane>("outline");
  const [wideView, setWideView] = useState<"canvas" | "outline">("canvas");
  const [mounted, setMounted] = useState(false);
  // Laptop or phone: on a laptop the three columns show at once; on a phone one pane at a time.
  const [wide, setWide] = useState(false);
  const [focusField, setFocusField] = useState<string | undefined>();

  useEffect(() => {
    setMounted(true);
    const mq = window.matchMedia("(min-width: 1024px)");
    const update = () => setWide(mq.matches);
    update();
    mq.addEventListener("change", update);
    return () => mq.removeEventListener("change", update);
  }, []);

  // --- autosave ---------------------------------------------------------------------------------
  const mutation = useMutation({ mutationFn: (body: Parameters<typeof saveDraft>[1]) => saveDraft(treeId, body) });
  const save = useCallback(
    async (revision: number) => {
      const snap = stateRef.current;
      setStatus("saving");
      try {
        const res = await mutation.mutateAsync({ versionId, revision, tree: snap.tree, layout: snap.layout });
        setSavedRevision(res.revision);
        setSavedChange(snap.change);
        setStatus("idle");
        setProblem(null);
      } catch (e) {
        if (e instanceof SaveError && e.status === 409 && e.conflict) {
          setConflict(e.conflict);
          setStatus("conflict");
        } else if (e instanceof SaveError && (e.status === 410 || e.status === 404)) {
          setProblem(e.message);
          setStatus("gone");
        } else {
          setProblem(e instanceof Error && !(e instanceof TypeError) ? e.message : "Cluepath can't reach the server.");
          setStatus("error");
        }
      }
    },
    [mutation, treeId, versionId],
  );
  const unsaved = state.change !== savedChange;
  useEffect(() => {
    if (!unsaved || status === "saving" || status === "conflict" || status === "gone") return;
    const t = setTimeout(() => void save(savedRevision), status === "error" ? 5000 : 700);
    return () => clearTimeout(t);
  }, [unsaved, state.change, status, savedRevision, save]);
  useEffect(() => {
    if (!unsaved) return;
    const warn = (e: BeforeUnloadEvent) => e.preventDefault();
    window.addEventListener("beforeunload", warn);
    return () => window.removeEventListener("beforeunload", warn);
  }, [unsaved]);

  // --- validation of the saved draft (the publish gate) -----------------------------------------
  const validation = useQuery({
    queryKey: ["tree-validation", treeId, savedRevision],
    queryFn: () => fetchValidation(treeId),
    initialData: savedRevision === props.revision ? props.validation : undefined,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });
  const checks = validation.data ?? { revision: 0, findings: [], errors: 0, warnings: 0, sameAs: null };
  const checking = unsaved || status === "saving" || validation.isPlaceholderData || checks.revision !== savedRevision;
  const marks: NodeMarks = useMemo(() => {
    const m: NodeMarks = new Map();
    for (const f of checks.findings) {
      if (!f.nodeId) continue;
      const x = m.get(f.nodeId) ?? { errors: 0, warnings: 0 };
      if (f.severity === "error") x.errors++;
      else x.warnings++;
      m.set(f.nodeId, x);
    }
    return m;
  }, [checks]);

  let blocked: string | null = null;
  if (state.tree.nodes.length === 0) blocked = "Add nodes to the tree first.";
  else if (status === "conflict") blocked = "Sort out the save conflict first.";
  else if (status === "gone") blocked = "This draft can no longer be saved.";
  else if (status === "error") blocked = "Your latest changes aren't saved yet.";
  else if (checking) blocked = "Saving and checking your latest changes…";
  else if (checks.errors > 0) blocked = `Fix the ${checks.errors === 1 ? "error" : `${checks.errors} errors`} under Checks first.`;
  else if (checks.sameAs !== null) blocked = `Nothing has changed since version ${checks.sameAs} yet.`;

  // --- navigation between views -----------------------------------------------------------------
  const open = useCallback((nodeId: string, field?: string) => {
    dispatch({ type: "select", id: nodeId });
    setFocusField(field);
    setPane("node");
  }, []);
  const add = (kind: NodeKind) => {
    dispatch({ type: "add-node", kind });
    setPane("node");
  };
  const act = useCallback((a: DraftAction) => {
    dispatch(a);
    if (a.type === "delete-node") setPane("outline");
  }, []);
  const selectedNode = state.tree.nodes.find((n) => n.id === state.selected) ?? null;

  // --- conflict ---------------------------------------------------------------------------------
  const theirs = useQuery({ queryKey: ["tree-draft", treeId, conflict?.revision], queryFn: () => fetchDraft(treeId), enabled: status === "conflict" });
  const keepMine = () => {
    if (!conflict) return;
    setSavedRevision(conflict.revision);
    setConflict(null);
    setStatus("idle");
  };
  const takeTheirs = () => {
    const t = theirs.data;
    if (!t) return;
    dispatch({ type: "replace", tree: t.tree, layout: t.layout });
    setSavedChange(stateRef.current.change + 1);
    setSavedRevision(t.revision);
    setConflict(null);
    setStatus("idle");
    setFormEpoch((e) => e + 1);
  };
  const downloadMine = () => download(`${treeId.slice(0, 8)}-my-changes.md`, serializeTree(state.tree));

  const upload = (file: File) => uploadImage(treeId, file);
  const statusText =
    status === "saving"
      ? "Saving…"
      : status === "conflict"
        ? "Not saved: someone else saved first"
        : status === "gone"
          ? "Not saved"
          : status === "error"
            ? "Not saved yet — retrying"
            : unsaved
              ? "Unsaved changes"
              : "All changes saved";

  const tab = (p: Pane, label: ReactNode) => (
    <button type="button" role="tab" aria-selected={pane === p} aria-controls={`pane-${p}`} className={`min-h-12 flex-1 rounded-lg px-2 text-base font-semibold ${pane === p ? "bg-copper-soft text-copper-dark" : "text-ink"}`} onClick={() => setPane(p)}>
      {label}
    </button>
  );
  const showCenter = pane === "outline" || pane === "canvas";
  const centerView = wide ? wideView : pane === "canvas" ? "canvas" : "outline";

  return (
    <div className="flex min-h-dvh flex-col lg:h-dvh">
      <header className="flex flex-wrap items-start gap-x-4 gap-y-1 border-b border-rule bg-card px-3 py-2 lg:items-center">
        <Link to={`/trees/${treeId}`} className="min-h-11 py-2 font-semibold lg:order-first">
          ← Tree page
        </Link>
        <div className="order-last min-w-0 basis-full lg:order-none lg:basis-auto lg:flex-1">
          <h1 className="text-lg font-bold leading-tight lg:truncate">{state.tree.title}</h1>
          <p className="text-sm text-ink-soft">
            Draft of version {props.nextNumber}
            {props.basedOn !== null && <> · started from version {props.basedOn}</>} ·{" "}
            <span role="status" aria-live="polite" className={status === "conflict" || status === "gone" ? "font-semibold text-out" : ""}>
              {statusText}
            </span>
          </p>
        </div>
        <div className="ml-auto">
          <PublishButton blocked={blocked} nextNumber={props.nextNumber} revision={savedRevision} error={props.publishError} />
        </div>
      </header>

      {status === "conflict" && conflict && (
        <section role="alert" aria-labelledby="conflict-heading" className="space-y-2 border-b-2 border-out bg-out-soft px-4 py-3">
          <h2 id="conflict-heading" className="text-lg font-bold text-out">
            {conflict.updatedByName ?? "Someone"} saved this draft at {time(conflict.updatedAt)}, while you were editing
          </h2>
          <p>
            Nothing of yours was saved, and nothing of theirs was overwritten. Your changes are still on this screen. Compare the two, then keep yours (replacing theirs) or
            take theirs (download yours first to re-apply what you need).
          </p>
          <div className="flex flex-wrap gap-2">
            <button type="button" className="btn-quiet" onClick={downloadMine}>
              Download my version (.md)
            </button>
            <button type="button" className="btn-quiet" onClick={keepMine}>
              Keep mine, replacing theirs
            </button>
            <button type="button" className="btn-quiet" onClick={takeTheirs} disabled={!theirs.data}>
              Take theirs, dropping mine
            </button>
          </div>
          {theirs.data && (
            <details className="rounded-lg bg-card p-3">
              <summary className="cursor-pointer font-semibold">What differs between their save and your screen</summary>
              <div className="mt-2">
                <DiffView diff={diffTrees(theirs.data.tree, state.tree)} fromLabel="their save" toLabel="your screen" />
              </div>
            </details>
          )}
        </section>
      )}
      {status === "gone" && (
        <section role="alert" className="space-y-2 border-b-2 border-out bg-out-soft px-4 py-3">
          <p className="font-semibold text-out">{problem}</p>
          <p>Your changes are still on this screen. Download them as a tree file and import it as a new draft from the tree page.</p>
          <button type="button" className="btn-quiet" onClick={downloadMine}>
            Download my version (.md)
          </button>
        </section>
      )}
      {status === "error" && problem && (
        <p role="status" className="border-b border-marginal bg-marginal-soft px-4 py-2 text-marginal">
          {problem} Your changes are kept on this screen and saved as soon as the server answers.
        </p>
      )}

      <div role="tablist" aria-label="Editor panes" className="flex gap-1 border-b border-rule bg-card px-2 py-1 lg:hidden">
        {tab("outline", "Outline")}
        {tab("node", selectedNode ? "Node" : "Details")}
        {tab("checks", <>Checks{checks.errors > 0 && !checking ? ` (${checks.errors})` : ""}</>)}
        {tab("canvas", "Canvas")}
      </div>

      <div className="grid min-h-0 flex-1 lg:grid-cols-[17rem_minmax(0,1fr)_27rem]">
        <aside id="pane-checks" className={`${pane === "checks" ? "block" : "hidden"} space-y-6 overflow-y-auto p-3 lg:block lg:border-r lg:border-rule`}>
          <Findings
            findings={checks.findings}
            tree={state.tree}
            stale={!checking ? null : status === "idle" || status === "saving" ? "Checking your latest changes…" : "These checks are for the last save; your latest changes aren't saved."}
            onGo={(id) => open(id)}
          />
          <div className="hidden lg:block">
            <Palette onAdd={add} />
          </div>
        </aside>

        <section id={`pane-${centerView}`} aria-label={centerView === "canvas" ? "Canvas" : "Outline"} className={`${showCenter ? "flex" : "hidden"} min-h-0 flex-col lg:flex`}>
          <div className="hidden gap-1 border-b border-rule px-3 py-2 lg:flex" role="group" aria-label="How to show the draft">
            {(["canvas", "outline"] as const).map((v) => (
              <button key={v} type="button" aria-pressed={wideView === v} className={`min-h-10 rounded-lg px-3 font-semibold ${wideView === v ? "bg-copper-soft text-copper-dark" : ""}`} onClick={() => setWideView(v)}>
                {v === "canvas" ? "Canvas" : "Outline"}
              </button>
            ))}
          </div>
          {centerView === "outline" ? (
            <div className="flex-1 space-y-6 overflow-y-auto p-3">
              <Outline tree={state.tree} selected={state.selected} marks={marks} onOpen={open} />
              <div className="lg:hidden">
                <Palette onAdd={add} />
              </div>
            </div>
          ) : (
            <div className="h-[70dvh] min-h-[28rem] lg:h-auto lg:flex-1">
              {mounted ? (
                <Suspense fallback={<p className="p-4 text-ink-soft">Loading the canvas…</p>}>
                  <Canvas tree={state.tree} layout={state.layout} selected={state.selected} marks={marks} dispatch={act} onOpen={(id) => open(id)} />
                </Suspense>
              ) : (
                <p className="p-4 text-ink-soft">Loading the canvas…</p>
              )}
            </div>
          )}
        </section>

        <aside id="pane-node" className={`${pane === "node" ? "block" : "hidden"} overflow-y-auto border-rule p-3 lg:block lg:border-l`}>
          {selectedNode ? (
            <div className="space-y-3">
              <div className="flex flex-wrap gap-2">
                <button type="button" className="btn-quiet min-h-10 px-3 text-base lg:hidden" onClick={() => setPane("outline")}>
                  ← Outline
                </button>
                <button type="button" className="btn-quiet min-h-10 px-3 text-base" onClick={() => dispatch({ type: "select", id: null })}>
                  Tree details
                </button>
              </div>
              <NodeForm
                key={`${selectedNode.id}:${formEpoch}`}
                node={selectedNode}
                tree={state.tree}
                dispatch={act}
                findings={checks.findings.filter((f) => f.nodeId === selectedNode.id)}
                upload={upload}
                focusField={focusField}
              />
            </div>
          ) : (
            <TreeForm key={formEpoch} tree={state.tree} dispatch={act} upload={upload} />
          )}
        </aside>
      </div>
    </div>
  );
}

function PublishButton({ blocked, nextNumber, revision, error }: { blocked: string | null; nextNumber: number; revision: number; error?: EditorProps["publishError"] }) {
  const dialog = useRef<HTMLDialogElement>(null);
  const busy = useNavigation().state !== "idle";
  useEffect(() => {
    if (error && !dialog.current?.open) dialog.current?.showModal();
  }, [error]);
  return (
    <div className="flex flex-col items-end gap-1">
      <button type="button" className="btn-primary min-h-11" disabled={blocked !== null} aria-describedby="publish-blocked" onClick={() => dialog.current?.showModal()}>
        Publish…
      </button>
      <p id="publish-blocked" className="max-w-64 text-right text-sm text-ink-soft">
        {blocked ?? `Ready to publish as version ${nextNumber}.`}
      </p>
      <dialog ref={dialog} aria-labelledby="publish-heading" className="m-auto w-[min(34rem,92vw)] rounded-xl border border-rule p-0 backdrop:bg-ink/40">
        <Form method="post" className="space-y-3 p-4">
          <h2 id="publish-heading" className="text-xl font-bold">
            Publish version {nextNumber}
          </h2>
          <p>Once published, this version never changes. Technicians start new runs on it; later edits go into a new draft.</p>
          <input type="hidden" name="intent" value="publish" />
          <input type="hidden" name="revision" value={revision} />
          <div>
            <label htmlFor="change-note" className="field-label">
              What changed, and why
            </label>
            <textarea id="change-note" name="changeNote" required maxLength={500} rows={3} className="field-input py-2 text-base" />
          </div>
          {error && (
            <div role="alert" className="rounded-lg bg-out-soft p-3 text-out">
              <p className="font-semibold">{error.message}</p>
              {error.findings && (
                <ul className="list-disc pl-5">
                  {error.findings.map((f, i) => (
                    <li key={i}>{f.message}</li>
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
