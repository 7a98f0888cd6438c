// /runs/:runId — the phone runner. The loader gives the first render; the runner then talks to the
// JSON routes under /api/runs/:runId through TanStack Query.
import { errorWords } from "~/components/errorWords";
import { Runner } from "~/components/runner/Runner";
import { RunnerError } from "~/components/runner/RunnerError";
import { requireUser } from "~/lib/auth.server";
import { page } from "~/lib/route.server";
import { getRunView } from "~/models/runs/view.server";
import type { Route } from "./+types/runs.$runId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.view.version.title ?? "Run"} · Cluepath` }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  return { view: await getRunView(ctx, params.runId) };
});

export default function RunnerRoute({ loaderData }: Route.ComponentProps) {
  return <Runner key={loaderData.view.run.id} initial={loaderData.view} />;
}

// A failure on this screen keeps the run's unsent steps on the phone and lists them.
export function ErrorBoundary({ error, params }: Route.ErrorBoundaryProps) {
  const { title, detail, again } = errorWords(error);
  return <RunnerError runId={params.runId} title={title} detail={detail} again={again} />;
}
