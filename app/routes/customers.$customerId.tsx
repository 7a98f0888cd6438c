// /customers/:customerId — a customer and their sites.
import { requireUser } from "~/lib/auth.server";
import { can } from "~/lib/policy";
import { page } from "~/lib/route.server";
import { getCustomer, sitesOf } from "~/models/equipment.server";
import type { Route } from "./+types/customers.$customerId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.customer.name ?? "Customer"} · Cluepath` }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const customer = await getCustomer(ctx, params.customerId);
  return { customer, sites: await sitesOf(ctx, customer.id), canEdit: can(ctx, "equipment.write") };
});

export default function Customer({ loaderData }: Route.ComponentProps) {
  const { customer, sites } = loaderData;
  return (
    <div className="space-y-4">
      <p>
        <a href="/customers">← Customers</a>
      </p>
      <h1 className="text-2xl font-bold">{customer.name}</h1>
      <p className="text-ink-soft">
        {customer.phone ?? "No phone recorded"}
        {loaderData.canEdit && (
          <>
            {" · "}
            <a href={`/customers/${customer.id}/edit`}>Edit</a>
          </>
        )}
      </p>
      <div className="flex items-center justify-between">
        <h2 className="text-xl font-bold">Sites</h2>
        {loaderData.canEdit && (
          <a href={`/customers/${customer.id}/sites/new`} className="btn-quiet">
            Add a site
          </a>
        )}
      </div>
      {sites.length === 0 ? (
        <p className="card">No sites yet.</p>
      ) : (
        <ul className="space-y-2">
          {sites.map(({ site, units }) => (
            <li key={site.id} className="card">
              <a href={`/sites/${site.id}`} className="text-lg font-semibold">
                {site.name}
              </a>
              <p className="text-ink-soft">{site.address}</p>
              <p className="text-ink-soft">
                Contact: {site.contactName} · {site.contactEmail} · {units} unit{units === 1 ? "" : "s"}
              </p>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
