// The run so far: every step, with the ones taken back struck through.
import { CONFIRMED_NOTE, type StepView } from "~/lib/run-log";
import { atShop } from "~/lib/display";
import type { RunHandle } from "./useRun";

function stepSummary(s: StepView, practice: boolean): string {
  // Practice: the trainee's call, not the verdict, while the practice runs.
  if (practice && s.type === "reading" && s.call) return `${s.typed ?? ""} — your call: ${s.call}`;
  switch (s.type) {
    case "answer":
      return s.answer ?? "";
    case "reading":
      return `${s.message ?? s.typed ?? ""}${s.confirmed ? ` ${CONFIRMED_NOTE}` : ""}`;
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

export function History({ run, onClose }: { run: RunHandle; onClose?: () => void }) {
  const rows = run.view.steps.filter((s) => s.type !== "undo");
  const practice = run.view.run.practice && run.view.run.status !== "done";
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
                <span className="shrink-0 font-normal text-ink-soft">{atShop(s.recordedAt, run.view.timeZone, "time")}</span>
              </p>
              <p
                className={
                  practice
                    ? ""
                    : s.verdict === "within"
                      ? "text-within"
                      : s.verdict === "marginal"
                        ? "text-marginal"
                        : s.verdict
                          ? "text-out"
                          : ""
                }
              >
                {stepSummary(s, practice)}
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
