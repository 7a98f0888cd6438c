// /training/runs/:runId — the trainer's review of one practice run: the trainee's path beside the
// reference path, the first wrong turn, every misjudged reading (call, verdict, limits, meter),
// steps the reference did not need, undo entries, time per step, the cause reached against the
// hidden fault; comments on steps and an overall note the trainee reads on their practice list.
import { Form, Link } from "react-router";
import { CauseMark } from "~/components/training/Badges";
import { Notice, Section } from "~/components/training/Section";
import { branchName } from "~/engine/graph";
import type { ReviewRow, ReviewStep, StepFlags } from "~/engine/training/compare";
import type { TreeNode } from "~/engine/types";
import { requireUser } from "~/lib/auth.server";
import { atShop } from "~/lib/display";
import { CONFIRMED_NOTE } from "~/lib/run-log";
import { form, page, readForm } from "~/lib/route.server";
import { duration, STEP_KIND_WORD } from "~/lib/training";
import { addComment, commentInput, getPracticeReview, noteInput, saveReview } from "~/models/training/reviews.server";
import type { Route } from "./+types/training.runs.$runId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Review: ${data?.run.trainee ?? ""} · Cluepath` }];
export const handle = { wide: true };

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const r = await getPracticeReview(ctx, params.runId);
  const tz = r.timeZone;
  const titles = Object.fromEntries(r.tree.nodes.map((n) => [n.id, { title: n.title, kind: n.kind }]));
  return {
    ...r,
    tree: undefined,
    titles,
    started: atShop(r.run.startedAt, tz),
    finished: r.run.completedAt ? atShop(r.run.completedAt, tz) : null,
    comments: r.comments.map((c) => ({ ...c, when: atShop(c.createdAt, tz) })),
    note: r.note ? { ...r.note, when: atShop(r.note.reviewedAt, tz) } : null,
  };
});

export const action = form(async ({ request, params }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "training.review");
  const intent = new URL(request.url).searchParams.get("intent");
  if (intent === "note") {
    await saveReview(ctx, params.runId, await readForm(request, noteInput));
    return { ok: true as const, message: "The note is saved and the run marked reviewed. The trainee reads it on their practice list." };
  }
  await addComment(ctx, params.runId, await readForm(request, commentInput));
  return { ok: true as const, message: "Comment added." };
});

type Titles = Record<string, { title: string; kind: TreeNode["kind"] }>;

/** What one walk did at a step, in words. */
function Did({
  step,
  typed,
  confirmed,
  trainee,
}: {
  step: ReviewStep & StepFlags;
  typed?: string | null;
  confirmed?: boolean;
  trainee?: boolean;
}) {
  if (step.verdict) {
    return (
      <div>
        <p>
          {typed ?? step.verdict.reading.text}
          {confirmed && <span className="ml-1 text-ink-soft">{CONFIRMED_NOTE}</span>}
          {step.mistyped && <span className="ml-1 font-semibold text-marginal">(the meter showed otherwise)</span>}
        </p>
        {trainee && step.call ? (
          <p>
            Call <strong>{step.call}</strong> · Cluepath{" "}
            <strong className={step.verdict.verdict === step.call ? "text-within" : "text-out"}>{step.verdict.verdict}</strong>
          </p>
        ) : (
          <p>
            Judged <strong>{step.verdict.verdict}</strong>
          </p>
        )}
        <p className="text-sm text-ink-soft">
          {step.verdict.limits.text}
          {step.verdict.uncertainty ? ` · meter ${step.verdict.uncertainty.meterText}` : ""}
        </p>
      </div>
    );
  }
  if (step.answer !== undefined)
    return (
      <p>
        “{step.answer}”{step.misread && <span className="ml-1 font-semibold text-out">(the observation meant otherwise)</span>}
      </p>
    );
  if (step.recorded)
    return (
      <p>
        Rated {step.recorded}
        {step.mistyped && <span className="ml-1 font-semibold text-marginal">(the label said otherwise)</span>}
      </p>
    );
  return <p className="text-ink-soft">{step.kind === "caution" ? "Acknowledged" : "Done"}</p>;
}

const ROW_MARK: Record<ReviewRow["kind"], { label: string; cls: string; word: string } | null> = {
  same: null,
  turn: { label: "Different way", cls: "border-out bg-out-soft", word: "text-out" },
  "trainee-only": { label: "Not needed by the reference", cls: "border-marginal bg-marginal-soft", word: "text-marginal" },
  "reference-only": { label: "Not reached", cls: "border-rule bg-paper", word: "text-ink-soft" },
};

export default function ReviewPage({ loaderData, actionData }: Route.ComponentProps) {
  const { run, scenario, version, review, titles, comments, note, typed, confirmed, started, finished } = loaderData;
  const t = titles as Titles;
  const title = (id: string | null | undefined) => (id ? (t[id]?.title ?? id) : "");
  const sent = actionData as { ok: boolean; message: string; errors?: Record<string, string>; values?: Record<string, string> } | undefined;
  const done = run.status === "done";
  const turn = review.firstWrongTurn;
  const notNeeded = review.rows.filter((r) => r.kind === "trainee-only").length;
  return (
    <div className="space-y-6">
      <p>
        <Link to="/training">← Training</Link> · <Link to={`/training/scenarios/${scenario.id}`}>{scenario.name}</Link>
      </p>
      <div>
        <h1 className="text-2xl font-bold">
          {run.trainee}’s practice: {scenario.name}
        </h1>
        <p className="text-ink-soft">
          {version.title}, version {version.number} · started {started}
          {finished ? ` · finished ${finished}` : ` · ${run.status === "abandoned" ? "abandoned" : "not finished yet"}`} ·{" "}
          {duration(review.totalMs)} in all
        </p>
      </div>
      <Notice sent={sent} />

      <section
        className={`rounded-xl border-2 p-4 ${review.rightFault ? "border-within bg-within-soft" : "border-out bg-out-soft"}`}
        aria-label="Cause reached"
      >
        <div className="flex flex-wrap items-center gap-3">
          <h2 className="text-lg font-bold">Cause reached</h2>
          {review.end && <CauseMark right={review.rightFault} />}
        </div>
        <p className="text-lg">
          {review.end ? (review.end.kind === "outcome" ? title(review.end.node) : `Handed over at ${title(review.end.node)}`) : "None yet"}{" "}
          — hidden fault: <strong>{title(review.fault)}</strong>
          {review.timeToCauseMs !== null && <span className="text-ink-soft"> · reached after {duration(review.timeToCauseMs)}</span>}
        </p>
      </section>

      <section className="grid gap-3 sm:grid-cols-4" aria-label="In short">
        <div className="card">
          <p className="text-sm text-ink-soft">First wrong turn</p>
          <p className="text-lg font-bold">{turn ? `Step ${turn.index + 1}: ${title(turn.node)}` : "None"}</p>
          {turn && (
            <p className="text-base">
              Took {branchName(turn.trainee)} → {title(turn.traineeTo) || "end"}; the reference took {branchName(turn.reference)} →{" "}
              {title(turn.referenceTo) || "end"}
            </p>
          )}
        </div>
        <div className="card">
          <p className="text-sm text-ink-soft">Misjudged readings</p>
          <p className="text-3xl font-bold">{review.misjudged.length}</p>
        </div>
        <div className="card">
          <p className="text-sm text-ink-soft">Steps the reference did not need</p>
          <p className="text-3xl font-bold">{notNeeded}</p>
        </div>
        <div className="card">
          <p className="text-sm text-ink-soft">Undo entries</p>
          <p className="text-3xl font-bold">{review.undos.length}</p>
        </div>
      </section>

      {review.misjudged.length > 0 && (
        <Section title="Misjudged readings">
          <ul className="space-y-2">
            {review.misjudged.map((m) => (
              <li key={m.index} className="rounded-lg border-l-8 border-out bg-out-soft px-3 py-2">
                <p className="font-semibold">
                  Step {m.index + 1}: {title(m.node)}
                  {m.undone ? " (taken back by an undo)" : ""}
                </p>
                <p>
                  {typed[m.index] ?? m.verdict.reading.text}
                  {confirmed.includes(m.index) && ` ${CONFIRMED_NOTE}`} — the trainee called it <strong>{m.call}</strong>; Cluepath judged
                  it <strong>{m.verdict.verdict}</strong>.
                </p>
                <p className="text-base">{m.verdict.message}</p>
                <p className="text-sm text-ink-soft">
                  Limits {m.verdict.limits.text}
                  {m.verdict.limits.fixed ? "" : ` (${m.verdict.limits.derivation})`}
                  {m.verdict.uncertainty
                    ? ` · meter ${m.verdict.uncertainty.meterText}, ${m.verdict.uncertainty.text}`
                    : " · no meter accuracy given"}
                  {` · ${m.verdict.acceptance} acceptance`}
                </p>
              </li>
            ))}
          </ul>
        </Section>
      )}

      <Section title="The trainee's path beside the reference">
        <div className="card relative overflow-x-auto p-0 focus-visible:outline-2" tabIndex={0}>
          <table className="w-full min-w-[48rem]">
            <thead className="border-b border-rule text-left text-sm text-ink-soft">
              <tr>
                <th className="px-3 py-2">Step</th>
                <th className="px-3 py-2">Reference</th>
                <th className="px-3 py-2">Trainee</th>
                <th className="px-3 py-2">Time</th>
              </tr>
            </thead>
            <tbody>
              {review.rows.map((row, i) => {
                const mark =
                  i === turn?.row ? { label: "First wrong turn", cls: "border-out bg-out-soft", word: "text-out" } : ROW_MARK[row.kind];
                const seq = row.trainee?.index;
                const onStep = seq === undefined ? [] : comments.filter((c) => c.seq === seq);
                return (
                  <tr
                    key={i}
                    className={`border-b border-rule align-top last:border-0 ${mark ? `border-l-8 ${mark.cls}` : ""}`}
                    aria-label={mark ? `${mark.label}: ${title(row.node)}` : undefined}
                  >
                    <td className="px-3 py-2">
                      {mark && <p className={`text-sm font-bold uppercase tracking-wide ${mark.word}`}>{mark.label}</p>}
                      <p className="text-sm font-semibold uppercase tracking-wide text-copper-dark">
                        {STEP_KIND_WORD[t[row.node]?.kind ?? "step"]}
                      </p>
                      <p className="font-semibold">{title(row.node)}</p>
                    </td>
                    <td className="px-3 py-2">{row.reference ? <Did step={row.reference} /> : <p className="text-ink-soft">—</p>}</td>
                    <td className="px-3 py-2">
                      {row.trainee ? (
                        <Did
                          step={row.trainee}
                          typed={typed[row.trainee.index]}
                          confirmed={confirmed.includes(row.trainee.index)}
                          trainee
                        />
                      ) : (
                        <p className="text-ink-soft">—</p>
                      )}
                      {onStep.map((c) => (
                        <p key={c.id} className="mt-2 rounded-lg bg-practice-soft px-2 py-1 text-base">
                          <span className="font-semibold text-practice">{c.author}:</span> {c.text}
                        </p>
                      ))}
                      {seq !== undefined && (
                        // A fresh, closed form once the comment is saved.
                        <details key={onStep.length} className="mt-1">
                          <summary className="min-h-11 cursor-pointer py-2 text-base font-semibold text-copper-dark">
                            Comment on this step
                          </summary>
                          <Form method="post" action="?intent=comment" className="space-y-2">
                            <input type="hidden" name="seq" value={seq} />
                            <label className="sr-only" htmlFor={`comment-${seq}`}>
                              Comment on {title(row.node)}
                            </label>
                            <textarea id={`comment-${seq}`} name="text" rows={2} className="field-input py-2" />
                            <button className="btn-quiet min-h-11 text-base">Add the comment</button>
                          </Form>
                        </details>
                      )}
                    </td>
                    <td className="px-3 py-2 whitespace-nowrap">{row.trainee ? duration(row.trainee.spentMs) : ""}</td>
                  </tr>
                );
              })}
              <tr className="font-semibold">
                <td className="px-3 py-2">End</td>
                <td className="px-3 py-2">{review.referenceEnd ? title(review.referenceEnd.node) : "—"}</td>
                <td className="px-3 py-2">{review.end ? title(review.end.node) : "Not reached"}</td>
                <td className="px-3 py-2">{duration(review.totalMs)}</td>
              </tr>
            </tbody>
          </table>
        </div>
        <p className="text-sm text-ink-soft">
          Time on a step runs from the entry before it to this one, by the phone's clock; the first step's from the start of the run.
        </p>
      </Section>

      {review.undos.length > 0 && (
        <Section title="Undo entries">
          <ul className="card space-y-2">
            {review.undos.map((u) => {
              const was = review.undone.find((s) => s.index === u.undid);
              return (
                <li key={u.index}>
                  Entry {u.index + 1} took back step {u.undid + 1}, {title(u.node)}
                  {was?.call
                    ? ` (${typed[u.undid] ?? ""}, called ${was.call}; Cluepath ${was.verdict?.verdict})`
                    : was?.answer !== undefined
                      ? ` (“${was.answer}”)`
                      : ""}{" "}
                  after {duration(u.spentMs)}.
                </li>
              );
            })}
          </ul>
        </Section>
      )}

      <Section title="Note for the trainee">
        {note && (
          <p className="text-ink-soft">
            Reviewed by {note.reviewer}, {note.when}.
          </p>
        )}
        {done ? (
          <Form method="post" action="?intent=note" className="card space-y-3">
            <label htmlFor="note" className="field-label">
              Overall note
            </label>
            <textarea
              id="note"
              name="note"
              rows={4}
              defaultValue={sent?.values?.note ?? note?.note ?? ""}
              className="field-input py-2"
              aria-invalid={sent?.errors?.note ? true : undefined}
              aria-describedby={sent?.errors?.note ? "note-error" : undefined}
            />
            {sent?.errors?.note && (
              <p id="note-error" className="field-error">
                {sent.errors.note}
              </p>
            )}
            <button className="btn-primary">{note ? "Save the note" : "Save the note and mark reviewed"}</button>
          </Form>
        ) : (
          <p className="card text-ink-soft">The note opens once the trainee has finished the run.</p>
        )}
      </Section>
    </div>
  );
}
