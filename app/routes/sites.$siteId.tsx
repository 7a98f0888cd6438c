// /sites/:siteId — a site (address, the contact who gets service reports) and its units.
import { categoryLabel } from "~/components/editor/kinds";
import { requireUser } from "~/lib/auth.server";
import { can } from "~/lib/policy";
import { page } from "~/lib/route.server";
import { getSiteWithCustomer, unitsAt } from "~/models/equipment.server";
import type { Route } from "./+types/sites.$siteId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.site.name ?? "Site"} · Cluepath` }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const { site, customer } = await getSiteWithCustomer(ctx, params.siteId);
  return { site, customer, units: await unitsAt(ctx, site.id), canEdit: can(ctx, "equipment.write") };
});

export default function Site({ loaderData }: Route.ComponentProps) {
  const { site, customer, units } = loaderData;
  return (
    <div className="space-y-4">
      <p>
        <a href={`/customers/${customer.id}`} className="tap">
          ← {customer.name}
        </a>
      </p>
      <h1 className="text-2xl font-bold">{site.name}</h1>
      <dl className="card grid grid-cols-[7rem_1fr] gap-x-3 gap-y-2">
        <dt className="text-ink-soft">Address</dt>
        <dd>{site.address}</dd>
        <dt className="text-ink-soft">Contact</dt>
        <dd>
          {site.contactName} · {site.contactEmail}
        </dd>
      </dl>
      {loaderData.canEdit && (
        <p>
          <a href={`/sites/${site.id}/edit`} className="tap">
            Edit the site
          </a>
        </p>
      )}
      <div className="flex items-center justify-between">
        <h2 className="text-xl font-bold">Equipment here</h2>
        {loaderData.canEdit && (
          <a href={`/sites/${site.id}/units/new`} className="btn-quiet">
            Add a unit
          </a>
        )}
      </div>
      {units.length === 0 ? (
        <p className="card">No equipment recorded at this site.</p>
      ) : (
        <ul className="space-y-2">
          {units.map((u) => (
            <li key={u.id}>
              <a href={`/equipment/${u.id}`} className="card block text-ink no-underline hover:border-copper">
                <span className="font-semibold text-copper-dark underline">
                  {u.make} {u.model}
                </span>
                <span className="block text-ink-soft">
                  {categoryLabel(u.category)} · serial {u.serial}
                </span>
              </a>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
