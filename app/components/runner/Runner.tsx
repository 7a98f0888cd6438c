// The phone runner: one step per screen, the position in the procedure, a visible saving state,
// and a bottom bar (back, note, photo, more) sized for gloved hands.
import { useEffect, useRef, useState, type ReactNode } from "react";
import type { OutcomeNode, TreeNode } from "~/engine/types";
import { MAX_PHOTO_MB } from "./limits";
import { Markdown } from "./Markdown";
import { stepsToGo } from "./progress";
import { VERDICT_STYLE } from "./Reading";
import { KIND_LABEL, OutcomeScreen, StepScreen } from "./Screens";
import { useRun, type RunHandle } from "./useRun";
import { reportNumber } from "~/lib/report-data";
import type { RunView, StepView } from "~/lib/run-log";

/** "14:05" in the shop's time zone (the same on the server and the phone). */
function clock(d: Date, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", { timeZone, hour: "2-digit", minute: "2-digit" }).format(d);
}

type Panel = null | "note" | "history" | "more" | "escalate" | "abandon";

export function Runner({ initial }: { initial: RunView }) {
  const run = useRun(initial);
  const { view, state, current } = run;
  const [panel, setPanel] = useState<Panel>(null);
  const status = view.run.status;
  const open = status === "active" || status === "paused";
  const holds = view.viewer.holds;
  const walking = holds && status === "active";
  const endNode = state.finished ? run.byId.get(state.finished.node) : undefined;
  const shownNode = current ?? endNode;

  // A new step starts at the top of the screen, with focus on its title (for screen readers too).
  const position = `${state.current ?? state.finished?.node ?? ""}:${state.steps.length}:${status}`;
  const first = useRef(true);
  useEffect(() => {
    if (first.current) {
      first.current = false;
      return;
    }
    window.scrollTo({ top: 0 });
    document.getElementById("step-title")?.focus({ preventScroll: true });
    setPanel((p) => (p === "history" || p === "more" ? p : null));
  }, [position]);

  // A panel opened from the bottom bar (note, reason, history) shows at the top of the screen.
  useEffect(() => {
    if (panel && panel !== "more") window.scrollTo({ top: 0 });
  }, [panel]);

  let screen: ReactNode;
  if (status === "done") screen = <DoneScreen run={run} />;
  else if (status === "abandoned") screen = <Closed title="Run abandoned" detail={view.run.abandonReason ?? ""} />;
  else if (status === "escalated") screen = <EscalatedScreen run={run} />;
  else if (!holds) screen = <ReadOnly run={run} />;
  else if (status === "paused") screen = <PausedScreen run={run} />;
  else if (state.finished?.kind === "outcome" && endNode?.kind === "outcome") screen = <OutcomeScreen node={endNode as OutcomeNode} run={run} />;
  else if (state.finished) screen = <HandOverScreen run={run} reason={state.finished.kind === "escalate" || state.finished.kind === "recheck-limit" ? state.finished.reason : ""} onEscalate={() => setPanel("escalate")} />;
  else if (current) screen = <StepScreen key={`${current.id}:${view.steps.length}`} node={current} run={run} />;
  else screen = <Closed title="This procedure cannot run" detail={state.error ?? "The tree has no step to start from."} />;

  return (
    <div className="flex min-h-dvh flex-col bg-paper">
      <Header run={run} walking={walking && Boolean(current)} onHistory={() => setPanel(panel === "history" ? null : "history")} />
      <main className="mx-auto w-full max-w-xl flex-1 space-y-4 px-4 pb-44 pt-3">
        {run.error && (
          <div role="alert" className="flex items-start justify-between gap-3 rounded-xl border-2 border-out bg-out-soft p-3 text-out">
            <p className="text-lg font-semibold">{run.error}</p>
            <button type="button" className="btn-quiet min-h-12 shrink-0 text-base" onClick={() => run.setError(null)}>
              OK
            </button>
          </div>
        )}
        {panel === "history" && <History run={run} onClose={() => setPanel(null)} />}
        {panel === "note" && shownNode && <NotePanel run={run} node={shownNode} onClose={() => setPanel(null)} />}
        {(panel === "escalate" || panel === "abandon") && (
          <ReasonPanel
            run={run}
            kind={panel}
            preset={panel === "escalate" && state.finished && "reason" in state.finished ? state.finished.reason : ""}
            onClose={() => setPanel(null)}
          />
        )}
        {walking && current && <StepHeading run={run} node={current} />}
        {walking && <LastReading run={run} />}
        {walking && view.steps.length === 0 && view.description.length > 0 && (
          <details className="card text-ink-soft">
            <summary className="min-h-12 cursor-pointer py-2 font-semibold text-ink">About this procedure</summary>
            <Markdown blocks={view.description} className="mt-2" />
          </details>
        )}
        {screen}
        {shownNode && <StepExtras run={run} node={shownNode} />}
      </main>
      {holds && open && panel === "more" && <MorePanel run={run} onPick={setPanel} />}
      {holds && open && <Toolbar run={run} node={shownNode} panel={panel} setPanel={setPanel} />}
    </div>
  );
}

function SaveState({ run }: { run: RunHandle }) {
  if (run.waiting > 0)
    return (
      <span className="rounded-full bg-marginal-soft px-3 py-1 text-base font-bold text-marginal" role="status">
        Offline · {run.waiting} waiting
      </span>
    );
  if (run.saving > 0)
    return (
      <span className="rounded-full bg-marginal-soft px-3 py-1 text-base font-bold text-marginal" role="status">
        Saving…
      </span>
    );
  return (
    <span className="rounded-full bg-within-soft px-3 py-1 text-base font-bold text-within" role="status">
      ✓ Saved
    </span>
  );
}

function Header({ run, walking, onHistory }: { run: RunHandle; walking: boolean; onHistory: () => void }) {
  const { view, state } = run;
  const done = state.steps.length;
  const back = view.call ? `/calls/${view.call.id}` : "/";
  return (
    <header className="sticky top-0 z-20 border-b border-rule bg-card">
      <div className="mx-auto flex max-w-xl items-center justify-between gap-2 px-3 py-1">
        <a href={back} className="flex min-h-12 items-center text-base font-semibold">
          ← {view.call ? `Call ${view.call.number}` : "Back"}
        </a>
        {walking && (
          <button type="button" onClick={onHistory} className="min-h-12 rounded-lg px-2 text-base font-bold text-copper-dark" aria-label={`Step ${done + 1}: show the ${done} steps done`}>
            Step {done + 1} · <span className="underline">{done} done</span>
          </button>
        )}
        <SaveState run={run} />
      </div>
    </header>
  );
}

/** Where the run stands: the procedure, the kind of step, how far to an answer, the step's title. */
function StepHeading({ run, node }: { run: RunHandle; node: TreeNode }) {
  const { view, state } = run;
  const left = state.current ? stepsToGo(view.tree, node.id) : null;
  return (
    <div>
      <p className="text-base text-ink-soft">
        {view.unit ? `${view.unit.make} ${view.unit.model} · ` : ""}
        {view.version.title}
        {view.run.practice ? " · practice" : ""}
      </p>
      <p className="mt-1 text-base font-bold uppercase tracking-wide text-copper-dark">
        {KIND_LABEL[node.kind]}
        {left && (
          <span className="font-semibold normal-case tracking-normal text-ink-soft">
            {" "}
            · {left.min === left.max ? left.min : `${left.min} to ${left.max}`} step{left.max === 1 ? "" : "s"} to an answer
          </span>
        )}
      </p>
      <h1 id="step-title" tabIndex={-1} className="mt-1 text-2xl font-bold leading-tight outline-none">
        {node.title}
      </h1>
    </div>
  );
}

/** The verdict of the reading just saved, small, at the top of the next screen. */
function LastReading({ run }: { run: RunHandle }) {
  const steps = run.view.steps;
  const last = steps[steps.length - 1];
  if (!last || last.type !== "reading" || !last.verdict || !last.message) return null;
  const s = VERDICT_STYLE[last.verdict];
  return (
    <div aria-label="Last reading" className={`rounded-lg border-l-8 px-3 py-2 ${s.box}`}>
      <p className="text-sm font-semibold text-ink-soft">
        {last.pending ? "Saving" : "Saved"} · {run.byId.get(last.node ?? "")?.title}
      </p>
      <p className="text-base font-semibold text-ink">
        <span className="font-bold">{s.word}:</span> {last.message}
      </p>
    </div>
  );
}

function StepExtras({ run, node }: { run: RunHandle; node: TreeNode }) {
  const notes = run.view.notes.filter((n) => n.node === node.id);
  const photos = run.view.photos.filter((p) => p.node === node.id);
  if (!notes.length && !photos.length && !run.photoUploading) return null;
  return (
    <section className="space-y-2" aria-label="Notes and photos on this step">
      {notes.map((n) => (
        <p key={n.key} className="rounded-lg bg-card p-3 ring-1 ring-rule">
          <span className="font-semibold">Note{n.pending ? " (saving…)" : ""}:</span> {n.text}
        </p>
      ))}
      {(photos.length > 0 || run.photoUploading) && (
        <div className="flex flex-wrap gap-2">
          {photos.map((p) => (
            <a key={p.id} href={p.url} target="_blank" rel="noreferrer">
              <img src={p.url} alt="Photo on this step" className="h-24 w-24 rounded-lg border border-rule object-cover" />
            </a>
          ))}
          {run.photoUploading && <span className="flex h-24 w-24 items-center justify-center rounded-lg border-2 border-dashed border-rule text-base text-ink-soft">Saving photo…</span>}
        </div>
      )}
    </section>
  );
}

function Toolbar({ run, node, panel, setPanel }: { run: RunHandle; node: TreeNode | undefined; panel: Panel; setPanel: (p: Panel) => void }) {
  const file = useRef<HTMLInputElement>(null);
  const canUndo = run.state.steps.length > 0;
  const btn = "flex min-h-14 flex-1 flex-col items-center justify-center rounded-lg text-base font-bold";
  return (
    <nav aria-label="Run tools" className="fixed inset-x-0 bottom-0 z-20 border-t border-rule bg-card px-2 pb-[max(0.5rem,env(safe-area-inset-bottom))] pt-2">
      <div className="mx-auto flex max-w-xl gap-2">
        <button
          type="button"
          className={`${btn} border-2 border-ink text-ink disabled:border-rule disabled:text-ink-soft`}
          disabled={!canUndo}
          onClick={() => {
            const refused = run.submit({ type: "undo" });
            if (refused) run.setError(refused);
          }}
        >
          ↶ Undo
        </button>
        <button type="button" className={`${btn} border-2 ${panel === "note" ? "border-copper bg-copper-soft" : "border-rule"}`} disabled={!node} onClick={() => setPanel(panel === "note" ? null : "note")}>
          Note
        </button>
        <label className={`${btn} cursor-pointer border-2 border-rule ${!node ? "opacity-60" : ""}`}>
          Photo
          <input
            ref={file}
            type="file"
            accept="image/*"
            capture="environment"
            className="sr-only"
            disabled={!node}
            aria-label="Add a photo to this step"
            onChange={(e) => {
              const f = e.target.files?.[0];
              e.target.value = "";
              if (!f || !node) return;
              if (f.size > MAX_PHOTO_MB * 1024 * 1024) return run.setError(`That photo is larger than ${MAX_PHOTO_MB} MB. Take it again at a lower resolution.`);
              run.addPhoto(node.id, f);
            }}
          />
        </label>
        <button type="button" className={`${btn} border-2 ${panel === "more" ? "border-copper bg-copper-soft" : "border-rule"}`} onClick={() => setPanel(panel === "more" ? null : "more")} aria-expanded={panel === "more"}>
          More
        </button>
      </div>
    </nav>
  );
}

function NotePanel({ run, node, onClose }: { run: RunHandle; node: TreeNode; onClose: () => void }) {
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
      <label htmlFor="step-note" className="field-label text-lg">
        Note on “{node.title}”
      </label>
      <textarea id="step-note" value={text} onChange={(e) => setText(e.target.value)} rows={3} className="field-input py-2" autoFocus />
      <PanelButtons go="Save note" disabled={!text.trim()} onCancel={onClose} />
    </form>
  );
}

function PanelButtons({ go, disabled, danger, onCancel }: { go: string; disabled?: boolean; danger?: boolean; onCancel: () => void }) {
  return (
    <div className="flex gap-2">
      <button type="submit" className={`min-h-14 flex-1 ${danger ? "btn bg-out text-white" : "btn-primary"}`} disabled={disabled}>
        {go}
      </button>
      <button type="button" className="btn-quiet min-h-14 flex-1" onClick={onCancel}>
        Cancel
      </button>
    </div>
  );
}

function MorePanel({ run, onPick }: { run: RunHandle; onPick: (p: Panel) => void }) {
  const paused = run.view.run.status === "paused";
  return (
    <section className="fixed inset-x-0 bottom-[4.75rem] z-30 mx-auto grid max-w-xl gap-2 rounded-t-2xl border border-rule bg-card p-3 shadow-[0_-8px_24px_rgba(0,0,0,0.18)]" aria-label="More">
      <button
        type="button"
        className="btn-quiet min-h-14 w-full"
        disabled={run.statusPending}
        onClick={() => void run.setStatus({ action: paused ? "resume" : "pause" }).then(() => onPick(null), () => undefined)}
      >
        {paused ? "Resume the run" : "Pause — carry on later"}
      </button>
      <button type="button" className="btn-quiet min-h-14 w-full" onClick={() => onPick("escalate")}>
        Ask a lead to take over…
      </button>
      <button type="button" className="btn-quiet min-h-14 w-full text-out" onClick={() => onPick("abandon")}>
        Abandon this run…
      </button>
      <button type="button" className="btn-quiet min-h-14 w-full" onClick={() => onPick(null)}>
        Close
      </button>
    </section>
  );
}

function ReasonPanel({ run, kind, preset, onClose }: { run: RunHandle; kind: "escalate" | "abandon"; preset: string; onClose: () => void }) {
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
      <label htmlFor="run-reason" className="field-label">
        {words.label}
      </label>
      <textarea id="run-reason" value={reason} onChange={(e) => (setReason(e.target.value), setError(null))} rows={3} className="field-input py-2" autoFocus />
      {error && <p className="field-error">{error}</p>}
      <PanelButtons go={words.go} danger={kind === "abandon"} disabled={run.statusPending} onCancel={onClose} />
    </form>
  );
}

function stepSummary(s: StepView): string {
  switch (s.type) {
    case "answer":
      return s.answer ?? "";
    case "reading":
      return s.message ?? s.typed ?? "";
    case "nameplate":
      return `Rated ${s.message ?? s.typed ?? ""}`;
    case "acknowledge":
      return "Acknowledged";
    case "continue":
      return "Done";
    case "undo":
      return "";
  }
}

/** The run so far: every step, with the ones taken back struck through. */
export function History({ run, onClose }: { run: RunHandle; onClose?: () => void }) {
  const rows = run.view.steps.filter((s) => s.type !== "undo");
  return (
    <section className="card space-y-2" aria-label="Steps so far">
      <div className="flex items-center justify-between">
        <h2 className="text-xl font-bold">Steps so far</h2>
        {onClose && (
          <button type="button" className="btn-quiet min-h-12 text-base" onClick={onClose}>
            Close
          </button>
        )}
      </div>
      {rows.length === 0 ? (
        <p className="text-ink-soft">Nothing recorded yet.</p>
      ) : (
        <ol className="space-y-2">
          {rows.map((s) => (
            <li key={s.key} className={`border-b border-rule pb-2 ${s.undone ? "text-ink-soft line-through" : ""}`}>
              <p className="flex justify-between gap-2 font-semibold">
                <span>{run.byId.get(s.node ?? "")?.title ?? s.node}</span>
                <span className="shrink-0 font-normal text-ink-soft">{clock(new Date(s.recordedAt), run.view.timeZone)}</span>
              </p>
              <p className={s.verdict === "within" ? "text-within" : s.verdict === "marginal" ? "text-marginal" : s.verdict ? "text-out" : ""}>
                {stepSummary(s)}
                {s.pending ? " · saving…" : ""}
                {s.undone ? " (taken back)" : ""}
              </p>
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}

function Closed({ title, detail }: { title: string; detail: string }) {
  return (
    <section className="card space-y-2">
      <h1 className="text-2xl font-bold">{title}</h1>
      <p className="text-lg">{detail}</p>
      <a className="btn-quiet min-h-14 w-full" href="/">
        Back to my home
      </a>
    </section>
  );
}

function PausedScreen({ run }: { run: RunHandle }) {
  return (
    <section className="card space-y-3 text-center">
      <h2 className="text-2xl font-bold">Paused</h2>
      <p className="text-lg">Everything so far is saved. Pick up where you left off when you are back at the unit.</p>
      <button type="button" className="btn-primary min-h-16 w-full text-xl" disabled={run.statusPending} onClick={() => void run.setStatus({ action: "resume" }).catch(() => undefined)}>
        Resume
      </button>
    </section>
  );
}

function HandOverScreen({ run, reason, onEscalate }: { run: RunHandle; reason: string; onEscalate: () => void }) {
  return (
    <section className="space-y-3 rounded-xl border-2 border-marginal bg-marginal-soft p-4">
      <p className="text-base font-semibold uppercase tracking-wide text-marginal">The procedure hands over here</p>
      <p className="text-lg font-semibold">{reason}</p>
      <p className="text-lg">Send the run to a lead with what you have seen; they can read every step and take it over. Use Back if a step was entered wrongly.</p>
      <button type="button" className="btn-primary min-h-16 w-full text-xl" onClick={onEscalate}>
        Send to a lead…
      </button>
      {run.view.run.status === "paused" && <p>This run is paused.</p>}
    </section>
  );
}

function EscalatedScreen({ run }: { run: RunHandle }) {
  const e = run.view.escalation;
  return (
    <section className="space-y-3">
      <div className="rounded-xl border-2 border-marginal bg-marginal-soft p-4">
        <p className="text-base font-semibold uppercase tracking-wide text-marginal">Waiting for a lead</p>
        {e && (
          <p className="text-lg">
            <span className="font-semibold">{e.raisedBy}:</span> {e.reason}
          </p>
        )}
        {!run.view.viewer.canTakeOver && <p className="mt-2 text-lg">A lead will read the run and take it over. Everything you entered is saved.</p>}
      </div>
      {run.view.viewer.canTakeOver && <TakeOver run={run} />}
      <History run={run} />
    </section>
  );
}

function TakeOver({ run }: { run: RunHandle }) {
  return (
    <button type="button" className="btn-primary min-h-16 w-full text-xl" disabled={run.statusPending} onClick={() => void run.setStatus({ action: "take-over" }).catch(() => undefined)}>
      Take over this run
    </button>
  );
}

function ReadOnly({ run }: { run: RunHandle }) {
  const at = run.current ?? (run.state.finished ? run.byId.get(run.state.finished.node) : undefined);
  return (
    <section className="space-y-3">
      <div className="card">
        <p className="text-base text-ink-soft">
          {run.view.run.technician.name} holds this run{run.view.run.status === "paused" ? " (paused)" : ""}. It stands at:
        </p>
        <p className="text-xl font-bold">{at?.title ?? "—"}</p>
      </div>
      {run.view.viewer.canTakeOver && <TakeOver run={run} />}
      <History run={run} />
    </section>
  );
}

function DoneScreen({ run }: { run: RunHandle }) {
  const { view } = run;
  const report = view.report;
  const sent = report?.sentAt ? new Date(report.sentAt) : null;
  return (
    <section className="space-y-4">
      <div className="rounded-xl border-2 border-within bg-within-soft p-4">
        <p className="text-base font-semibold uppercase tracking-wide text-within">Job finished</p>
        <p className="text-2xl font-bold">{view.run.rootCause}</p>
        <p className="mt-1 text-lg">{view.run.actionTaken}</p>
        {view.parts.length > 0 && (
          <ul className="mt-2 list-disc pl-6 text-lg">
            {view.parts.map((p, i) => (
              <li key={i}>
                {p.quantity} × {p.description}
                {p.partNumber ? ` (${p.partNumber})` : ""}
              </li>
            ))}
          </ul>
        )}
      </div>
      {report && (
        <div className="card space-y-3">
          <h2 className="text-xl font-bold">Service report {reportNumber(report.number)}</h2>
          {sent ? (
            <p className="text-lg text-within" role="status">
              ✓ E-mailed to {report.sentTo} at {clock(sent, view.timeZone)}
            </p>
          ) : (
            <p className="text-lg">Not sent yet.</p>
          )}
          {view.unit && (
            <button type="button" className="btn-primary min-h-16 w-full text-xl" disabled={run.sendReport.isPending} onClick={() => run.sendReport.mutate(report.id)}>
              {run.sendReport.isPending ? "Sending…" : `${sent ? "Send again" : "E-mail the report"} to ${view.unit.contactName}`}
            </button>
          )}
          {view.unit && <p className="text-base text-ink-soft">Goes to {view.unit.contactEmail}, the site contact.</p>}
          <a className="btn-quiet min-h-14 w-full" href={`/reports/${report.id}`}>
            Open the report
          </a>
        </div>
      )}
      <a className="btn-quiet min-h-14 w-full" href={view.call ? `/calls/${view.call.id}` : "/"}>
        {view.call ? `Back to call ${view.call.number}` : "Back to my home"}
      </a>
      <History run={run} />
    </section>
  );
}
