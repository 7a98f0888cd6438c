// /reports/:reportId — the service report: printable (print stylesheet), e-mailed to the site contact.
import { useFetcher } from "react-router";
import { SendAgain } from "~/components/report/SendAgain";
import { ReportDocument, REPORT_CSS } from "~/components/report/ReportDocument";
import { reportMailHtml } from "~/components/report/reportMail";
import { requireUser } from "~/lib/auth.server";
import { atShop } from "~/lib/display";
import { fromClient } from "~/lib/http.server";
import { can } from "~/lib/policy";
import { reportNumber } from "~/lib/report-data";
import { form, page } from "~/lib/route.server";
import { getReport, sendReport } from "~/models/runs/reports.server";
import type { Route } from "./+types/reports.$reportId";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Service report ${reportNumber(data.report.number)} · Cluepath` : "Service report · Cluepath" },
];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  return { report: await getReport(ctx, params.reportId), canSend: can(ctx, "reports.send") };
});

export const action = form(async ({ request, params, context }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "reports.send");
  const { to } = await sendReport(fromClient(ctx, context), params.reportId, reportMailHtml);
  return { ok: true as const, to };
});

export default function Report({ loaderData }: Route.ComponentProps) {
  const { report } = loaderData;
  const fetcher = useFetcher<typeof action>();
  const pending = fetcher.state !== "idle";
  const result = fetcher.data;
  const send = () => fetcher.submit(null, { method: "post" });
  const contact = report.site ? `${report.site.contactName} (${report.site.contactEmail})` : "";
  return (
    <main className="min-h-dvh bg-paper print:bg-white">
      <style>{REPORT_CSS}</style>
      <div className="mx-auto max-w-3xl space-y-3 px-4 py-3 print:hidden">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <a href={`/runs/${report.runId}`} className="flex min-h-12 items-center font-semibold">
            ← Back to the run
          </a>
          <div className="flex flex-wrap gap-2">
            <button type="button" className="btn-quiet" onClick={() => window.print()}>
              Print
            </button>
            {report.site && loaderData.canSend && !report.sentAt && (
              <button type="button" className="btn-primary" disabled={pending} onClick={send}>
                {pending ? "Sending…" : `E-mail to ${report.site.contactName}`}
              </button>
            )}
          </div>
        </div>
        {result?.ok === true && (
          <p role="status" className="rounded-lg bg-within-soft p-3 font-semibold text-within">
            Sent to {result.to}.
          </p>
        )}
        {result?.ok === false && (
          <p role="alert" className="rounded-lg bg-out-soft p-3 font-semibold text-out">
            {result.message}
          </p>
        )}
        {report.sentAt && !result && (
          <p className="text-ink-soft">
            Last e-mailed to {report.sentTo} on {atShop(report.sentAt, report.shop.timeZone)}.
          </p>
        )}
        {report.site && loaderData.canSend && report.sentAt && <SendAgain contact={contact} pending={pending} send={send} />}
      </div>
      <div className="mx-auto max-w-3xl px-4 pb-8 print:px-0">
        <div className="rounded-xl border border-rule bg-card print:border-0">
          <ReportDocument report={report} photoSrc={(id) => `/api/photos/${id}`} />
        </div>
      </div>
    </main>
  );
}
