// /runs/:runId — the phone runner. The loader gives the first render; the runner then talks to the
// JSON routes under /api/runs/:runId and keeps the run on the phone (components/runner/offline).
// The service worker keeps this page's empty shell (no user, no data): with no signal the runner
// opens from what the phone stored. A run this phone started offline and has not synced yet is a
// 404 on the server, so the page answers 404 and lets the phone show it if it has it.
import { data } from "react-router";
import { Runner } from "~/components/runner/Runner";
import { RunFromPhone } from "~/components/runner/offline/RunFromPhone";
import { errorWords } from "~/components/errorWords";
import { RunnerError } from "~/components/runner/RunnerError";
import { requireUser } from "~/lib/auth.server";
import { isShellRequest } from "~/lib/field-kit";
import { isRefusal } from "~/lib/refusal";
import { page } from "~/lib/route.server";
import { getRunView } from "~/models/runs/view.server";
import type { Route } from "./+types/runs.$runId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.view?.version.title ?? "Run"} · Cluepath` }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  if (isShellRequest(request)) return { view: null };
  const { ctx } = await requireUser(request);
  try {
    return { view: await getRunView(ctx, params.runId) };
  } catch (e) {
    if (isRefusal(e) && e.kind === "not-found") return data({ view: null, missing: true }, { status: 404 });
    throw e;
  }
});

export default function RunnerRoute({ loaderData, params }: Route.ComponentProps) {
  if (loaderData.view) return <Runner key={loaderData.view.run.id} initial={loaderData.view} />;
  return <RunFromPhone runId={params.runId} missing={"missing" in loaderData} />;
}

// A failure on this screen keeps the run's unsent steps on the phone and lists them.
export function ErrorBoundary({ error, params }: Route.ErrorBoundaryProps) {
  const { title, detail, again } = errorWords(error);
  return <RunnerError runId={params.runId} title={title} detail={detail} again={again} />;
}
