// The phone runner: one step per screen, the position in the procedure, a visible saving state,
// and a bottom bar (back, note, photo, more) sized for gloved hands. This file picks the screen
// for where the run stands and lays it out; each screen, panel and bar has its own file.
import { Suspense, useEffect, useRef, useState, type ReactNode } from "react";
import { Announcer } from "~/components/Announcer";
import type { OutcomeNode } from "~/engine/types";
import type { RunView } from "~/lib/run-log";
import { Closed } from "./ends/Closed";
import { EscalatedScreen } from "./ends/EscalatedScreen";
import { HandOverScreen } from "./ends/HandOverScreen";
import { DoneScreen, loadEndScreens, OutcomeScreen, PracticeDoneScreen, PracticeEndScreen } from "./ends/later";
import { PausedScreen } from "./ends/PausedScreen";
import { ReadOnly } from "./ends/ReadOnly";
import { History } from "./History";
import { useFocusClearOfBar } from "./inView";
import { Markdown } from "./Markdown";
import { MorePanel } from "./MorePanel";
import { NotePanel } from "./NotePanel";
import { ReasonPanel } from "./ReasonPanel";
import { RunHeader } from "./RunHeader";
import { StepScreen } from "./Screens";
import { StepExtras } from "./StepExtras";
import { LastReading, StepHeading } from "./StepHeading";
import { Toolbar, type Panel } from "./Toolbar";
import { PhoneStatus } from "./offline/PhoneStatus";
import { registerWorker } from "./offline/worker-client";
import { useRun, type RunHandle } from "./useRun";
import { PracticeBrief } from "./practice/Scripted";

/** The screen for where the run stands. */
function screenFor(run: RunHandle, setPanel: (p: Panel) => void): ReactNode {
  const { view, state, current } = run;
  const status = view.run.status;
  const endNode = state.finished ? run.byId.get(state.finished.node) : undefined;
  if (view.run.practice && status === "done") return <PracticeDoneScreen run={run} />;
  if (status === "done") return <DoneScreen run={run} />;
  if (status === "abandoned") return <Closed title="Run abandoned" detail={view.run.abandonReason ?? ""} />;
  if (status === "escalated") return <EscalatedScreen run={run} />;
  if (!view.viewer.holds) return <ReadOnly run={run} />;
  if (status === "paused") return <PausedScreen run={run} />;
  if (view.run.practice && state.finished) return <PracticeEndScreen run={run} />;
  if (state.finished?.kind === "outcome" && endNode?.kind === "outcome") return <OutcomeScreen node={endNode as OutcomeNode} run={run} />;
  if (state.finished)
    return (
      <HandOverScreen
        run={run}
        reason={state.finished.kind === "escalate" || state.finished.kind === "recheck-limit" ? state.finished.reason : ""}
        onEscalate={() => setPanel("escalate")}
      />
    );
  if (current) return <StepScreen key={`${current.id}:${view.steps.length}`} node={current} run={run} />;
  return <Closed title="This procedure cannot run" detail={state.error ?? "The tree has no step to start from."} />;
}

export function Runner({ initial, fromPhone = false }: { initial: RunView; fromPhone?: boolean }) {
  const run = useRun(initial, fromPhone);
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

  // Keyboard focus never lands under the bottom bar.
  useFocusClearOfBar();

  // The service worker keeps this page and its code on the phone for working without signal.
  useEffect(registerWorker, []);

  // The end-of-run screens come in their own chunk: fetched now, used at the run's end.
  useEffect(() => {
    void loadEndScreens();
  }, []);

  // A panel opened from the bottom bar (note, reason, history) shows at the top of the screen.
  useEffect(() => {
    if (panel && panel !== "more") window.scrollTo({ top: 0 });
  }, [panel]);

  return (
    <div className="flex min-h-dvh flex-col bg-paper">
      <RunHeader
        run={run}
        walking={walking && Boolean(current)}
        historyOpen={panel === "history"}
        onHistory={() => setPanel(panel === "history" ? null : "history")}
      />
      <main className="mx-auto w-full max-w-xl flex-1 space-y-4 px-4 pb-44 pt-3">
        <PhoneStatus run={run} />
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
        {walking && view.run.practice && view.steps.length === 0 && <PracticeBrief run={run} />}
        {walking && current && <StepHeading run={run} node={current} />}
        {walking && <LastReading run={run} />}
        {walking && view.steps.length === 0 && view.description.length > 0 && (
          <details className="card text-ink-soft">
            <summary className="min-h-12 cursor-pointer py-2 font-semibold text-ink">About this procedure</summary>
            <Markdown blocks={view.description} className="mt-2" />
          </details>
        )}
        <Suspense fallback={null}>{screenFor(run, setPanel)}</Suspense>
        {shownNode && <StepExtras run={run} node={shownNode} />}
      </main>
      {holds && open && panel === "more" && <MorePanel run={run} onPick={setPanel} />}
      {holds && open && <Toolbar run={run} node={shownNode} panel={panel} setPanel={setPanel} />}
      <Announcer />
    </div>
  );
}
