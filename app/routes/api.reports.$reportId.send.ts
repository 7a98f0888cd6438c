// POST /api/reports/:reportId/send — e-mails the service report to the site contact.
import { reportMailHtml } from "~/components/report/reportMail";
import { requireUser } from "~/lib/auth.server";
import { fromClient, requireSameOrigin } from "~/lib/http.server";
import { api, requireMethod } from "~/lib/route.server";
import { sendReport } from "~/models/runs/reports.server";
import type { Route } from "./+types/api.reports.$reportId.send";

export const action = api(async ({ request, params, context }: Route.ActionArgs) => {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const { ctx } = await requireUser(request);
  return Response.json({ ok: true, ...(await sendReport(fromClient(ctx, context), params.reportId, reportMailHtml)) });
});
