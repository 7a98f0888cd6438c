// /runs/:runId — the phone runner. The loader gives the first render; the runner then talks to the
// JSON routes under /api/runs/:runId through TanStack Query.
import { Runner } from "~/components/runner/Runner";
import { requireUser } from "~/lib/auth.server";
import { orNotFound } from "~/lib/http.server";
import { getRunView } from "~/models/runs.server";
import type { Route } from "./+types/runs.$runId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.view.version.title ?? "Run"} · Cluepath` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { view: orNotFound(await getRunView(user.ctx, params.runId), "That run") };
}

export default function RunnerRoute({ loaderData }: Route.ComponentProps) {
  return <Runner key={loaderData.view.run.id} initial={loaderData.view} />;
}
