// /training/scenarios/:scenarioId — one practice scenario: the engine's check of its script, the
// reference path the script leads to, assigning it to technicians, copying it onto a newer
// version of its tree, and where each assignment stands.
import { Form, Link, redirect } from "react-router";
import { CauseMark, CheckBadge, StateBadge } from "~/components/training/Badges";
import { Notice, Section } from "~/components/training/Section";
import { branchName } from "~/engine/graph";
import { requireUser } from "~/lib/auth.server";
import { atShop } from "~/lib/display";
import { Refusal } from "~/lib/refusal";
import { form, page } from "~/lib/route.server";
import { assignInput, assignScenario, withdrawAssignment } from "~/models/training/practice.server";
import { copyScenario, getScenario } from "~/models/training/scenarios.server";
import { STEP_KIND_WORD } from "~/lib/training";
import type { Route } from "./+types/training.scenarios.$scenarioId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.scenario.name ?? "Scenario"} · Cluepath` }];
export const handle = { wide: true };

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const s = await getScenario(ctx, params.scenarioId);
  const tz = s.timeZone;
  const byId = new Map(s.tree.nodes.map((n) => [n.id, n]));
  const title = (id: string | null | undefined) => (id ? (byId.get(id)?.title ?? id) : "");
  return {
    ...s,
    tree: undefined,
    findings: s.check.findings.map((f) => ({ ...f, step: title(f.nodeId) })),
    reference: s.check.reference.steps.map((st) => ({
      index: st.index,
      node: st.node,
      kind: st.kind,
      title: title(st.node),
      scripted: s.scenario.world[st.node] ?? null,
      verdict: st.verdict ? { verdict: st.verdict.verdict, message: st.verdict.message } : null,
      branch: branchName(st.branch),
      to: title(st.to),
    })),
    end: s.check.reference.end ? { kind: s.check.reference.end.kind, title: title(s.check.reference.end.node) } : null,
    assignments: s.assignments.map((a) => ({
      ...a,
      assigned: atShop(a.createdAt, tz, "date"),
      due: a.dueOn ? atShop(`${a.dueOn}T12:00:00Z`, tz, "date") : null,
    })),
  };
});

export const action = form(async ({ request, params }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "training.write");
  const data = await request.formData();
  const intent = data.get("intent");
  if (intent === "copy") {
    const { id } = await copyScenario(ctx, params.scenarioId);
    return redirect(`/training/scenarios/${id}`);
  }
  if (intent === "withdraw") {
    await withdrawAssignment(ctx, String(data.get("assignmentId") ?? ""));
    return { ok: true as const, message: "The assignment was withdrawn." };
  }
  const parsed = assignInput.safeParse({ trainees: data.getAll("trainees"), dueOn: data.get("dueOn") ?? "" });
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    throw new Refusal("invalid", issue.message, { fields: { [String(issue.path[0] ?? "trainees")]: issue.message } });
  }
  const r = await assignScenario(ctx, params.scenarioId, parsed.data);
  const again = r.already ? ` ${r.already} already had it open.` : "";
  return { ok: true as const, message: `Assigned to ${r.assigned} technician${r.assigned === 1 ? "" : "s"}.${again}` };
});

export default function ScenarioPage({ loaderData, actionData }: Route.ComponentProps) {
  const { scenario, findings, reference, end, check, newer, locked, assignments, technicians } = loaderData;
  const sent = actionData as { ok: boolean; message: string; errors?: Record<string, string> } | undefined;
  const retired = Boolean(scenario.retiredAt);
  return (
    <div className="space-y-6">
      <p>
        <Link to="/training">← Training</Link>
      </p>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h1 className="text-2xl font-bold">{scenario.name}</h1>
          <p className="text-ink-soft">
            On {scenario.treeTitle}, version {scenario.versionNumber}
            {retired ? " · replaced by a copy on a newer version" : ""}
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          {!locked && !retired && (
            <Link to={`/training/scenarios/${scenario.id}/edit`} className="btn-quiet">
              Edit
            </Link>
          )}
          {newer && !retired && (
            <Form method="post">
              <input type="hidden" name="intent" value="copy" />
              <button className="btn-quiet">Copy onto version {newer.number}</button>
            </Form>
          )}
        </div>
      </div>
      <Notice sent={sent} />

      <section className="card grid gap-3 md:grid-cols-3" aria-label="The call">
        <div>
          <p className="text-sm font-semibold text-ink-soft">What the customer says</p>
          <p className="text-lg">“{scenario.complaint}”</p>
        </div>
        <div>
          <p className="text-sm font-semibold text-ink-soft">The unit</p>
          <p className="text-lg">{scenario.unitText}</p>
        </div>
        <div>
          <p className="text-sm font-semibold text-ink-soft">Hidden fault</p>
          <p className="text-lg font-semibold">{scenario.faultTitle}</p>
        </div>
      </section>

      <Section
        title={
          <>
            The engine's check <CheckBadge ok={check.ok} errors={findings.filter((f) => f.severity === "error").length} />
          </>
        }
      >
        {findings.length === 0 ? (
          <p className="text-ink-soft">
            Walking the tree with this script reaches the hidden fault, with a readable value at every step on the way.
          </p>
        ) : (
          <ul className="space-y-2">
            {findings.map((f, i) => (
              <li
                key={i}
                className={`rounded-lg border-l-8 px-3 py-2 ${f.severity === "error" ? "border-out bg-out-soft" : "border-marginal bg-marginal-soft"}`}
              >
                {f.step && <p className="text-sm font-semibold text-ink-soft">{f.step}</p>}
                <p>{f.message}</p>
              </li>
            ))}
          </ul>
        )}
      </Section>

      <Section title="The reference path">
        <p className="text-ink-soft">
          What a trainee who reads everything right does, step by step. Reviews set each trainee's path beside it.
        </p>
        <ol className="card divide-y divide-rule p-0">
          {reference.map((r) => (
            <li key={r.index} className="grid gap-1 px-3 py-2 md:grid-cols-[2rem_1fr_1.2fr]">
              <span className="text-ink-soft">{r.index + 1}</span>
              <span>
                <span className="mr-2 text-sm font-semibold uppercase tracking-wide text-copper-dark">
                  {STEP_KIND_WORD[r.kind] ?? r.kind}
                </span>
                {r.title}
              </span>
              <span className="text-ink-soft">
                {r.scripted?.kind === "question" && (
                  <>
                    “{r.scripted.observation}” → <strong className="text-ink">{r.branch}</strong>
                  </>
                )}
                {r.verdict && (
                  <>
                    {r.verdict.message} → <strong className="text-ink">{r.branch}</strong>
                  </>
                )}
                {r.scripted?.kind === "nameplate" && <>Label: {r.scripted.label}</>}
                {r.kind === "caution" && "Acknowledged"}
                {r.kind === "step" && "Done"}
              </span>
            </li>
          ))}
          <li className="px-3 py-2 font-semibold">
            {end ? `Ends at: ${end.title}` : "The walk stops before an end (see the check above)."}
          </li>
        </ol>
      </Section>

      <Section title="Assign">
        {retired ? (
          <p className="card text-ink-soft">This scenario was replaced by a copy on a newer version: assign the copy.</p>
        ) : !check.ok ? (
          <p className="card text-ink-soft">Assigning opens once the check passes.</p>
        ) : technicians.length === 0 ? (
          <p className="card text-ink-soft">The shop has no technicians to assign practice to.</p>
        ) : (
          // A fresh form once an assignment is made (nothing left ticked).
          <Form key={assignments.length} method="post" className="card space-y-3">
            <input type="hidden" name="intent" value="assign" />
            <fieldset>
              <legend className="field-label">Technicians</legend>
              <div className="flex flex-wrap gap-2">
                {technicians.map((t) => (
                  <label key={t.id} className="flex min-h-12 items-center gap-2 rounded-lg border border-rule px-3">
                    <input type="checkbox" name="trainees" value={t.id} className="size-5 accent-copper" />
                    {t.name}
                  </label>
                ))}
              </div>
              {sent?.errors?.trainees && <p className="field-error">{sent.errors.trainees}</p>}
            </fieldset>
            <div>
              <label htmlFor="dueOn" className="field-label">
                Due by (optional)
              </label>
              <input id="dueOn" type="date" name="dueOn" className="field-input max-w-xs" />
              {sent?.errors?.dueOn && <p className="field-error">{sent.errors.dueOn}</p>}
            </div>
            <button className="btn-primary">Assign the practice</button>
          </Form>
        )}
        {assignments.length > 0 && (
          <ul className="card divide-y divide-rule p-0">
            {assignments.map((a) => (
              <li key={a.id} className="flex flex-wrap items-center gap-3 px-3 py-2">
                <span className="font-semibold">{a.trainee}</span>
                <StateBadge state={a.state} />
                {a.rightFault !== null && <CauseMark right={a.rightFault} />}
                <span className="text-ink-soft">
                  assigned {a.assigned}
                  {a.due ? ` · due ${a.due}` : ""}
                </span>
                {a.runId && (a.state === "finished" || a.state === "reviewed") && (
                  <Link to={`/training/runs/${a.runId}`} className="ml-auto">
                    {a.state === "reviewed" ? "Read the review" : "Review the run"}
                  </Link>
                )}
                {a.state === "to do" && (
                  <Form method="post" className="ml-auto">
                    <input type="hidden" name="intent" value="withdraw" />
                    <input type="hidden" name="assignmentId" value={a.id} />
                    <button className="btn-quiet min-h-11 text-base">Withdraw</button>
                  </Form>
                )}
              </li>
            ))}
          </ul>
        )}
      </Section>
    </div>
  );
}
