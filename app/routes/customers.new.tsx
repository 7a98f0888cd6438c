// /customers/new and /customers/:customerId/edit
import { Form, redirect } from "react-router";
import { Field } from "~/components/Field";
import { useFormState } from "~/components/useFormState";
import { requireUser } from "~/lib/auth.server";
import { authorize } from "~/lib/policy";
import { form, page, readForm } from "~/lib/route.server";
import { createCustomer, customerInput, getCustomer, updateCustomer } from "~/models/equipment.server";
import type { Route } from "./+types/customers.new";

export const meta: Route.MetaFunction = ({ params }) => [{ title: `${params.customerId ? "Edit customer" : "New customer"} · Cluepath` }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  // A form only: the page is for those who may save it.
  authorize(ctx, "equipment.write");
  if (!params.customerId) return { values: { name: "", phone: "" }, editing: null };
  const c = await getCustomer(ctx, params.customerId);
  return { values: { name: c.name, phone: c.phone ?? "" }, editing: { id: c.id, name: c.name } };
});

export const action = form(async ({ request, params }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "equipment.write");
  const input = await readForm(request, customerInput);
  if (params.customerId) {
    await updateCustomer(ctx, params.customerId, input);
    return redirect(`/customers/${params.customerId}`);
  }
  return redirect(`/customers/${await createCustomer(ctx, input)}`);
});

export default function CustomerForm({ loaderData, actionData }: Route.ComponentProps) {
  const { v, e, busy } = useFormState(loaderData.values, actionData);
  const { editing } = loaderData;
  return (
    <div className="space-y-4">
      <p>
        <a href={editing ? `/customers/${editing.id}` : "/customers"}>← {editing ? editing.name : "Customers"}</a>
      </p>
      <h1 className="text-2xl font-bold">{editing ? "Edit customer" : "New customer"}</h1>
      <Form method="post" className="card space-y-4" noValidate>
        <Field label="Name" name="name" defaultValue={v.name} error={e.name} />
        <Field label="Phone" name="phone" type="tel" defaultValue={v.phone} error={e.phone} hint="Optional." />
        <button className="btn-primary" disabled={busy}>
          {editing ? "Save" : "Add the customer"}
        </button>
      </Form>
    </div>
  );
}
