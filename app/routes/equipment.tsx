import { requireUser } from "~/lib/auth.server";
import { listUnits } from "~/models/equipment.server";
import type { Route } from "./+types/equipment";

export const meta: Route.MetaFunction = () => [{ title: "Equipment · Cluepath" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { units: await listUnits(user.ctx) };
}

export default function Equipment({ loaderData }: Route.ComponentProps) {
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Equipment</h1>
      <p className="text-ink-soft">Units your shop services, by customer and site.</p>
      {loaderData.units.length === 0 ? (
        <p className="card">No equipment recorded yet.</p>
      ) : (
        <ul className="space-y-2">
          {loaderData.units.map((u) => (
            <li key={u.id} className="card">
              <a href={`/equipment/${u.id}`} className="font-semibold">
                {u.make} {u.model}
              </a>{" "}
              <span className="text-ink-soft">· {u.category}</span>
              <p className="text-ink-soft">
                {u.customerName} — {u.siteName} · serial {u.serial}
              </p>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
