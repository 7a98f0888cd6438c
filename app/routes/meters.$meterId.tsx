// /meters/:meterId — edit a meter range. Steps already taken keep the accuracy they were judged with.
import { data, Form, redirect } from "react-router";
import { MeterFields } from "~/components/MeterFields";
import { useFormState } from "~/components/useFormState";
import { requireRole } from "~/lib/auth.server";
import { parseForm } from "~/lib/forms";
import { notFound, orNotFound } from "~/lib/http.server";
import { getMeter, meterInput, updateMeter } from "~/models/meters.server";
import type { Route } from "./+types/meters.$meterId";

export const meta: Route.MetaFunction = () => [{ title: "Edit meter · Cluepath" }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireRole(request, ["lead"]);
  const m = orNotFound(await getMeter(user.ctx, params.meterId), "That meter");
  const values: Record<string, string> = { name: m.name, quantity: m.quantity, unit: m.unit, rangeMax: String(m.rangeMax), resolution: String(m.resolution), percent: String(m.percent), counts: String(m.counts) };
  return { values };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireRole(request, ["lead"]);
  const form = await parseForm(request, meterInput);
  if (!form.ok) return data(form, { status: 400 });
  if (!(await updateMeter(user.ctx, params.meterId, form.data))) notFound("That meter");
  throw redirect("/meters");
}

export default function MeterEdit({ loaderData, actionData }: Route.ComponentProps) {
  const { v, e, busy } = useFormState(loaderData.values, actionData);
  return (
    <div className="space-y-4">
      <p>
        <a href="/meters">← Meters</a>
      </p>
      <h1 className="text-2xl font-bold">Edit meter</h1>
      <p className="text-ink-soft">Readings already taken keep the accuracy they were judged with.</p>
      <Form method="post" noValidate className="card space-y-4">
        <MeterFields v={v} e={e} />
        <button className="btn-primary" disabled={busy}>
          Save
        </button>
      </Form>
    </div>
  );
}
