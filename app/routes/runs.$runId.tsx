// /runs/:runId — the phone runner. The loader gives the first render; the runner then talks to the
// JSON routes under /api/runs/:runId through TanStack Query.
import { useMemo } from "react";
import { Runner } from "~/components/runner/Runner";
import { requireUser } from "~/lib/auth.server";
import type { RunView } from "~/lib/run-log";
import { page } from "~/lib/route.server";
import { versionPartJson } from "~/lib/run-json.server";
import { getRunView } from "~/models/runs/view.server";
import type { Route } from "./+types/runs.$runId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.view.version.title ?? "Run"} · Cluepath` }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const full = await getRunView(ctx, params.runId);
  // The version's tree and step bodies, most of the page's data, travel as JSON text serialised
  // once per version: the page's data encoder then copies one string instead of walking the tree.
  const { tree: _t, bodies: _b, description: _d, ...view } = full;
  return { view, version: versionPartJson(full) };
});

export default function RunnerRoute({ loaderData }: Route.ComponentProps) {
  const { view, version } = loaderData;
  const initial = useMemo((): RunView => ({ ...view, ...(JSON.parse(version) as Pick<RunView, "tree" | "bodies" | "description">) }), [view, version]);
  return <Runner key={view.run.id} initial={initial} />;
}
