// GET /api/insights/csv/:table — one table of the overview as CSV, with the same filters (query
// string) as the page, so it holds exactly the rows the page shows. Owners and leads.
import { z } from "zod";
import { requireUser } from "~/lib/auth.server";
import { Refusal } from "~/lib/refusal";
import { api } from "~/lib/route.server";
import { parseFilters } from "~/lib/insights/filters";
import { TABLE_IDS, toCsv } from "~/lib/insights/table";
import { overviewTable } from "~/models/insights/overview.server";
import type { Route } from "./+types/api.insights.csv";

export const loader = api(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request, "shop.overview");
  const id = z.enum(TABLE_IDS).safeParse(params.table);
  if (!id.success) throw new Refusal("not-found", "There is no such table on the overview.");
  const { filters } = parseFilters(new URL(request.url).searchParams);
  const result = await overviewTable(ctx, filters, id.data);
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
});
