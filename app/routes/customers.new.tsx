// /customers/new and /customers/:customerId/edit
import { data, Form, redirect } from "react-router";
import { Field } from "~/components/Field";
import { useFormState } from "~/components/useFormState";
import { requireRole } from "~/lib/auth.server";
import { parseForm } from "~/lib/forms";
import { notFound, orNotFound } from "~/lib/http.server";
import { createCustomer, customerInput, getCustomer, updateCustomer } from "~/models/equipment.server";
import type { Route } from "./+types/customers.new";

export const meta: Route.MetaFunction = ({ params }) => [{ title: `${params.customerId ? "Edit customer" : "New customer"} · Cluepath` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireRole(request, ["technician", "lead"]);
  if (!params.customerId) return { values: { name: "", phone: "" }, editing: null };
  const c = orNotFound(await getCustomer(user.ctx, params.customerId), "That customer");
  return { values: { name: c.name, phone: c.phone ?? "" }, editing: { id: c.id, name: c.name } };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireRole(request, ["technician", "lead"]);
  const form = await parseForm(request, customerInput);
  if (!form.ok) return data(form, { status: 400 });
  if (params.customerId) {
    if (!(await updateCustomer(user.ctx, params.customerId, form.data))) notFound("That customer");
    throw redirect(`/customers/${params.customerId}`);
  }
  throw redirect(`/customers/${await createCustomer(user.ctx, form.data)}`);
}

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
