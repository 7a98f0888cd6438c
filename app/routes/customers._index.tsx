// /customers — the shop's customers, searched by name, site or address.
import { Form } from "react-router";
import { requireUser } from "~/lib/auth.server";
import { can } from "~/lib/policy";
import { page } from "~/lib/route.server";
import { listCustomers } from "~/models/equipment.server";
import type { Route } from "./+types/customers._index";

export const meta: Route.MetaFunction = () => [{ title: "Customers · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const q = (new URL(request.url).searchParams.get("q") ?? "").slice(0, 100);
  return { q, customers: await listCustomers(ctx, q), canEdit: can(ctx, "equipment.write") };
});

export default function Customers({ loaderData }: Route.ComponentProps) {
  return (
    <div className="space-y-4">
      <p>
        <a href="/equipment">← Equipment</a>
      </p>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h1 className="text-2xl font-bold">Customers</h1>
        {loaderData.canEdit && (
          <a href="/customers/new" className="btn-primary">
            New customer
          </a>
        )}
      </div>
      <Form method="get" role="search" className="flex gap-2">
        <label htmlFor="customers-q" className="sr-only">
          Search customers
        </label>
        <input
          id="customers-q"
          name="q"
          type="search"
          defaultValue={loaderData.q}
          placeholder="Name, site or address"
          className="field-input"
        />
        <button className="btn-quiet">Search</button>
      </Form>
      {loaderData.customers.length === 0 ? (
        <p className="card">{loaderData.q ? "No customer matches that search." : "No customers yet."}</p>
      ) : (
        <ul className="space-y-2">
          {loaderData.customers.map((c) => (
            <li key={c.id} className="card">
              <a href={`/customers/${c.id}`} className="text-lg font-semibold">
                {c.name}
              </a>
              <p className="text-ink-soft">
                {c.sites} site{c.sites === 1 ? "" : "s"}
                {c.phone ? ` · ${c.phone}` : ""}
              </p>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
