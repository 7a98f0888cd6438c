// /meters — the shop's meters (one row per function and range) with their stated accuracy. Leads and
// owners keep the list; everyone sees it (the runner offers these when a reading is taken).
import { Form, useNavigation } from "react-router";
import { z } from "zod";
import { MeterFields } from "~/components/MeterFields";
import { describeMeter } from "~/engine/verdict";
import { requireUser } from "~/lib/auth.server";
import { can } from "~/lib/policy";
import { form, page, readForm } from "~/lib/route.server";
import { meterAccuracy } from "~/lib/run-log";
import { createMeter, listMeters, meterInput, setMeterRetired } from "~/models/meters.server";
import type { Route } from "./+types/meters._index";

export const meta: Route.MetaFunction = () => [{ title: "Meters · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const canEdit = can(ctx, "meters.manage");
  return { meters: await listMeters(ctx, { includeRetired: canEdit }), canEdit };
});

const retireForm = z.object({ intent: z.enum(["retire", "restore"]), id: z.string().uuid("Choose a meter.") });

export const action = form(async ({ request }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "meters.manage");
  const input = await readForm(request, (values) => (values.intent ? retireForm : meterInput));
  if ("intent" in input) {
    await setMeterRetired(ctx, input.id, input.intent === "retire");
    return { ok: true as const, kind: "retired" as const };
  }
  const id = await createMeter(ctx, input);
  return { ok: true as const, kind: "created" as const, name: input.name, id };
});

export default function Meters({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const invalid = actionData?.ok === false ? actionData : undefined;
  return (
    <div className="space-y-5">
      <p>
        <a href="/equipment">← Equipment</a>
      </p>
      <h1 className="text-2xl font-bold">Meters</h1>
      <p className="text-ink-soft">
        Each function and range of a meter is its own entry, with the accuracy its manual states. Verdicts use it to tell a reading that is
        clearly within limits from one too close to call.
      </p>
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
          {actionData?.ok && actionData.kind === "created" && (
            <p role="status" className="rounded-lg bg-within-soft p-3 font-semibold text-within">
              Added {actionData.name}.
            </p>
          )}
          {/* A fresh, empty form after each meter added. */}
          <Form
            method="post"
            noValidate
            className="space-y-4"
            key={actionData?.ok && actionData.kind === "created" ? actionData.id : "new"}
          >
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
