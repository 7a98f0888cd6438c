// The job is finished: the root cause, what was done, the parts, and the service report to send.
import { reportNumber } from "~/models/report-data";
import { clock } from "../clock";
import { History } from "../History";
import type { RunHandle } from "../useRun";

export function DoneScreen({ run }: { run: RunHandle }) {
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
