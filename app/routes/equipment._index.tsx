import { Form } from "react-router";
import { z } from "zod";
import { SelectField } from "~/components/FormFields";
import { CATEGORIES } from "~/engine/types";
import { requireUser } from "~/lib/auth.server";
import { page } from "~/lib/route.server";
import { searchUnits } from "~/models/equipment.server";
import { placeName } from "~/lib/display";
import type { Route } from "./+types/equipment._index";

export const meta: Route.MetaFunction = () => [{ title: "Equipment · Cluepath" }];

const filter = z.object({ q: z.string().trim().max(100).catch(""), category: z.enum([...CATEGORIES, ""]).catch("") });

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const f = filter.parse({ q: "", category: "", ...Object.fromEntries(new URL(request.url).searchParams) });
  return { filter: f, units: await searchUnits(ctx, { q: f.q, category: f.category || undefined }) };
});

export default function Equipment({ loaderData }: Route.ComponentProps) {
  const { filter: f, units } = loaderData;
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Equipment</h1>
      <p className="text-ink-soft">
        Units your shop services, by customer and site. See also <a href="/customers">customers and sites</a> and the{" "}
        <a href="/meters">shop's meters</a>.
      </p>
      <Form method="get" role="search" className="card grid gap-3 sm:grid-cols-[1fr_12rem_auto] sm:items-end">
        <div>
          <label htmlFor="units-q" className="field-label">
            Search
          </label>
          <input
            id="units-q"
            name="q"
            type="search"
            defaultValue={f.q}
            placeholder="Make, model, serial, site or customer"
            className="field-input"
          />
        </div>
        <SelectField label="Kind" name="category" defaultValue={f.category}>
          <option value="">All kinds</option>
          {CATEGORIES.map((c) => (
            <option key={c} value={c}>
              {c}
            </option>
          ))}
        </SelectField>
        <button className="btn-quiet">Show</button>
      </Form>
      {units.length === 0 ? (
        <p className="card">{f.q || f.category ? "No unit matches." : "No equipment recorded yet."}</p>
      ) : (
        <ul className="space-y-2">
          {units.map((u) => (
            <li key={u.id} className="card">
              <a href={`/equipment/${u.id}`} className="font-semibold">
                {u.make} {u.model}
              </a>{" "}
              <span className="text-ink-soft">· {u.category}</span>
              <p className="text-ink-soft">
                <a href={`/sites/${u.siteId}`}>{placeName(u.customerName, u.siteName)}</a> · serial {u.serial}
              </p>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
