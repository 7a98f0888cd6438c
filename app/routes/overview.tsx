import { Overview } from "~/components/insights/Overview";
import { requireUser } from "~/lib/auth.server";
import { atShop } from "~/lib/display";
import { filtersQuery, parseFilters } from "~/lib/insights/filters";
import { page } from "~/lib/route.server";
import { overview } from "~/models/insights/overview.server";
import type { Route } from "./+types/overview";

export const meta: Route.MetaFunction = () => [{ title: "Overview · Cluepath" }];
export const handle = { wide: true };

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request, "shop.overview");
  const { filters, errors } = parseFilters(new URL(request.url).searchParams);
  const data = await overview(ctx, filters);
  const { start, end, timeZone } = data.period;
  const last = new Date(Date.parse(end) - 1);
  return {
    ...data,
    filters,
    errors,
    query: filtersQuery(filters),
    periodText: `from ${atShop(new Date(start), timeZone, "date")} to ${atShop(last, timeZone, "date")}`,
  };
});

export default function OverviewRoute({ loaderData }: Route.ComponentProps) {
  return <Overview data={loaderData} />;
}
