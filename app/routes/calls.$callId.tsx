// /calls/:callId — one service call: the unit and site, its runs, and starting a run on a suggested tree.
import { Form, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { PriorityBadge, StatusBadge } from "~/components/CallBadges";
import { requireUser } from "~/lib/auth.server";
import { atShop, placeName } from "~/lib/display";
import { can } from "~/lib/policy";
import { openRunLine, RUN_STATUS_LABEL } from "~/lib/calls";
import { isRefusal } from "~/lib/refusal";
import { reportNumber } from "~/lib/report-data";
import { isBestMatch } from "~/lib/tree-match";
import { categoryLabel } from "~/components/editor/kinds";
import { form, page, readForm } from "~/lib/route.server";
import { getCall, suggestTrees } from "~/models/calls.server";
import { runsOfCall } from "~/models/runs/queries.server";
import { startRun } from "~/models/runs/start.server";
import { shopTimeZone } from "~/models/shop.server";
import type { Route } from "./+types/calls.$callId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `Call ${data.call.call.number} · Cluepath` : "Call · Cluepath" }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const call = await getCall(ctx, params.callId);
  const [runs, trees, tz] = await Promise.all([
    runsOfCall(ctx, call.call.id),
    suggestTrees(ctx, call.unit, call.call.symptom),
    shopTimeZone(ctx),
  ]);
  const open = runs.find((r) => r.status === "active" || r.status === "paused" || r.status === "escalated");
  const openRun = open ? { id: open.id, status: open.status, holder: open.technician, heldByMe: open.technicianId === ctx.userId } : null;
  const canRun = can(ctx, "runs.start") && !openRun && call.call.status !== "done" && call.call.status !== "cancelled";
  return { call, runs, trees, openRun, canRun, tz, canEdit: can(ctx, "calls.write") };
});

const startForm = z.object({ treeId: z.string({ message: "Choose a procedure to run." }).uuid("Choose a procedure to run.") });

export const action = form(async ({ request, params }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "runs.start");
  const { treeId } = await readForm(request, startForm);
  try {
    const { runId } = await startRun(ctx, { treeId, callId: params.callId });
    return redirect(`/runs/${runId}`);
  } catch (e) {
    // The call already has a run in progress: carry on with that one.
    if (isRefusal(e) && typeof e.details?.runId === "string") return redirect(`/runs/${e.details.runId}`);
    throw e;
  }
});

export default function Call({ loaderData, actionData }: Route.ComponentProps) {
  const { call: c, runs, trees, openRun } = loaderData;
  const busy = useNavigation().state !== "idle";
  const matching = trees.filter((t) => t.fits);
  const others = trees.filter((t) => !t.fits);
  const best = isBestMatch(matching[0]);
  return (
    <div className="space-y-5">
      <p>
        <a href="/calls" className="tap">
          ← My calls
        </a>
      </p>
      <div>
        <div className="flex flex-wrap items-center gap-2">
          <h1 className="text-2xl font-bold">Call {c.call.number}</h1>
          <PriorityBadge priority={c.call.priority} />
          <StatusBadge status={c.call.status} />
        </div>
        <p className="mt-1 text-xl font-semibold">“{c.call.symptom}”</p>
        {loaderData.canEdit && (
          <p>
            <a href={`/calls/${c.call.id}/edit`} className="tap">
              Edit the call
            </a>
          </p>
        )}
      </div>

      {openRun && (
        <a href={`/runs/${openRun.id}`} className={`${openRun.heldByMe ? "btn-primary" : "btn-quiet"} min-h-16 w-full text-xl`}>
          {openRunLine(openRun)} →
        </a>
      )}

      <dl className="card grid grid-cols-[7.5rem_1fr] gap-x-3 gap-y-2">
        <dt className="text-ink-soft">Unit</dt>
        <dd>
          <a href={`/equipment/${c.unit.id}`} className="tap">
            {c.unit.make} {c.unit.model}
          </a>
          <br />
          <span className="text-ink-soft">serial {c.unit.serial}</span>
        </dd>
        <dt className="text-ink-soft">Site</dt>
        <dd>
          <a href={`/sites/${c.site.id}`} className="tap">
            {placeName(c.customer.name, c.site.name)}
          </a>
          <br />
          <span className="text-ink-soft">{c.site.address}</span>
        </dd>
        <dt className="text-ink-soft">Contact</dt>
        <dd>
          {c.site.contactName} · {c.site.contactEmail}
        </dd>
        <dt className="text-ink-soft">Assigned to</dt>
        <dd>{c.assigneeName ?? "Nobody yet"}</dd>
        <dt className="text-ink-soft">Opened</dt>
        <dd>{atShop(c.call.openedAt, loaderData.tz)}</dd>
        {c.call.notes && (
          <>
            <dt className="text-ink-soft">Notes</dt>
            <dd>{c.call.notes}</dd>
          </>
        )}
      </dl>

      {loaderData.canRun && (
        <section className="space-y-3" aria-labelledby="start-run">
          <h2 id="start-run" className="text-xl font-bold">
            Start a diagnosis
          </h2>
          {actionData?.message && (
            <p role="alert" className="field-error">
              {actionData.message}
            </p>
          )}
          {matching.length === 0 ? (
            <p className="card">
              No published procedure covers this kind of equipment yet. Ask a lead to write one, or pick one below if it fits.
            </p>
          ) : (
            <p className="text-ink-soft">Procedures for this kind of equipment, closest to the reported symptom first:</p>
          )}
          <ul className="space-y-3">
            {matching.map((t, i) => (
              <li key={t.treeId} className={`card space-y-2 ${i === 0 && best ? "border-2 border-copper" : ""}`}>
                {i === 0 && best && (
                  <p className="text-sm font-bold uppercase tracking-wide text-copper-dark">Best match for “{c.call.symptom}”</p>
                )}
                <p className="text-lg font-bold">{t.title}</p>
                <p className="text-ink-soft">
                  {t.symptom} · version {t.number}
                </p>
                <Form method="post">
                  <input type="hidden" name="treeId" value={t.treeId} />
                  <button className="btn-primary min-h-14 w-full" disabled={busy} aria-label={`Start this procedure: ${t.title}`}>
                    Start this procedure
                  </button>
                </Form>
              </li>
            ))}
          </ul>
          {others.length > 0 && (
            <details className="card">
              <summary className="min-h-12 cursor-pointer py-2 font-semibold">Other procedures ({others.length})</summary>
              <ul className="mt-2 space-y-2">
                {others.map((t) => (
                  <li key={t.treeId} className="flex flex-wrap items-center justify-between gap-2 border-t border-rule pt-2">
                    <span>
                      {t.title}{" "}
                      <span className="text-ink-soft">
                        · {categoryLabel(t.category)}
                        {t.otherKind && ` — written for ${t.otherKind}`}
                      </span>
                    </span>
                    <Form method="post">
                      <input type="hidden" name="treeId" value={t.treeId} />
                      <button className="btn-quiet min-h-12 text-base" disabled={busy} aria-label={`Start: ${t.title}`}>
                        Start
                      </button>
                    </Form>
                  </li>
                ))}
              </ul>
            </details>
          )}
        </section>
      )}

      <section>
        <h2 className="mb-2 text-xl font-bold">Runs on this call</h2>
        {runs.length === 0 ? (
          <p className="text-ink-soft">None yet.</p>
        ) : (
          <ul className="space-y-2">
            {runs.map((r) => (
              <li key={r.id} className="card">
                <a href={`/runs/${r.id}`} className="tap font-semibold">
                  {r.treeTitle} (v{r.versionNumber})
                </a>
                <p>
                  {RUN_STATUS_LABEL[r.status]} · {r.technician}
                </p>
                {r.rootCause && <p>Root cause: {r.rootCause}</p>}
                {r.abandonReason && <p className="text-ink-soft">Abandoned: {r.abandonReason}</p>}
                {r.reportId && (
                  <p>
                    <a href={`/reports/${r.reportId}`} className="tap">
                      Service report {reportNumber(r.reportNumber!)}
                    </a>
                  </p>
                )}
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
