import { NotYet } from "~/components/Placeholder";
import { requireUser } from "~/lib/auth.server";
import { page } from "~/lib/route.server";
import { shopCounts } from "~/models/equipment.server";
import type { Route } from "./+types/overview";

export const meta: Route.MetaFunction = () => [{ title: "Overview · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const user = await requireUser(request);
  return { counts: await shopCounts(user.ctx), shopName: user.shopName };
});

export default function OwnerHome({ loaderData }: Route.ComponentProps) {
  const { counts } = loaderData;
  const tiles = [
    { label: "People", value: counts.people },
    { label: "Customers", value: counts.customers },
    { label: "Sites", value: counts.sites },
    { label: "Equipment units", value: counts.units },
  ];
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Overview</h1>
      <p className="text-ink-soft">{loaderData.shopName} at a glance.</p>
      <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4">
        {tiles.map((t) => (
          <div key={t.label} className="card">
            <dt className="text-sm text-ink-soft">{t.label}</dt>
            <dd className="text-3xl font-bold">{t.value}</dd>
          </div>
        ))}
      </dl>
      <NotYet title="Root causes and first-time fixes">
        The most common root causes by equipment and symptom, first-time-fix rate, time to diagnose and parts used
        will appear once technicians record runs.
      </NotYet>
    </div>
  );
}
