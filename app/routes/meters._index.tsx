// /meters — the shop's meters (one row per function and range) with their stated accuracy. Leads and
// owners keep the list; everyone sees it (the runner offers these when a reading is taken).
import { data, Form, useNavigation } from "react-router";
import { z } from "zod";
import { MeterFields } from "~/components/MeterFields";
import { describeMeter } from "~/engine/verdict";
import { requireRole, requireUser, roleAllows } from "~/lib/auth.server";
import { fieldErrors, formStrings } from "~/lib/forms";
import { notFound } from "~/lib/http.server";
import { createMeter, listMeters, meterInput, setMeterRetired } from "~/models/meters.server";
import { meterAccuracy } from "~/models/run-log";
import type { Route } from "./+types/meters._index";

export const meta: Route.MetaFunction = () => [{ title: "Meters · Cluepath" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const canEdit = roleAllows(user.role, ["lead"]);
  return { meters: await listMeters(user.ctx, { includeRetired: canEdit }), canEdit };
}

const retireForm = z.object({ intent: z.enum(["retire", "restore"]), id: z.string().uuid() });

export async function action({ request }: Route.ActionArgs) {
  const user = await requireRole(request, ["lead"]);
  const values = formStrings(await request.formData());
  if (values.intent === "retire" || values.intent === "restore") {
    const parsed = retireForm.safeParse(values);
    if (!parsed.success || !(await setMeterRetired(user.ctx, parsed.data.id, parsed.data.intent === "retire"))) notFound("That meter");
    return { kind: "retired" as const };
  }
  const parsed = meterInput.safeParse(values);
  if (!parsed.success) return data({ kind: "invalid" as const, values, errors: fieldErrors(parsed.error) }, { status: 400 });
  const id = await createMeter(user.ctx, parsed.data);
  return { kind: "created" as const, name: parsed.data.name, id };
}

export default function Meters({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const invalid = actionData?.kind === "invalid" ? actionData : undefined;
  return (
    <div className="space-y-5">
      <p>
        <a href="/equipment">← Equipment</a>
      </p>
      <h1 className="text-2xl font-bold">Meters</h1>
      <p className="text-ink-soft">Each function and range of a meter is its own entry, with the accuracy its manual states. Verdicts use it to tell a reading that is clearly within limits from one too close to call.</p>
      <ul className="space-y-2">
        {loaderData.meters.map((m) => (
          <li key={m.id} className={`card flex flex-wrap items-center justify-between gap-2 ${m.retired ? "opacity-60" : ""}`}>
            <div>
              <p className="font-semibold">
                {m.name}
                {m.retired ? " (retired)" : ""}
              </p>
              <p className="text-ink-soft">
                {m.quantity} · up to {m.rangeMax} {m.unit} · accuracy {describeMeter(meterAccuracy(m), m.unit)}
              </p>
            </div>
            {loaderData.canEdit && (
              <div className="flex gap-2">
                <a href={`/meters/${m.id}`} className="btn-quiet min-h-11 text-base">
                  Edit
                </a>
                <Form method="post">
                  <input type="hidden" name="intent" value={m.retired ? "restore" : "retire"} />
                  <input type="hidden" name="id" value={m.id} />
                  <button className="btn-quiet min-h-11 text-base">{m.retired ? "Bring back" : "Retire"}</button>
                </Form>
              </div>
            )}
          </li>
        ))}
      </ul>
      {loaderData.canEdit && (
        <section className="card space-y-3">
          <h2 className="text-lg font-bold">Add a meter range</h2>
          {actionData?.kind === "created" && (
            <p role="status" className="rounded-lg bg-within-soft p-3 font-semibold text-within">
              Added {actionData.name}.
            </p>
          )}
          {/* A fresh, empty form after each meter added. */}
          <Form method="post" noValidate className="space-y-4" key={actionData?.kind === "created" ? actionData.id : "new"}>
            <MeterFields v={invalid?.values ?? {}} e={invalid?.errors ?? {}} />
            <button className="btn-primary" disabled={busy}>
              Add the meter
            </button>
          </Form>
        </section>
      )}
    </div>
  );
}
