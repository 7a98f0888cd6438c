// The trainer's review of a practice run: the engine aligns the trainee's path with the reference
// path (app/engine/training/compare.ts); the trainer comments on steps and writes an overall note,
// which marks the run reviewed. The trainee reads both on their practice list.
import { and, asc, eq } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { z } from "zod";
import { runs, runSteps, trainingComments, trainingReviews, users } from "../../../db/schema";
import { reviewPractice } from "../../engine/training/compare";
import type { PracticeEntry } from "../../engine/training/practice";
import type { Ctx } from "../../lib/context";
import { db, writeTx } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { fieldRefusal, notFound, Refusal } from "../../lib/refusal";
import { logOf } from "../../lib/run-log";
import { lockOwn } from "../_query.server";
import { stepRows, stepView } from "../runs/_log.server";
import { versionContent } from "../runs/_version.server";
import { shopTimeZone } from "../shop.server";
import { scenarioRow, scriptOf } from "./_scenario.server";

export const commentInput = z.object({
  seq: z.coerce.number({ message: "Choose the step to comment on." }).int().min(0),
  text: z.string().trim().min(2, "Write the comment first.").max(2000, "Keep a comment under 2000 characters."),
});
export const noteInput = z.object({
  note: z.string().trim().min(2, "Write a note for the trainee first.").max(4000, "Keep the note under 4000 characters."),
});

const trainee = alias(users, "trainee");

/** A practice run of the shop, with its trainee's name; 404 for a real run or another shop's. */
async function practiceRun(ctx: Ctx, runId: string) {
  const [row] = await db()
    .select({ run: runs, trainee: trainee.name })
    .from(runs)
    .innerJoin(trainee, eq(trainee.id, runs.technicianId))
    .where(and(eq(runs.id, runId), eq(runs.shopId, ctx.shopId), eq(runs.practice, true)))
    .limit(1);
  return row ?? null;
}

/** Everything the review page shows: the aligned paths, the misjudged readings, confirmed readings, undo entries, times, comments and the note. */
export async function getPracticeReview(ctx: Ctx, runId: string) {
  authorize(ctx, "training.review");
  const head = (await practiceRun(ctx, runId)) ?? notFound("That practice run");
  const { run } = head;
  const s = (await scenarioRow(ctx, run.scenarioId ?? "")) ?? notFound("That practice run's scenario");
  const author = alias(users, "author");
  const reviewer = alias(users, "reviewer");
  const [content, rows, comments, review, timeZone] = await Promise.all([
    versionContent(ctx, run.versionId),
    stepRows(runId),
    db()
      .select({
        id: trainingComments.id,
        seq: trainingComments.seq,
        node: trainingComments.nodeKey,
        text: trainingComments.text,
        author: author.name,
        createdAt: trainingComments.createdAt,
      })
      .from(trainingComments)
      .innerJoin(author, eq(author.id, trainingComments.authorId))
      .where(and(eq(trainingComments.runId, runId), eq(trainingComments.shopId, ctx.shopId)))
      .orderBy(asc(trainingComments.seq), asc(trainingComments.createdAt)),
    db()
      .select({ note: trainingReviews.note, reviewedAt: trainingReviews.reviewedAt, reviewer: reviewer.name })
      .from(trainingReviews)
      .innerJoin(reviewer, eq(reviewer.id, trainingReviews.reviewerId))
      .where(eq(trainingReviews.runId, runId))
      .limit(1),
    shopTimeZone(ctx),
  ]);
  const views = rows.map(stepView);
  const result = reviewPractice(content.tree, scriptOf(s), {
    log: logOf(views) as PracticeEntry[],
    at: rows.map((r) => (r.clientAt ?? r.recordedAt).getTime()),
    startedAt: run.startedAt.getTime(),
  });
  return {
    run: {
      id: run.id,
      status: run.status,
      startedAt: run.startedAt,
      completedAt: run.completedAt,
      trainee: head.trainee,
      technicianId: run.technicianId,
    },
    scenario: { id: s.id, name: s.name, complaint: s.complaint, unitText: s.unitText, fault: s.faultNode, world: s.world },
    version: { id: content.versionId, number: content.number, title: content.title },
    tree: content.tree,
    review: result,
    typed: Object.fromEntries(rows.map((r) => [r.seq, r.typed])),
    /** The steps whose reading the trainee confirmed when Cluepath asked whether it was read right. */
    confirmed: rows.filter((r) => r.confirmed).map((r) => r.seq),
    comments,
    note: review[0] ?? null,
    timeZone,
  };
}

/** A comment on one step of a practice run (the trainee sees it once the run is finished). */
export async function addComment(ctx: Ctx, runId: string, input: z.infer<typeof commentInput>): Promise<{ id: string }> {
  authorize(ctx, "training.review");
  return writeTx(async (tx) => {
    const run = (await lockOwn(tx, ctx, runs, runId)) ?? notFound("That practice run");
    if (!run.practice) notFound("That practice run");
    const [step] = await tx
      .select({ node: runSteps.nodeKey })
      .from(runSteps)
      .where(and(eq(runSteps.runId, runId), eq(runSteps.seq, input.seq)))
      .limit(1);
    if (!step?.node) throw fieldRefusal("seq", "Comment on a step the trainee took.");
    const id = crypto.randomUUID();
    await tx.insert(trainingComments).values({
      id,
      shopId: ctx.shopId,
      runId,
      seq: input.seq,
      nodeKey: step.node,
      text: input.text,
      authorId: ctx.userId,
      createdAt: new Date(),
    });
    return { id };
  });
}

/** The overall note for the trainee; saving it marks the run reviewed (saving again replaces the note). */
export async function saveReview(ctx: Ctx, runId: string, input: z.infer<typeof noteInput>): Promise<void> {
  authorize(ctx, "training.review");
  await writeTx(async (tx) => {
    const run = (await lockOwn(tx, ctx, runs, runId)) ?? notFound("That practice run");
    if (!run.practice) notFound("That practice run");
    if (run.status !== "done")
      throw new Refusal("conflict", "The trainee has not finished this practice yet: review it once it is finished.", {
        code: "not-finished",
      });
    const now = new Date();
    const [existing] = await tx
      .select({ id: trainingReviews.id })
      .from(trainingReviews)
      .where(eq(trainingReviews.runId, runId))
      .for("update");
    if (existing)
      await tx
        .update(trainingReviews)
        .set({ note: input.note, reviewerId: ctx.userId, reviewedAt: now })
        .where(eq(trainingReviews.id, existing.id));
    else
      await tx
        .insert(trainingReviews)
        .values({ id: crypto.randomUUID(), shopId: ctx.shopId, runId, reviewerId: ctx.userId, note: input.note, reviewedAt: now });
  });
}
