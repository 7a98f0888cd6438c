// /training — the trainer's home: practice runs waiting for review, the shop's scenarios with their
// check, open assignments, and each trainee's progress over time.
import { Link } from "react-router";
import { CauseMark, CheckBadge, StateBadge } from "~/components/training/Badges";
import { CardTable, Section } from "~/components/training/Section";
import { requireUser } from "~/lib/auth.server";
import { atShop } from "~/lib/display";
import { page } from "~/lib/route.server";
import { duration } from "~/lib/training";
import { listScenarios } from "~/models/training/scenarios.server";
import { trainingBoard, traineeProgress } from "~/models/training/summary.server";
import type { Route } from "./+types/training";

export const meta: Route.MetaFunction = () => [{ title: "Training · Cluepath" }];
export const handle = { wide: true };

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const [board, scenarios, trainees] = await Promise.all([trainingBoard(ctx), listScenarios(ctx), traineeProgress(ctx)]);
  const tz = board.timeZone;
  return {
    waiting: board.waiting.map((w) => ({ ...w, finished: atShop(w.completedAt, tz) })),
    assignments: board.assignments.map((a) => ({
      ...a,
      due: a.dueOn ? atShop(`${a.dueOn}T12:00:00Z`, tz, "date") : null,
      assigned: atShop(a.createdAt, tz, "date"),
    })),
    scenarios: scenarios.map((s) => ({ ...s, changed: atShop(s.updatedAt, tz, "date") })),
    trainees,
  };
});

const pct = (x: number | null) => (x === null ? "—" : `${Math.round(x * 100)} %`);
const perRun = (x: number | null) => (x === null ? "—" : x.toFixed(1));
function monthName(m: string) {
  const [y, mo] = m.split("-").map(Number);
  return new Intl.DateTimeFormat("en-US", { month: "long", year: "numeric", timeZone: "UTC" }).format(new Date(Date.UTC(y!, mo! - 1, 15)));
}

const tr = "border-b border-rule last:border-0";
const td = "px-3 py-2 align-top";

export default function TrainerHome({ loaderData }: Route.ComponentProps) {
  const { waiting, assignments, scenarios, trainees } = loaderData;
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-bold">Training</h1>
          <p className="text-ink-soft">Practice faults on the shop's own trees, and where each trainee goes wrong.</p>
        </div>
        <Link to="/training/scenarios/new" className="btn-primary">
          New scenario
        </Link>
      </div>

      <Section title={<>Runs waiting for review {waiting.length > 0 && <span className="text-ink-soft">({waiting.length})</span>}</>}>
        <CardTable
          empty="No finished practice run is waiting for a review."
          rows={waiting.length}
          head={["Finished", "Trainee", "Scenario", "Cause reached", ""]}
        >
          {waiting.map((w) => (
            <tr key={w.runId} className={tr}>
              <td className={td}>{w.finished}</td>
              <td className={`${td} font-semibold`}>{w.trainee}</td>
              <td className={td}>{w.scenario}</td>
              <td className={td}>
                <span className="mr-2">{w.reached ?? "No cause (handed over)"}</span>
                <CauseMark right={w.right} />
              </td>
              <td className={td}>
                <Link
                  to={`/training/runs/${w.runId}`}
                  className="btn-quiet min-h-11 text-base"
                  aria-label={`Review ${w.trainee}'s run of ${w.scenario}`}
                >
                  Review
                </Link>
              </td>
            </tr>
          ))}
        </CardTable>
      </Section>

      <Section title="Scenarios">
        <CardTable
          empty="No scenarios yet. Write one on a published tree: the hidden fault, and what the trainee finds on the way."
          rows={scenarios.length}
          head={["Scenario", "Tree", "Check", "Assigned", "Changed"]}
        >
          {scenarios.map((s) => (
            <tr key={s.id} className={tr}>
              <td className={td}>
                <Link to={`/training/scenarios/${s.id}`} className="font-semibold">
                  {s.name}
                </Link>
              </td>
              <td className={td}>
                {s.treeTitle} <span className="text-ink-soft">v{s.versionNumber}</span>
              </td>
              <td className={td}>
                <CheckBadge ok={s.checkStatus === "ready"} errors={s.errors} />
              </td>
              <td className={td}>{s.assigned}</td>
              <td className={td}>{s.changed}</td>
            </tr>
          ))}
        </CardTable>
      </Section>

      <Section title="Assignments">
        <CardTable
          empty="Nothing is assigned. Open a scenario whose check passed and assign it to technicians."
          rows={assignments.length}
          head={["Trainee", "Scenario", "Assigned", "Due", "Where it stands"]}
        >
          {assignments.map((a) => (
            <tr key={a.id} className={tr}>
              <td className={`${td} font-semibold`}>{a.trainee}</td>
              <td className={td}>
                <Link to={`/training/scenarios/${a.scenarioId}`}>{a.scenario}</Link>
              </td>
              <td className={td}>{a.assigned}</td>
              <td className={td}>{a.due ?? "—"}</td>
              <td className={td}>
                <StateBadge state={a.state} />
                {a.runId && a.state === "finished" && (
                  <Link to={`/training/runs/${a.runId}`} className="ml-2">
                    Review
                  </Link>
                )}
              </td>
            </tr>
          ))}
        </CardTable>
      </Section>

      <Section title="Trainees over time">
        <p className="text-ink-soft">
          Finished practice runs. Misjudged readings count every call that differed from the verdict, even when undone; time to a cause runs
          from the start to the step that reached it, by the phone's clock.
        </p>
        {trainees.length === 0 && <p className="card text-ink-soft">No practice run has been finished yet.</p>}
        {trainees.map((t) => (
          <CardTable
            key={t.id}
            caption={t.name}
            empty=""
            rows={1}
            head={["Period", "Practice runs", "Ended at the right fault", "Misjudged readings per run", "Median time to a cause"]}
          >
            {[{ month: "All", ...t.all }, ...t.months].map((m) => (
              <tr key={m.month} className={`${tr} ${m.month === "All" ? "font-semibold" : ""}`}>
                <th scope="row" className={`${td} text-left ${m.month === "All" ? "font-semibold" : "font-normal"}`}>
                  {m.month === "All" ? "All" : monthName(m.month)}
                </th>
                <td className={td}>{m.runs}</td>
                <td className={td}>{pct(m.rightShare)}</td>
                <td className={td}>{perRun(m.misjudgedPerRun)}</td>
                <td className={td}>{duration(m.medianToCauseMs)}</td>
              </tr>
            ))}
          </CardTable>
        ))}
      </Section>
    </div>
  );
}
