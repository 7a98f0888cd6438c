// /escalations — runs technicians handed to a lead, oldest first: read the run, take it over.
import { Form, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { requireUser } from "~/lib/auth.server";
import { fromClient } from "~/lib/http.server";
import { atShop, placeName } from "~/lib/display";
import { form, page, readForm } from "~/lib/route.server";
import { changeRunStatus } from "~/models/runs/lifecycle.server";
import { listOpenEscalations } from "~/models/runs/queries.server";
import { shopTimeZone } from "~/models/shop.server";
import type { Route } from "./+types/escalations";

export const meta: Route.MetaFunction = () => [{ title: "Escalations · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const [escalations, tz] = await Promise.all([listOpenEscalations(ctx), shopTimeZone(ctx)]);
  return { escalations, tz };
});

const TakeOver = z.object({ runId: z.string({ message: "Choose a run to take over." }).uuid("Choose a run to take over.") });

export const action = form(async ({ request, context }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "runs.take-over");
  const { runId } = await readForm(request, TakeOver);
  await changeRunStatus(fromClient(ctx, context), runId, { action: "take-over" });
  return redirect(`/runs/${runId}`);
});

export default function Escalations({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const list = loaderData.escalations;
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Escalations</h1>
      <p className="text-ink-soft">Runs a technician has handed to a lead. Read the run so far, then take it over to carry on.</p>
      {actionData?.message && (
        <p role="alert" className="field-error">
          {actionData.message}
        </p>
      )}
      {list.length === 0 ? (
        <p className="card">No open escalations.</p>
      ) : (
        <ul className="space-y-3">
          {list.map((e) => (
            <li key={e.id} className="card space-y-2">
              <p className="text-sm font-bold uppercase tracking-wide text-marginal">
                {e.fromTree ? "The procedure sent it on" : "Asked for help"} · {atShop(e.raisedAt, loaderData.tz)}
              </p>
              <p className="text-lg font-semibold">“{e.reason}”</p>
              <p>
                {e.raisedBy}
                {e.callNumber ? ` · call ${e.callNumber}` : ""}
                {e.customerName ? ` · ${placeName(e.customerName, e.siteName ?? "")}` : ""}
                {e.model ? ` · ${e.model}` : ""}
              </p>
              <p className="text-ink-soft">
                {e.treeTitle}: stopped at “{e.nodeTitle ?? "the start"}” after {e.stepCount} step{e.stepCount === 1 ? "" : "s"}
              </p>
              <div className="flex flex-wrap gap-2">
                <a href={`/runs/${e.runId}`} className="btn-quiet">
                  Read the run
                </a>
                <Form method="post">
                  <input type="hidden" name="runId" value={e.runId} />
                  <button className="btn-primary" disabled={busy}>
                    Take it over
                  </button>
                </Form>
              </div>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
