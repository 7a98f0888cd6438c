// /customers/:customerId/sites/new and /sites/:siteId/edit
import { data, Form, redirect } from "react-router";
import { Field } from "~/components/Field";
import { useFormState } from "~/components/useFormState";
import { requireRole } from "~/lib/auth.server";
import { parseForm } from "~/lib/forms";
import { notFound, orNotFound } from "~/lib/http.server";
import { createSite, getCustomer, getSiteWithCustomer, siteInput, updateSite } from "~/models/equipment.server";
import type { Route } from "./+types/customers.$customerId.sites.new";

export const meta: Route.MetaFunction = ({ params }) => [{ title: `${params.siteId ? "Edit site" : "New site"} · Cluepath` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireRole(request, ["technician", "lead"]);
  if (params.siteId) {
    const { site, customer } = orNotFound(await getSiteWithCustomer(user.ctx, params.siteId), "That site");
    return { values: { name: site.name, address: site.address, contactName: site.contactName, contactEmail: site.contactEmail }, customer, siteId: site.id };
  }
  const customer = orNotFound(await getCustomer(user.ctx, params.customerId ?? ""), "That customer");
  return { values: { name: "", address: "", contactName: "", contactEmail: "" }, customer, siteId: null };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireRole(request, ["technician", "lead"]);
  const form = await parseForm(request, siteInput);
  if (!form.ok) return data(form, { status: 400 });
  if (params.siteId) {
    if (!(await updateSite(user.ctx, params.siteId, form.data))) notFound("That site");
    throw redirect(`/sites/${params.siteId}`);
  }
  const id = orNotFound(await createSite(user.ctx, params.customerId ?? "", form.data), "That customer");
  throw redirect(`/sites/${id}`);
}

export default function SiteForm({ loaderData, actionData }: Route.ComponentProps) {
  const { v, e, busy } = useFormState(loaderData.values, actionData);
  return (
    <div className="space-y-4">
      <p>
        <a href={loaderData.siteId ? `/sites/${loaderData.siteId}` : `/customers/${loaderData.customer.id}`}>← Back</a>
      </p>
      <h1 className="text-2xl font-bold">{loaderData.siteId ? "Edit site" : `New site for ${loaderData.customer.name}`}</h1>
      <Form method="post" className="card space-y-4" noValidate>
        <Field label="Site name" name="name" defaultValue={v.name} error={e.name} hint="e.g. Deli counter, Central kitchen." />
        <Field label="Address" name="address" defaultValue={v.address} error={e.address} />
        <Field label="Contact name" name="contactName" defaultValue={v.contactName} error={e.contactName} hint="Service reports go to this person." />
        <Field label="Contact e-mail" name="contactEmail" type="email" defaultValue={v.contactEmail} error={e.contactEmail} />
        <button className="btn-primary" disabled={busy}>
          {loaderData.siteId ? "Save" : "Add the site"}
        </button>
      </Form>
    </div>
  );
}
