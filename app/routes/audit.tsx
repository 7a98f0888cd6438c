// /audit — the shop's audit trail for its owner: who did what, when and from where, newest first,
// filtered by action, person and period, a page at a time. Read-only: there is no way to change or
// remove an entry through the app.
import { Form, Link } from "react-router";
import { z } from "zod";
import { Field } from "~/components/Field";
import { SelectField } from "~/components/FormFields";
import { AUDIT_LABEL } from "~/lib/audit";
import { requireUser } from "~/lib/auth.server";
import { atShop, dayStartsAt } from "~/lib/display";
import { page } from "~/lib/route.server";
import { listAudit } from "~/models/audit.server";
import { listMembers } from "~/models/people.server";
import { shopTimeZone } from "~/models/shop.server";
import type { Route } from "./+types/audit";

export const meta: Route.MetaFunction = () => [{ title: "Audit trail · Cluepath" }];
export const handle = { wide: true };

const PAGE = 50;
const ACTIONS = Object.keys(AUDIT_LABEL) as (keyof typeof AUDIT_LABEL)[];
const day = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/)
  .refine((d) => !Number.isNaN(Date.parse(d)));

// Filters come from the address: anything unreadable is simply not applied.
const filters = z.object({
  action: z.enum(ACTIONS).optional().catch(undefined),
  person: z.string().uuid().optional().catch(undefined),
  from: day.optional().catch(undefined),
  to: day.optional().catch(undefined),
  before: z.coerce.number().int().positive().max(Number.MAX_SAFE_INTEGER).optional().catch(undefined),
});

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const f = filters.parse(Object.fromEntries(new URL(request.url).searchParams));
  // A range that ends before it starts is said beside "To" (the overview's words) and not applied;
  // both days stay in their fields.
  const reversed = f.from !== undefined && f.to !== undefined && f.from > f.to;
  const tz = await shopTimeZone(ctx);
  // "To" includes the whole day: up to the start of the next one.
  const to = f.to && !reversed ? dayStartsAt(new Date(Date.parse(f.to) + 86_400_000).toISOString().slice(0, 10), tz) : undefined;
  const [trail, members] = await Promise.all([
    listAudit(ctx, {
      action: f.action,
      actorId: f.person,
      from: f.from && !reversed ? dayStartsAt(f.from, tz) : undefined,
      to,
      before: f.before,
      limit: PAGE,
    }),
    listMembers(ctx),
  ]);
  return {
    filters: { action: f.action ?? "", person: f.person ?? "", from: f.from ?? "", to: f.to ?? "" },
    toError: reversed ? "The last day comes before the first day; showing every day." : undefined,
    paged: f.before !== undefined,
    nextBefore: trail.nextBefore,
    people: members.map((m) => ({ id: m.userId, name: m.name })),
    entries: trail.entries.map((e) => ({
      id: e.id,
      at: atShop(e.at, tz),
      action: AUDIT_LABEL[e.action] ?? e.action,
      who: e.actorName ?? e.actorEmail ?? "Nobody signed in",
      summary: e.summary,
      address: e.address,
    })),
  };
});

export default function Audit({ loaderData }: Route.ComponentProps) {
  const { filters: f, entries, nextBefore } = loaderData;
  const kept = new URLSearchParams(Object.entries(f).filter(([, v]) => v !== ""));
  const filtered = kept.size > 0;
  const older = new URLSearchParams(kept);
  if (nextBefore !== null) older.set("before", String(nextBefore));
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Audit trail</h1>
      <p className="text-ink-soft">
        Who did what in your shop, when, and from which address: publishing and retiring versions, people and invitations, take-overs,
        reports e-mailed, sign-ins. Newest first. Entries can't be changed or removed.
      </p>
      <Form method="get" className="card grid gap-4 sm:grid-cols-2 lg:grid-cols-[1fr_1fr_11rem_11rem_auto] lg:items-end">
        <SelectField label="What" name="action" defaultValue={f.action}>
          <option value="">Everything</option>
          {Object.entries(AUDIT_LABEL).map(([value, label]) => (
            <option key={value} value={value}>
              {label}
            </option>
          ))}
        </SelectField>
        <SelectField label="Who" name="person" defaultValue={f.person}>
          <option value="">Anyone</option>
          {loaderData.people.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
            </option>
          ))}
        </SelectField>
        <Field label="From" name="from" type="date" defaultValue={f.from} />
        <Field label="To" name="to" type="date" defaultValue={f.to} error={loaderData.toError} />
        <div className="flex gap-2">
          <button className="btn-primary">Show</button>
          {filtered && (
            <Link to="/audit" className="btn-quiet no-underline">
              Clear
            </Link>
          )}
        </div>
      </Form>
      {entries.length === 0 ? (
        <p className="card">{filtered || loaderData.paged ? "No entries match." : "Nothing recorded yet."}</p>
      ) : (
        <ol className="space-y-2" aria-label="Entries, newest first">
          {entries.map((e) => (
            <li key={e.id} className="card grid gap-1 sm:grid-cols-[11rem_1fr]">
              <p className="text-ink-soft">{e.at}</p>
              <div className="min-w-0">
                <p className="font-semibold">{e.summary}</p>
                <p className="text-ink-soft">
                  {e.action} · {e.who}
                  {e.address ? ` · from ${e.address}` : ""}
                </p>
              </div>
            </li>
          ))}
        </ol>
      )}
      <nav aria-label="Pages" className="flex flex-wrap gap-2">
        {loaderData.paged && (
          <Link to={filtered ? `/audit?${kept}` : "/audit"} className="btn-quiet no-underline">
            Newest
          </Link>
        )}
        {nextBefore !== null && (
          <Link to={`/audit?${older}`} className="btn-quiet no-underline">
            Older entries
          </Link>
        )}
      </nav>
    </div>
  );
}
