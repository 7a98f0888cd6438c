// GET /api/insights/csv/:table — one table of the overview as CSV, with the same filters (query
// string) as the page, so it holds exactly the rows the page shows. Owners and leads.
import { z } from "zod";
import { requireRole } from "~/lib/auth.server";
import { apiError } from "~/lib/http.server";
import { parseFilters } from "~/lib/insights/filters";
import { TABLE_IDS, toCsv } from "~/lib/insights/table";
import { overviewTable } from "~/models/insights/overview.server";
import type { Route } from "./+types/api.insights.csv";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireRole(request, ["owner", "lead"]);
  const id = z.enum(TABLE_IDS).safeParse(params.table);
  if (!id.success) throw apiError(404, "There is no such table on the overview.");
  const { filters } = parseFilters(new URL(request.url).searchParams);
  const result = await overviewTable(user.ctx, filters, id.data);
  if (!result.ok) throw apiError(result.status, result.message);
  const name = `${id.data}_${result.firstDay}_${result.lastDay}.csv`;
  // A byte-order mark, so spreadsheet programs read µ, ° and — as UTF-8.
  return new Response(`\uFEFF${toCsv(result.table)}`, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${name}"`,
      "cache-control": "private, no-store",
      "x-content-type-options": "nosniff",
    },
  });
}
