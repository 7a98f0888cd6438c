// The service report on the finished screen: e-mail it to the site contact once with the big
// button; once sent, sending it again is a quiet button that asks first, so a customer is not
// mailed twice by a stray tap.
import { announce } from "~/components/Announcer";
import { SendAgain } from "~/components/report/SendAgain";
import { atShop } from "~/lib/display";
import type { RunView } from "~/lib/run-log";
import { reportNumber } from "~/lib/report-data";
import type { RunHandle } from "../useRun";

export function SendReport({ run, report }: { run: RunHandle; report: NonNullable<RunView["report"]> }) {
  const { view } = run;
  const pending = run.sendReport.isPending;
  const send = () =>
    run.sendReport.mutate(report.id, {
      onSuccess: () => announce(`Report ${reportNumber(report.number)} e-mailed to ${view.unit?.contactName ?? "the site contact"}.`),
    });

  return (
    <div className="card space-y-3">
      <h2 className="text-xl font-bold">Service report {reportNumber(report.number)}</h2>
      {report.sentAt ? (
        <p className="text-lg text-within" role="status">
          ✓ E-mailed to {report.sentTo} at {atShop(report.sentAt, view.timeZone, "time")}
        </p>
      ) : (
        <p className="text-lg">Not sent yet.</p>
      )}
      {view.unit && !report.sentAt && (
        <>
          <button type="button" className="btn-primary min-h-16 w-full text-xl" disabled={pending} onClick={send}>
            {pending ? "Sending…" : `E-mail the report to ${view.unit.contactName}`}
          </button>
          <p className="text-base text-ink-soft">Goes to {view.unit.contactEmail}, the site contact.</p>
        </>
      )}
      <a className={`${report.sentAt ? "btn-primary min-h-16 text-xl" : "btn-quiet min-h-14"} w-full`} href={`/reports/${report.id}`}>
        Open the report
      </a>
      {view.unit && report.sentAt && (
        <SendAgain contact={`${view.unit.contactName} (${view.unit.contactEmail})`} pending={pending} send={send} className="w-full" />
      )}
    </div>
  );
}
