// /sites/:siteId/units/new and /equipment/:unitId/edit
import { Form, redirect } from "react-router";
import { Field } from "~/components/Field";
import { useFormState } from "~/components/useFormState";
import { SelectField } from "~/components/FormFields";
import { CATEGORIES } from "~/engine/types";
import { requireUser } from "~/lib/auth.server";
import { authorize } from "~/lib/policy";
import { form, page, readForm } from "~/lib/route.server";
import { createUnit, getSiteWithCustomer, getUnit, unitInput, updateUnit } from "~/models/equipment.server";
import type { Route } from "./+types/sites.$siteId.units.new";

export const meta: Route.MetaFunction = ({ params }) => [{ title: `${params.unitId ? "Edit unit" : "New unit"} · Cluepath` }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  // A form only: the page is for those who may save it.
  authorize(ctx, "equipment.write");
  if (params.unitId) {
    const { unit, site } = await getUnit(ctx, params.unitId);
    return {
      values: { category: unit.category, make: unit.make, model: unit.model, serial: unit.serial, installedOn: unit.installedOn ?? "" },
      siteName: site.name,
      back: `/equipment/${unit.id}`,
      editing: true,
    };
  }
  const { site } = await getSiteWithCustomer(ctx, params.siteId ?? "");
  return {
    values: { category: "", make: "", model: "", serial: "", installedOn: "" },
    siteName: site.name,
    back: `/sites/${site.id}`,
    editing: false,
  };
});

export const action = form(async ({ request, params }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "equipment.write");
  const input = await readForm(request, unitInput);
  if (params.unitId) {
    await updateUnit(ctx, params.unitId, input);
    return redirect(`/equipment/${params.unitId}`);
  }
  return redirect(`/equipment/${await createUnit(ctx, params.siteId ?? "", input)}`);
});

export default function UnitForm({ loaderData, actionData }: Route.ComponentProps) {
  const { v, e, busy } = useFormState(loaderData.values, actionData);
  return (
    <div className="space-y-4">
      <p>
        <a href={loaderData.back}>← Back</a>
      </p>
      <h1 className="text-2xl font-bold">{loaderData.editing ? "Edit unit" : `New unit at ${loaderData.siteName}`}</h1>
      <Form method="post" className="card space-y-4" noValidate>
        <SelectField label="Kind of equipment" name="category" defaultValue={v.category} error={e.category}>
          <option value="">Choose…</option>
          {CATEGORIES.map((c) => (
            <option key={c} value={c}>
              {c}
            </option>
          ))}
        </SelectField>
        <Field label="Make" name="make" defaultValue={v.make} error={e.make} />
        <Field label="Model" name="model" defaultValue={v.model} error={e.model} />
        <Field label="Serial number" name="serial" defaultValue={v.serial} error={e.serial} />
        <Field label="Installed on" name="installedOn" type="date" defaultValue={v.installedOn} error={e.installedOn} hint="Optional." />
        <button className="btn-primary" disabled={busy}>
          {loaderData.editing ? "Save" : "Add the unit"}
        </button>
      </Form>
    </div>
  );
}
