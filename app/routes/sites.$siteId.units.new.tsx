// /sites/:siteId/units/new and /equipment/:unitId/edit
import { data, Form, redirect } from "react-router";
import { Field } from "~/components/Field";
import { useFormState } from "~/components/useFormState";
import { SelectField } from "~/components/FormFields";
import { CATEGORIES } from "~/engine/types";
import { requireRole } from "~/lib/auth.server";
import { parseForm } from "~/lib/forms";
import { notFound, orNotFound } from "~/lib/http.server";
import { createUnit, getSiteWithCustomer, getUnit, unitInput, updateUnit } from "~/models/equipment.server";
import type { Route } from "./+types/sites.$siteId.units.new";

export const meta: Route.MetaFunction = ({ params }) => [{ title: `${params.unitId ? "Edit unit" : "New unit"} · Cluepath` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireRole(request, ["technician", "lead"]);
  if (params.unitId) {
    const { unit, site } = orNotFound(await getUnit(user.ctx, params.unitId), "That equipment unit");
    return { values: { category: unit.category, make: unit.make, model: unit.model, serial: unit.serial, installedOn: unit.installedOn ?? "" }, siteName: site.name, back: `/equipment/${unit.id}`, editing: true };
  }
  const { site } = orNotFound(await getSiteWithCustomer(user.ctx, params.siteId ?? ""), "That site");
  return { values: { category: "", make: "", model: "", serial: "", installedOn: "" }, siteName: site.name, back: `/sites/${site.id}`, editing: false };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireRole(request, ["technician", "lead"]);
  const form = await parseForm(request, unitInput);
  if (!form.ok) return data(form, { status: 400 });
  if (params.unitId) {
    if (!(await updateUnit(user.ctx, params.unitId, form.data))) notFound("That equipment unit");
    throw redirect(`/equipment/${params.unitId}`);
  }
  const id = orNotFound(await createUnit(user.ctx, params.siteId ?? "", form.data), "That site");
  throw redirect(`/equipment/${id}`);
}

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
