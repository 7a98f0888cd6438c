// /customers/:customerId/sites/new and /sites/:siteId/edit
import { Form, redirect } from "react-router";
import { Field } from "~/components/Field";
import { useFormState } from "~/components/useFormState";
import { requireUser } from "~/lib/auth.server";
import { authorize } from "~/lib/policy";
import { form, page, readForm } from "~/lib/route.server";
import { createSite, getCustomer, getSiteWithCustomer, siteInput, updateSite } from "~/models/equipment.server";
import type { Route } from "./+types/customers.$customerId.sites.new";

export const meta: Route.MetaFunction = ({ params }) => [{ title: `${params.siteId ? "Edit site" : "New site"} · Cluepath` }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  // A form only: the page is for those who may save it.
  authorize(ctx, "equipment.write");
  if (params.siteId) {
    const { site, customer } = await getSiteWithCustomer(ctx, params.siteId);
    return {
      values: { name: site.name, address: site.address, contactName: site.contactName, contactEmail: site.contactEmail },
      customer,
      siteId: site.id,
    };
  }
  const customer = await getCustomer(ctx, params.customerId ?? "");
  return { values: { name: "", address: "", contactName: "", contactEmail: "" }, customer, siteId: null };
});

export const action = form(async ({ request, params }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "equipment.write");
  const input = await readForm(request, siteInput);
  if (params.siteId) {
    await updateSite(ctx, params.siteId, input);
    return redirect(`/sites/${params.siteId}`);
  }
  return redirect(`/sites/${await createSite(ctx, params.customerId ?? "", input)}`);
});

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
        <Field
          label="Contact name"
          name="contactName"
          defaultValue={v.contactName}
          error={e.contactName}
          hint="Service reports go to this person."
        />
        <Field label="Contact e-mail" name="contactEmail" type="email" defaultValue={v.contactEmail} error={e.contactEmail} />
        <button className="btn-primary" disabled={busy}>
          {loaderData.siteId ? "Save" : "Add the site"}
        </button>
      </Form>
    </div>
  );
}
