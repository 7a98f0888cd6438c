// /meters/:meterId — edit a meter range. Steps already taken keep the accuracy they were judged with.
import { Form, redirect } from "react-router";
import { MeterFields } from "~/components/MeterFields";
import { useFormState } from "~/components/useFormState";
import { requireUser } from "~/lib/auth.server";
import { authorize } from "~/lib/policy";
import { form, page, readForm } from "~/lib/route.server";
import { getMeter, meterInput, updateMeter } from "~/models/meters.server";
import type { Route } from "./+types/meters.$meterId";

export const meta: Route.MetaFunction = () => [{ title: "Edit meter · Cluepath" }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  // A form only: the page is for those who keep the list.
  authorize(ctx, "meters.manage");
  const m = await getMeter(ctx, params.meterId);
  const values: Record<string, string> = {
    name: m.name,
    quantity: m.quantity,
    unit: m.unit,
    rangeMax: String(m.rangeMax),
    resolution: String(m.resolution),
    percent: String(m.percent),
    counts: String(m.counts),
  };
  return { values };
});

export const action = form(async ({ request, params }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "meters.manage");
  await updateMeter(ctx, params.meterId, await readForm(request, meterInput));
  return redirect("/meters");
});

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
