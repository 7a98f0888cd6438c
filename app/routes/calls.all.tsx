// /calls/all — every service call of the shop, searchable and filtered by status, assignee and priority.
import { Form } from "react-router";
import { z } from "zod";
import { PriorityBadge, StatusBadge } from "~/components/CallBadges";
import { SelectField } from "~/components/FormFields";
import { requireUser } from "~/lib/auth.server";
import { CALL_PRIORITIES, CALL_STATUSES, PRIORITY_LABEL, STATUS_LABEL } from "~/lib/calls";
import { atShop, placeName } from "~/lib/display";
import { can } from "~/lib/policy";
import { page } from "~/lib/route.server";
import { assignablePeople, listCalls } from "~/models/calls.server";
import { countOpenEscalations } from "~/models/runs/queries.server";
import { shopTimeZone } from "~/models/shop.server";
import type { Route } from "./+types/calls.all";

export const meta: Route.MetaFunction = () => [{ title: "Service calls · Cluepath" }];

const filterSchema = z.object({
  q: z.string().trim().max(100).catch(""),
  status: z.enum([...CALL_STATUSES, "active", "any"]).catch("active"),
  assigned: z.string().max(40).catch(""),
  priority: z.enum([...CALL_PRIORITIES, ""]).catch(""),
});

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const params = Object.fromEntries(new URL(request.url).searchParams);
  const f = filterSchema.parse({ q: "", status: "active", assigned: "", priority: "", ...params });
  const [calls, people, escalated, tz] = await Promise.all([
    listCalls(ctx, {
      q: f.q,
      status: f.status === "any" ? undefined : f.status,
      assigned: f.assigned || undefined,
      priority: f.priority || undefined,
    }),
    assignablePeople(ctx),
    can(ctx, "escalations.view") ? countOpenEscalations(ctx) : Promise.resolve(null),
    shopTimeZone(ctx),
  ]);
  return { calls, people, filter: f, escalated, tz, canCreate: can(ctx, "calls.write") };
});

export default function Calls({ loaderData }: Route.ComponentProps) {
  const { calls, people, filter } = loaderData;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h1 className="text-2xl font-bold">Service calls</h1>
        {loaderData.canCreate && (
          <a href="/calls/new" className="btn-primary">
            New call
          </a>
        )}
      </div>
      {loaderData.escalated !== null && (
        <div
          className={`card flex flex-wrap items-center justify-between gap-2 ${loaderData.escalated ? "border-2 border-marginal bg-marginal-soft" : ""}`}
        >
          <p className="font-semibold">
            {loaderData.escalated === 0
              ? "No run is waiting for a lead."
              : `${loaderData.escalated} run${loaderData.escalated === 1 ? " is" : "s are"} waiting for a lead.`}
          </p>
          <a href="/escalations" className={loaderData.escalated ? "btn-primary" : "btn-quiet"}>
            Escalations
          </a>
        </div>
      )}
      <Form method="get" className="card grid gap-3 sm:grid-cols-2" role="search">
        <div className="sm:col-span-2">
          <label htmlFor="calls-q" className="field-label">
            Search
          </label>
          <input
            id="calls-q"
            name="q"
            type="search"
            defaultValue={filter.q}
            placeholder="Call number, symptom, customer, model or serial"
            className="field-input"
          />
        </div>
        <SelectField label="Status" name="status" defaultValue={filter.status}>
          <option value="active">Not finished</option>
          <option value="any">Any status</option>
          {CALL_STATUSES.map((s) => (
            <option key={s} value={s}>
              {STATUS_LABEL[s]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Assigned to" name="assigned" defaultValue={filter.assigned}>
          <option value="">Anyone</option>
          <option value="me">Me</option>
          <option value="unassigned">Nobody yet</option>
          {people.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
            </option>
          ))}
        </SelectField>
        <SelectField label="Priority" name="priority" defaultValue={filter.priority}>
          <option value="">Any priority</option>
          {CALL_PRIORITIES.map((p) => (
            <option key={p} value={p}>
              {PRIORITY_LABEL[p]}
            </option>
          ))}
        </SelectField>
        <div className="flex items-end">
          <button className="btn-quiet w-full">Show calls</button>
        </div>
      </Form>
      <p className="text-ink-soft" role="status">
        {calls.length} call{calls.length === 1 ? "" : "s"}
      </p>
      <ul className="space-y-2">
        {calls.map((c) => (
          <li key={c.id} className="card">
            <div className="flex flex-wrap items-center gap-2">
              <a href={`/calls/${c.id}`} className="tap text-lg font-bold">
                Call {c.number}
              </a>
              <PriorityBadge priority={c.priority} />
              <StatusBadge status={c.status} />
            </div>
            <p className="font-semibold">“{c.symptom}”</p>
            <p className="text-ink-soft">
              {placeName(c.customerName, c.siteName)} · {c.make} {c.model}
            </p>
            <p className="text-ink-soft">
              {c.assigneeName ? `Assigned to ${c.assigneeName}` : "Not assigned"} · opened {atShop(c.openedAt, loaderData.tz, "date")}
            </p>
          </li>
        ))}
      </ul>
    </div>
  );
}
