// The end of a practice run. At an end of the tree the trainee finishes the practice (undo still
// works until then); once finished they see the cause they reached against the hidden fault, and
// each reading's call beside the engine's verdict. The trainer's comments come later, on the
// practice list.
import type { ReactNode } from "react";
import { EndHeading } from "../ends/EndHeading";
import type { RunHandle } from "../useRun";
import { CALL_WORDS } from "./PracticeReading";

/** The walk stands at an outcome or a hand-over: finish, or undo. */
export function PracticeEndScreen({ run }: { run: RunHandle }) {
  const { finish } = run;
  const end = run.state.finished!;
  const node = run.byId.get(end.node);
  const outcome = end.kind === "outcome";
  return (
    <section className="space-y-3 rounded-xl border-2 border-practice bg-practice-soft p-4">
      <EndHeading
        kicker={outcome ? "The cause you reached" : "The procedure hands over here"}
        title={outcome ? (node?.title ?? "") : ""}
        tone="text-practice"
      />
      {!outcome && "reason" in end && <p className="text-lg font-semibold">{end.reason}</p>}
      <p className="text-lg">
        Finish the practice to see the hidden fault and how each of your calls compares. Until then, Undo takes a step back.
      </p>
      <button
        type="button"
        className="min-h-16 w-full rounded-xl bg-practice px-4 text-xl font-bold text-white disabled:opacity-60"
        disabled={finish.isPending}
        onClick={() => finish.mutate()}
      >
        {finish.isPending ? "Finishing…" : "Finish the practice"}
      </button>
    </section>
  );
}

function Result({ right, children }: { right: boolean; children: ReactNode }) {
  return <div className={`rounded-xl border-2 p-4 ${right ? "border-within bg-within-soft" : "border-out bg-out-soft"}`}>{children}</div>;
}

/** The practice is finished: the cause reached against the hidden fault, and every reading's call. */
export function PracticeDoneScreen({ run }: { run: RunHandle }) {
  const { view } = run;
  const fault = view.practice?.fault;
  const end = run.state.finished;
  const reached = end?.kind === "outcome" ? run.byId.get(end.node)?.title : null;
  const right = Boolean(fault && end?.kind === "outcome" && end.node === fault.node);
  const readings = view.steps.filter((s) => s.type === "reading" && s.verdict && s.call);
  return (
    <section className="space-y-4">
      <Result right={right}>
        <EndHeading
          kicker={right ? "Practice finished — right cause" : "Practice finished — not the hidden fault"}
          title={reached ?? "No cause reached: the procedure handed over"}
          tone={right ? "text-within" : "text-out"}
        />
        {fault && (
          <p className="mt-2 text-lg">
            The hidden fault: <strong>{fault.title}</strong>
          </p>
        )}
      </Result>
      {readings.length > 0 && (
        <section className="card space-y-2" aria-label="Your calls">
          <h2 className="text-xl font-bold">Your calls on the readings</h2>
          <ul className="space-y-2">
            {readings.map((s) => {
              const same = s.call === s.verdict;
              return (
                <li
                  key={s.key}
                  className={`rounded-lg border-l-8 px-3 py-2 ${s.undone ? "opacity-70" : ""} ${same ? "border-within bg-within-soft" : "border-out bg-out-soft"}`}
                >
                  <p className="font-semibold text-ink">
                    {run.byId.get(s.node ?? "")?.title}
                    {s.undone ? " (taken back)" : ""}
                  </p>
                  <p className="text-ink">
                    {s.typed}: your call <strong>{CALL_WORDS[s.call!].word.toLowerCase()}</strong>, Cluepath: <strong>{s.verdict}</strong>
                    {same ? " ✓" : " ✗"}
                  </p>
                  {s.message && <p className="text-base text-ink-soft">{s.message}</p>}
                </li>
              );
            })}
          </ul>
        </section>
      )}
      <p className="text-lg">Your trainer reviews the run; their comments appear on your practice list.</p>
      <a className="btn-quiet min-h-14 w-full" href="/practice">
        Back to my practice
      </a>
    </section>
  );
}
