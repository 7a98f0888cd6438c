import { StatusBadge } from "~/components/CallBadges";
import { categoryLabel } from "~/components/editor/kinds";
import { RUN_STATUS_LABEL } from "~/lib/calls";
import { atShop } from "~/lib/display";
import { requireUser } from "~/lib/auth.server";
import { can } from "~/lib/policy";
import { reportNumber } from "~/lib/report-data";
import { page } from "~/lib/route.server";
import { callsOfUnit } from "~/models/calls.server";
import { getUnit, unitRatings } from "~/models/equipment.server";
import { historyOfUnit } from "~/models/runs/queries.server";
import { shopTimeZone } from "~/models/shop.server";
import type { Route } from "./+types/equipment.$unitId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.unit.model ?? "Unit"} · Cluepath` }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const found = await getUnit(ctx, params.unitId);
  const [calls, history, ratings, tz] = await Promise.all([
    callsOfUnit(ctx, found.unit.id),
    historyOfUnit(ctx, found.unit.id),
    unitRatings(ctx, found.unit),
    shopTimeZone(ctx),
  ]);
  return { ...found, calls, history, ratings, tz, canEdit: can(ctx, "equipment.write") };
});

export default function EquipmentUnit({ loaderData }: Route.ComponentProps) {
  const { unit, site, customer, calls, history, ratings } = loaderData;
  const day = (d: Date | null) => atShop(d, loaderData.tz, "date");
  const causes = history.runs.filter((r) => r.status === "done" && r.rootCause);
  return (
    <div className="space-y-4">
      <p>
        <a href="/equipment" className="tap">
          ← All equipment
        </a>
      </p>
      <h1 className="text-2xl font-bold">
        {unit.make} {unit.model}
      </h1>
      {loaderData.canEdit && (
        <p className="flex flex-wrap gap-3">
          <a href={`/calls/new?unitId=${unit.id}`} className="btn-primary">
            Open a call on this unit
          </a>
          <a href={`/equipment/${unit.id}/edit`} className="btn-quiet">
            Edit
          </a>
        </p>
      )}
      <dl className="card grid grid-cols-[8rem_1fr] gap-x-3 gap-y-2">
        <dt className="text-ink-soft">Category</dt>
        <dd>{categoryLabel(unit.category)}</dd>
        <dt className="text-ink-soft">Serial</dt>
        <dd>{unit.serial}</dd>
        <dt className="text-ink-soft">Installed</dt>
        <dd>{unit.installedOn ?? "not recorded"}</dd>
        <dt className="text-ink-soft">Customer</dt>
        <dd>
          <a href={`/customers/${customer.id}`} className="tap">
            {customer.name}
          </a>
        </dd>
        <dt className="text-ink-soft">Site</dt>
        <dd>
          <a href={`/sites/${site.id}`} className="tap">
            {site.name}
          </a>
          <br />
          <span className="text-ink-soft">{site.address}</span>
        </dd>
        <dt className="text-ink-soft">Site contact</dt>
        <dd>
          {site.contactName} · {site.contactEmail}
        </dd>
      </dl>
      <section className="card" aria-labelledby="nameplate-heading">
        <h2 id="nameplate-heading" className="mb-2 text-lg font-bold">
          Nameplate
        </h2>
        {ratings.length === 0 ? (
          <p className="text-ink-soft">No ratings recorded.</p>
        ) : (
          <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-1">
            {ratings.map((r) => (
              <div key={r.key} className="contents">
                <dt className="text-ink-soft">{r.label}</dt>
                <dd className="text-right font-semibold whitespace-nowrap">
                  {r.value} {r.unit}
                </dd>
              </div>
            ))}
          </dl>
        )}
      </section>

      <section>
        <h2 className="mb-2 text-xl font-bold">History</h2>
        <h3 className="mb-1 font-bold">Root causes found</h3>
        {causes.length === 0 ? (
          <p className="mb-3 text-ink-soft">None recorded yet.</p>
        ) : (
          <ul className="mb-3 space-y-1">
            {causes.map((r) => (
              <li key={r.id}>
                {day(r.completedAt)} — <strong>{r.rootCause}</strong>
                {r.reportId && (
                  <>
                    <br />
                    <a href={`/reports/${r.reportId}`} className="tap">
                      Service report {reportNumber(r.reportNumber!)}
                    </a>
                  </>
                )}
              </li>
            ))}
          </ul>
        )}
        <h3 className="mb-1 font-bold">Parts replaced</h3>
        {history.parts.length === 0 ? (
          <p className="mb-3 text-ink-soft">None recorded yet.</p>
        ) : (
          <ul className="mb-3 space-y-1">
            {history.parts.map((p, i) => (
              <li key={i}>
                {day(p.completedAt)} — {p.quantity} × {p.description}
                {p.partNumber ? ` (${p.partNumber})` : ""}
                {p.callNumber ? ` · call ${p.callNumber}` : ""}
              </li>
            ))}
          </ul>
        )}
        <h3 className="mb-1 font-bold">Calls</h3>
        {calls.length === 0 ? (
          <p className="mb-3 text-ink-soft">No calls yet.</p>
        ) : (
          <ul className="mb-3 space-y-2">
            {calls.map((c) => (
              <li key={c.id}>
                <a href={`/calls/${c.id}`} className="card block text-ink no-underline hover:border-copper">
                  <span className="font-semibold text-copper-dark underline">Call {c.number}</span> <StatusBadge status={c.status} /> ·{" "}
                  {day(c.openedAt)} · “{c.symptom}”
                </a>
              </li>
            ))}
          </ul>
        )}
        <h3 className="mb-1 font-bold">Runs</h3>
        {history.runs.length === 0 ? (
          <p className="text-ink-soft">No runs yet.</p>
        ) : (
          <ul className="space-y-2">
            {history.runs.map((r) => (
              <li key={r.id}>
                <a href={`/runs/${r.id}`} className="card block text-ink no-underline hover:border-copper">
                  <span className="font-semibold text-copper-dark underline">{r.treeTitle}</span> (v{r.versionNumber}) · {r.technician} ·{" "}
                  {day(r.startedAt)} · {RUN_STATUS_LABEL[r.status]}
                </a>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
