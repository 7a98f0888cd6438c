// /calls/new and /calls/:callId/edit — open or change a service call (zod-validated, errors beside fields).
import { Form, redirect, useNavigation } from "react-router";
import { Field } from "~/components/Field";
import { SelectField, TextAreaField } from "~/components/FormFields";
import { requireUser } from "~/lib/auth.server";
import { CALL_PRIORITIES, CALL_STATUSES, PRIORITY_LABEL, STATUS_LABEL } from "~/lib/calls";
import { placeName } from "~/lib/display";
import { form, page, readForm } from "~/lib/route.server";
import { callEditInput, callFormChoices, callInput, createCall, getCall, updateCall } from "~/models/calls.server";
import type { Route } from "./+types/calls.new";

export const meta: Route.MetaFunction = ({ params }) => [{ title: `${params.callId ? "Edit call" : "New call"} · Cluepath` }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const user = await requireUser(request);
  const { units, people } = await callFormChoices(user.ctx);
  const existing = params.callId ? await getCall(user.ctx, params.callId) : null;
  const unitFromUrl = new URL(request.url).searchParams.get("unitId") ?? "";
  const values: Record<string, string> = existing
    ? {
        unitId: existing.call.unitId,
        symptom: existing.call.symptom,
        priority: existing.call.priority,
        assignedTo: existing.call.assignedTo ?? "",
        notes: existing.call.notes ?? "",
        status: existing.call.status,
      }
    : { unitId: unitFromUrl, symptom: "", priority: "normal", assignedTo: user.role === "technician" ? user.userId : "", notes: "" };
  return { units, people, values, editing: existing ? { id: existing.call.id, number: existing.call.number } : null };
});

export const action = form(async ({ request, params }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "calls.write");
  if (params.callId) {
    await updateCall(ctx, params.callId, await readForm(request, callEditInput));
    return redirect(`/calls/${params.callId}`);
  }
  const { id } = await createCall(ctx, await readForm(request, callInput));
  return redirect(`/calls/${id}`);
});

export default function CallForm({ loaderData, actionData }: Route.ComponentProps) {
  const v = actionData?.values ?? loaderData.values;
  const e: Record<string, string | undefined> = actionData?.errors ?? {};
  const busy = useNavigation().state !== "idle";
  const { editing } = loaderData;
  return (
    <div className="space-y-4">
      <p>
        <a href={editing ? `/calls/${editing.id}` : "/calls/all"} className="tap">
          ← {editing ? `Call ${editing.number}` : "Service calls"}
        </a>
      </p>
      <h1 className="text-2xl font-bold">{editing ? `Edit call ${editing.number}` : "New service call"}</h1>
      <Form method="post" className="card space-y-4" noValidate>
        <SelectField label="Unit" name="unitId" defaultValue={v.unitId} error={e.unitId} hint="The equipment the customer called about.">
          <option value="">Choose a unit…</option>
          {loaderData.units.map((u) => (
            <option key={u.id} value={u.id}>
              {placeName(u.customerName, u.siteName)}: {u.make} {u.model} ({u.serial})
            </option>
          ))}
        </SelectField>
        <Field
          label="Reported symptom"
          name="symptom"
          defaultValue={v.symptom}
          error={e.symptom}
          hint="In the customer's words, e.g. “heats unevenly”."
        />
        <SelectField label="Priority" name="priority" defaultValue={v.priority} error={e.priority}>
          {CALL_PRIORITIES.map((p) => (
            <option key={p} value={p}>
              {PRIORITY_LABEL[p]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Assigned technician" name="assignedTo" defaultValue={v.assignedTo} error={e.assignedTo}>
          <option value="">Nobody yet</option>
          {loaderData.people.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
            </option>
          ))}
        </SelectField>
        {editing && (
          <SelectField label="Status" name="status" defaultValue={v.status} error={e.status}>
            {CALL_STATUSES.map((s) => (
              <option key={s} value={s}>
                {STATUS_LABEL[s]}
              </option>
            ))}
          </SelectField>
        )}
        <TextAreaField label="Notes for the technician" name="notes" defaultValue={v.notes} error={e.notes} />
        <button className="btn-primary w-full sm:w-auto" disabled={busy}>
          {editing ? "Save the call" : "Open the call"}
        </button>
      </Form>
    </div>
  );
}
