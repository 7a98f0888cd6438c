// The service report on the finished screen: e-mail it to the site contact once with the big
// button; once sent, sending it again is a quiet button that asks first, so a customer is not
// mailed twice by a stray tap.
import { announce } from "~/components/Announcer";
import { useAsk } from "~/components/useAsk";
import type { RunView } from "~/lib/run-log";
import { reportNumber } from "~/lib/report-data";
import { clock } from "../clock";
import type { RunHandle } from "../useRun";

export function SendReport({ run, report }: { run: RunHandle; report: NonNullable<RunView["report"]> }) {
  const { view } = run;
  const sent = report.sentAt ? new Date(report.sentAt) : null;
  const { asking, setAsking, asker: again, answer: confirm } = useAsk();
  const pending = run.sendReport.isPending;
  const contact = view.unit ? `${view.unit.contactName} (${view.unit.contactEmail})` : "";
  const send = () =>
    run.sendReport.mutate(report.id, {
      onSuccess: () => announce(`Report ${reportNumber(report.number)} e-mailed to ${view.unit?.contactName ?? "the site contact"}.`),
      onSettled: () => setAsking(false),
    });

  return (
    <div className="card space-y-3">
      <h2 className="text-xl font-bold">Service report {reportNumber(report.number)}</h2>
      {sent ? (
        <p className="text-lg text-within" role="status">
          ✓ E-mailed to {report.sentTo} at {clock(sent, view.timeZone)}
        </p>
      ) : (
        <p className="text-lg">Not sent yet.</p>
      )}
      {view.unit && !sent && (
        <>
          <button type="button" className="btn-primary min-h-16 w-full text-xl" disabled={pending} onClick={send}>
            {pending ? "Sending…" : `E-mail the report to ${view.unit.contactName}`}
          </button>
          <p className="text-base text-ink-soft">Goes to {view.unit.contactEmail}, the site contact.</p>
        </>
      )}
      <a className={`${sent ? "btn-primary min-h-16 text-xl" : "btn-quiet min-h-14"} w-full`} href={`/reports/${report.id}`}>
        Open the report
      </a>
      {view.unit && sent && !asking && (
        <button ref={again} type="button" className="btn-quiet min-h-14 w-full" onClick={() => setAsking(true)}>
          Send it again…
        </button>
      )}
      {view.unit && sent && asking && (
        <div role="group" aria-labelledby="send-again-q" className="space-y-2 rounded-lg border-2 border-ink p-3">
          <p id="send-again-q" className="text-lg font-semibold">
            Send the report to {contact} again? They already have it.
          </p>
          <div className="flex gap-2">
            <button ref={confirm} type="button" className="btn-quiet min-h-14 flex-1 border-2 border-ink" disabled={pending} onClick={send}>
              {pending ? "Sending…" : "Send again"}
            </button>
            <button type="button" className="btn-quiet min-h-14 flex-1" onClick={() => setAsking(false)}>
              No
            </button>
          </div>
        </div>
      )}
    </div>
  );
}
