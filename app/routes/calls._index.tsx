import { PriorityBadge, StatusBadge } from "~/components/CallBadges";
import { KeptOnPhone } from "~/components/runner/offline/KeptOnPhone";
import { requireUser } from "~/lib/auth.server";
import { page } from "~/lib/route.server";
import { myCalls, recentlyDone } from "~/models/calls.server";
import { placeName } from "~/lib/display";
import type { Route } from "./+types/calls._index";

export const meta: Route.MetaFunction = () => [{ title: "My calls · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const user = await requireUser(request);
  const [calls, done] = await Promise.all([myCalls(user.ctx), recentlyDone(user.ctx)]);
  return { firstName: user.name.split(" ")[0], userId: user.ctx.userId, calls, done };
});

export default function TechnicianHome({ loaderData }: Route.ComponentProps) {
  const { calls, done } = loaderData;
  return (
    <div className="space-y-5">
      <div>
        <h1 className="text-2xl font-bold">My calls</h1>
        <p className="text-ink-soft">
          Good to see you, {loaderData.firstName}. {calls.length === 0 ? "Nothing is assigned to you right now." : `${calls.length} call${calls.length === 1 ? "" : "s"} assigned to you, most urgent first.`}
        </p>
      </div>
      <KeptOnPhone userId={loaderData.userId} />
      <ul className="space-y-3">
        {calls.map((c) => (
          <li key={c.id}>
            <a href={c.openRun ? `/runs/${c.openRun.id}` : `/calls/${c.id}`} className="card block text-ink no-underline hover:border-copper" aria-label={`Call ${c.number}: ${c.symptom}, ${c.customerName}`}>
              <div className="flex flex-wrap items-center gap-2">
                <span className="text-lg font-bold">Call {c.number}</span>
                <PriorityBadge priority={c.priority} />
                <StatusBadge status={c.status} />
              </div>
              <p className="mt-1 text-xl font-semibold">“{c.symptom}”</p>
              <p className="text-ink-soft">
                {c.make} {c.model}
              </p>
              <p className="text-ink-soft">
                {placeName(c.customerName, c.siteName)}, {c.siteAddress}
              </p>
              <p className="mt-2 font-semibold text-copper-dark">{c.openRun ? (c.openRun.status === "paused" ? "Resume the paused run →" : c.openRun.status === "escalated" ? "With a lead — open the run →" : "Carry on with the run →") : "Open the call →"}</p>
            </a>
          </li>
        ))}
      </ul>
      <p>
        <a href="/calls/all">All of the shop's calls</a>
      </p>
      {done.length > 0 && (
        <section>
          <h2 className="mb-2 text-lg font-bold">Finished this week</h2>
          <ul className="space-y-2">
            {done.map((c) => (
              <li key={c.id} className="card">
                <a href={`/calls/${c.id}`} className="font-semibold">
                  Call {c.number}
                </a>{" "}
                · {c.customerName} · “{c.symptom}”
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}
