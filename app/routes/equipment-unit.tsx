import { requireUser } from "~/lib/auth.server";
import { orNotFound } from "~/lib/http.server";
import { getUnit } from "~/models/equipment.server";
import type { Route } from "./+types/equipment-unit";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.unit.model ?? "Unit"} · Cluepath` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return orNotFound(await getUnit(user.ctx, params.unitId), "That equipment unit");
}

export default function EquipmentUnit({ loaderData }: Route.ComponentProps) {
  const { unit, site, customer } = loaderData;
  return (
    <div className="space-y-4">
      <p>
        <a href="/equipment">← All equipment</a>
      </p>
      <h1 className="text-2xl font-bold">
        {unit.make} {unit.model}
      </h1>
      <dl className="card grid grid-cols-[8rem_1fr] gap-x-3 gap-y-2">
        <dt className="text-ink-soft">Category</dt>
        <dd>{unit.category}</dd>
        <dt className="text-ink-soft">Serial</dt>
        <dd>{unit.serial}</dd>
        <dt className="text-ink-soft">Installed</dt>
        <dd>{unit.installedOn ?? "not recorded"}</dd>
        <dt className="text-ink-soft">Customer</dt>
        <dd>{customer.name}</dd>
        <dt className="text-ink-soft">Site</dt>
        <dd>
          {site.name}
          <br />
          <span className="text-ink-soft">{site.address}</span>
        </dd>
        <dt className="text-ink-soft">Site contact</dt>
        <dd>
          {site.contactName} · {site.contactEmail}
        </dd>
      </dl>
      <section className="card">
        <h2 className="mb-2 text-lg font-bold">Nameplate</h2>
        {Object.keys(unit.nameplate).length === 0 ? (
          <p className="text-ink-soft">No ratings recorded.</p>
        ) : (
          <ul>
            {Object.entries(unit.nameplate).map(([k, v]) => (
              <li key={k}>
                <span className="text-ink-soft">{k}:</span> {v.value} {v.unit}
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
