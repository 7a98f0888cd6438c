// The job is finished: the root cause, what was done, the parts, and the service report to send.
import { History } from "../History";
import type { RunHandle } from "../useRun";
import { EndHeading } from "./EndHeading";
import { SendReport } from "./SendReport";

export function DoneScreen({ run }: { run: RunHandle }) {
  const { view } = run;
  const report = view.report;
  return (
    <section className="space-y-4">
      <div className="rounded-xl border-2 border-within bg-within-soft p-4">
        <EndHeading kicker="Job finished" title={view.run.rootCause ?? ""} tone="text-within" />
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
      {report && <SendReport run={run} report={report} />}
      <a className="btn-quiet min-h-14 w-full" href={view.call ? `/calls/${view.call.id}` : "/"}>
        {view.call ? `Back to call ${view.call.number}` : "Back to my home"}
      </a>
      <History run={run} />
    </section>
  );
}
