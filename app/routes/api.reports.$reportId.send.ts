// POST /api/reports/:reportId/send — e-mails the service report to the site contact.
import { jsonResult, requireMethod } from "~/lib/api.server";
import { requireUser } from "~/lib/auth.server";
import { requireSameOrigin } from "~/lib/http.server";
import { sendReport } from "~/models/reports.server";
import type { Route } from "./+types/api.reports.$reportId.send";

export async function action({ request, params }: Route.ActionArgs) {
  requireMethod(request, "POST");
  requireSameOrigin(request);
  const user = await requireUser(request);
  return jsonResult(await sendReport(user.ctx, params.reportId));
}
