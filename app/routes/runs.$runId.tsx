// /runs/:runId — the phone runner. The loader gives the first render; the runner then talks to the
// JSON routes under /api/runs/:runId and keeps the run on the phone (components/runner/offline).
// The service worker keeps this page's empty shell (no user, no data): with no signal the runner
// opens from what the phone stored. A run this phone started offline and has not synced yet is a
// 404 on the server, so the page answers 404 and lets the phone show it if it has it.
import { useMemo } from "react";
import { data } from "react-router";
import { errorWords } from "~/components/errorWords";
import { RunFromPhone } from "~/components/runner/offline/RunFromPhone";
import { Runner } from "~/components/runner/Runner";
import { RunnerError } from "~/components/runner/RunnerError";
import { requireUser } from "~/lib/auth.server";
import { isShellRequest } from "~/lib/field-kit";
import { isRefusal } from "~/lib/refusal";
import type { RunView } from "~/lib/run-log";
import { page } from "~/lib/route.server";
import { versionPartJson } from "~/lib/run-json.server";
import { getRunView } from "~/models/runs/view.server";
import type { Route } from "./+types/runs.$runId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.view?.version.title ?? "Run"} · Cluepath` }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  if (isShellRequest(request)) return { view: null };
  const { ctx } = await requireUser(request);
  try {
    const full = await getRunView(ctx, params.runId);
    // The version's tree and step bodies, most of the page's data, travel as JSON text serialised
    // once per version: the page's data encoder then copies one string instead of walking the tree.
    const { tree: _t, bodies: _b, description: _d, ...view } = full;
    return { view, version: versionPartJson(full) };
  } catch (e) {
    if (isRefusal(e) && e.kind === "not-found") return data({ view: null, missing: true }, { status: 404 });
    throw e;
  }
});

export default function RunnerRoute({ loaderData, params }: Route.ComponentProps) {
  const view = loaderData.view;
  const version = "version" in loaderData ? loaderData.version : null;
  const initial = useMemo(
    (): RunView | null =>
      view && version ? { ...view, ...(JSON.parse(version) as Pick<RunView, "tree" | "bodies" | "description">) } : null,
    [view, version],
  );
  if (initial) return <Runner key={initial.run.id} initial={initial} />;
  return <RunFromPhone runId={params.runId} missing={"missing" in loaderData} />;
}

// A failure on this screen lists what the phone's outbox still holds of the run (it is sent later).
export function ErrorBoundary({ error, params }: Route.ErrorBoundaryProps) {
  const { title, detail, again } = errorWords(error);
  return <RunnerError runId={params.runId} title={title} detail={detail} again={again} />;
}
