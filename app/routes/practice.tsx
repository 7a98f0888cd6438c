// /practice — the technician's practice list, apart from real calls: scenarios a trainer assigned,
// each started (or carried on) in the phone runner; finished ones with the cause reached against
// the hidden fault, and the trainer's note and comments once they have reviewed it.
import { Form, redirect } from "react-router";
import { StateBadge } from "~/components/training/Badges";
import { requireUser } from "~/lib/auth.server";
import { atShop } from "~/lib/display";
import { form, page } from "~/lib/route.server";
import type { AssignmentState } from "~/lib/training";
import { myPractice, startPractice } from "~/models/training/practice.server";
import type { Route } from "./+types/practice";

export const meta: Route.MetaFunction = () => [{ title: "Practice · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const { items, timeZone } = await myPractice(ctx);
  return {
    items: items.map((i) => ({
      ...i,
      due: i.dueOn ? atShop(`${i.dueOn}T12:00:00Z`, timeZone, "date") : null,
      finished: i.completedAt ? atShop(i.completedAt, timeZone) : null,
      reviewed: i.review ? atShop(i.review.reviewedAt, timeZone) : null,
    })),
  };
});

export const action = form(async ({ request }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "training.practice");
  const data = await request.formData();
  const { runId } = await startPractice(ctx, String(data.get("assignmentId") ?? ""));
  return redirect(`/runs/${runId}`);
});

function Head({ item }: { item: { name: string; state: AssignmentState } }) {
  return (
    <div className="flex flex-wrap items-center gap-2">
      <span className="text-lg font-bold">{item.name}</span>
      <StateBadge state={item.state} />
    </div>
  );
}

export default function Practice({ loaderData, actionData }: Route.ComponentProps) {
  const { items } = loaderData;
  const open = items.filter((i) => i.state === "to do" || i.state === "in progress" || i.state === "abandoned");
  const past = items.filter((i) => !open.includes(i));
  return (
    <div className="space-y-5">
      <div>
        <h1 className="text-2xl font-bold">Practice</h1>
        <p className="text-ink-soft">
          Practice calls from your trainer. No customer, no report: work them as on site and make your own call at each reading.
        </p>
      </div>
      {actionData && actionData.ok === false && (
        <p role="alert" className="field-error">
          {actionData.message}
        </p>
      )}
      <section aria-labelledby="todo-heading" className="space-y-3">
        <h2 id="todo-heading" className="text-lg font-bold">
          To do
        </h2>
        {open.length === 0 ? (
          <p className="card text-ink-soft">Nothing to practise right now.</p>
        ) : (
          <ul className="space-y-3">
            {open.map((i) => (
              <li key={i.id} className="card space-y-2 border-practice">
                <Head item={i} />
                <p className="text-xl font-semibold">“{i.complaint}”</p>
                <p className="text-ink-soft">{i.unitText}</p>
                {i.due && <p className="font-semibold">Due by {i.due}</p>}
                <Form method="post">
                  <input type="hidden" name="assignmentId" value={i.id} />
                  <button className="min-h-14 w-full rounded-xl bg-practice px-4 text-lg font-bold text-white">
                    {i.state === "in progress" ? "Carry on with the practice" : "Start the practice"}
                  </button>
                </Form>
              </li>
            ))}
          </ul>
        )}
      </section>
      {past.length > 0 && (
        <section aria-labelledby="done-heading" className="space-y-3">
          <h2 id="done-heading" className="text-lg font-bold">
            Finished
          </h2>
          <ul className="space-y-3">
            {past.map((i) => (
              <li key={i.id} className="card space-y-2">
                <Head item={i} />
                {i.result && (
                  <div
                    className={`rounded-lg border-l-8 px-3 py-2 ${i.result.right ? "border-within bg-within-soft" : "border-out bg-out-soft"}`}
                  >
                    <p>
                      You reached: <strong>{i.result.reached ?? "a hand-over, no cause"}</strong>
                    </p>
                    <p>
                      Hidden fault: <strong>{i.result.fault}</strong> {i.result.right ? "✓" : "✗"}
                    </p>
                    {i.finished && <p className="text-sm text-ink-soft">Finished {i.finished}</p>}
                  </div>
                )}
                {i.review && (
                  <div className="rounded-lg bg-practice-soft px-3 py-2">
                    <p className="text-sm font-semibold text-practice">
                      {i.review.reviewer}'s note · {i.reviewed}
                    </p>
                    <p className="whitespace-pre-line">{i.review.note}</p>
                  </div>
                )}
                {i.comments.length > 0 && (
                  <div>
                    <p className="font-semibold">Comments on your steps</p>
                    <ul className="space-y-1">
                      {i.comments.map((c, k) => (
                        <li key={k} className="rounded-lg bg-practice-soft px-3 py-2">
                          <p className="text-sm font-semibold text-practice">
                            {c.author} on ‘{c.step}’
                          </p>
                          <p>{c.text}</p>
                        </li>
                      ))}
                    </ul>
                  </div>
                )}
                {!i.review && i.comments.length === 0 && <p className="text-ink-soft">Your trainer has not reviewed it yet.</p>}
                {i.runId && (
                  <a href={`/runs/${i.runId}`} className="block">
                    See your steps and calls
                  </a>
                )}
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}
