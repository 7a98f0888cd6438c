import { Overview } from "~/components/insights/Overview";
import { requireRole } from "~/lib/auth.server";
import { filtersQuery, parseFilters } from "~/lib/insights/filters";
import { when } from "~/lib/when";
import { overview } from "~/models/insights/overview.server";
import type { Route } from "./+types/home-owner";

export const meta: Route.MetaFunction = () => [{ title: "Overview · Cluepath" }];
export const handle = { wide: true };

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, ["owner", "lead"]);
  const { filters, errors } = parseFilters(new URL(request.url).searchParams);
  const data = await overview(user.ctx, filters);
  if (!data.ok) throw Response.json({ error: data.message }, { status: data.status });
  const { start, end, timeZone } = data.period;
  const last = new Date(Date.parse(end) - 1);
  return { ...data, filters, errors, query: filtersQuery(filters), periodText: `from ${when(new Date(start), timeZone, "date")} to ${when(last, timeZone, "date")}` };
}

export default function OverviewRoute({ loaderData }: Route.ComponentProps) {
  return <Overview data={loaderData} />;
}
