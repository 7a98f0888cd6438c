import { PriorityBadge, StatusBadge } from "~/components/CallBadges";
import { KeptOnPhone } from "~/components/runner/offline/KeptOnPhone";
import { requireUser } from "~/lib/auth.server";
import { page } from "~/lib/route.server";
import { myCalls, recentlyDone } from "~/models/calls.server";
import { myPractice } from "~/models/training/practice.server";
import { openRunLine } from "~/lib/calls";
import { placeName } from "~/lib/display";
import type { Route } from "./+types/calls._index";

export const meta: Route.MetaFunction = () => [{ title: "My calls · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const user = await requireUser(request);
  const [calls, done, practice] = await Promise.all([myCalls(user.ctx), recentlyDone(user.ctx), myPractice(user.ctx)]);
  // Practice stays apart from real calls: a count and a link to the practice list.
  const toDo = practice.items.filter((i) => i.state === "to do" || i.state === "in progress" || i.state === "abandoned");
  const newNotes = practice.items.filter((i) => i.state === "reviewed").length;
  return {
    firstName: user.name.split(" ")[0],
    userId: user.ctx.userId,
    calls,
    done,
    practice: { toDo: toDo.map((i) => i.name), reviewed: newNotes },
  };
});

export default function TechnicianHome({ loaderData }: Route.ComponentProps) {
  const { calls, done } = loaderData;
  return (
    <div className="space-y-5">
      <div>
        <h1 className="text-2xl font-bold">My calls</h1>
        <p className="text-ink-soft">
          Good to see you, {loaderData.firstName}.{" "}
          {calls.length === 0
            ? "Nothing is assigned to you right now."
            : `${calls.length} call${calls.length === 1 ? "" : "s"} assigned to you, most urgent first.`}
        </p>
      </div>
      <KeptOnPhone userId={loaderData.userId} />
      <ul className="space-y-3">
        {calls.map((c) => (
          <li key={c.id}>
            <a
              href={c.openRun ? `/runs/${c.openRun.id}` : `/calls/${c.id}`}
              className="card block text-ink no-underline hover:border-copper"
            >
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
              <p className="mt-2 font-semibold text-copper-dark">{c.openRun ? openRunLine(c.openRun) : "Open the call"} →</p>
            </a>
          </li>
        ))}
      </ul>
      <p>
        <a href="/calls/all" className="tap">
          All of the shop's calls
        </a>
      </p>
      {(loaderData.practice.toDo.length > 0 || loaderData.practice.reviewed > 0) && (
        <section aria-labelledby="practice-heading" className="card space-y-1 border-practice">
          <h2 id="practice-heading" className="text-lg font-bold text-practice">
            Practice
          </h2>
          <p>
            {loaderData.practice.toDo.length > 0
              ? `${loaderData.practice.toDo.length} practice call${loaderData.practice.toDo.length === 1 ? "" : "s"} from your trainer: ${loaderData.practice.toDo.join(", ")}.`
              : "Nothing to practise right now."}
            {loaderData.practice.reviewed > 0 ? ` ${loaderData.practice.reviewed} reviewed, with your trainer's notes.` : ""}
          </p>
          <a href="/practice" className="font-semibold">
            Open my practice →
          </a>
        </section>
      )}
      {done.length > 0 && (
        <section>
          <h2 className="mb-2 text-lg font-bold">Finished this week</h2>
          <ul className="space-y-2">
            {done.map((c) => (
              <li key={c.id}>
                <a href={`/calls/${c.id}`} className="card block text-ink no-underline hover:border-copper">
                  <span className="font-semibold text-copper-dark underline">Call {c.number}</span> · {c.customerName} · “{c.symptom}”
                </a>
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}
