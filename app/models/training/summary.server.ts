// The trainer's home: assignments, practice runs waiting for review, and each trainee's progress
// over time (practice runs finished, the share that ended at the hidden fault, misjudged readings
// per run, median time to a cause), each run judged by the same review the trainer reads.
import { and, asc, desc, eq, inArray, isNull } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { runs, runSteps, trainingAssignments, trainingReviews, trainingScenarios, users } from "../../../db/schema";
import { median, reviewPractice } from "../../engine/training/compare";
import type { PracticeEntry } from "../../engine/training/practice";
import type { Ctx } from "../../lib/context";
import { db } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { entryOf } from "../../lib/run-log";
import { assignmentState } from "../../lib/training";
import { nodeOf, versionContent } from "../runs/_version.server";
import { shopTimeZone } from "../shop.server";
import { scriptOf } from "./_scenario.server";

const trainee = alias(users, "trainee");

/** Open assignments (newest first) and finished practice runs not yet reviewed (newest first). */
export async function trainingBoard(ctx: Ctx) {
  authorize(ctx, "training.summary");
  const [assignments, waiting, timeZone] = await Promise.all([
    db()
      .select({
        id: trainingAssignments.id,
        trainee: trainee.name,
        scenarioId: trainingScenarios.id,
        scenario: trainingScenarios.name,
        dueOn: trainingAssignments.dueOn,
        createdAt: trainingAssignments.createdAt,
        withdrawnAt: trainingAssignments.withdrawnAt,
        runId: trainingAssignments.runId,
        runStatus: runs.status,
        reviewedAt: trainingReviews.reviewedAt,
      })
      .from(trainingAssignments)
      .innerJoin(trainee, eq(trainee.id, trainingAssignments.traineeId))
      .innerJoin(trainingScenarios, eq(trainingScenarios.id, trainingAssignments.scenarioId))
      .leftJoin(runs, eq(runs.id, trainingAssignments.runId))
      .leftJoin(trainingReviews, eq(trainingReviews.runId, trainingAssignments.runId))
      .where(and(eq(trainingAssignments.shopId, ctx.shopId), isNull(trainingAssignments.withdrawnAt)))
      .orderBy(desc(trainingAssignments.createdAt)),
    db()
      .select({
        runId: runs.id,
        trainee: trainee.name,
        scenario: trainingScenarios.name,
        faultNode: trainingScenarios.faultNode,
        versionId: runs.versionId,
        endKind: runs.endKind,
        endNode: runs.endNode,
        completedAt: runs.completedAt,
      })
      .from(runs)
      .innerJoin(trainee, eq(trainee.id, runs.technicianId))
      .innerJoin(trainingScenarios, eq(trainingScenarios.id, runs.scenarioId))
      .leftJoin(trainingReviews, eq(trainingReviews.runId, runs.id))
      .where(and(eq(runs.shopId, ctx.shopId), eq(runs.practice, true), eq(runs.status, "done"), isNull(trainingReviews.id)))
      .orderBy(desc(runs.completedAt)),
    shopTimeZone(ctx),
  ]);
  const open = assignments.map((a) => ({ ...a, state: assignmentState(a) })).filter((a) => a.state !== "reviewed");
  const waitingRuns = await Promise.all(
    waiting.map(async (w) => {
      const tree = (await versionContent(ctx, w.versionId)).tree;
      return {
        ...w,
        reached: w.endKind === "outcome" ? (nodeOf(tree, w.endNode)?.title ?? w.endNode) : null,
        right: w.endKind === "outcome" && w.endNode === w.faultNode,
      };
    }),
  );
  return { assignments: open, waiting: waitingRuns, timeZone };
}

/** "2026-12" in the shop's time zone. */
function monthOf(d: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit" }).formatToParts(d);
  return `${parts.find((p) => p.type === "year")!.value}-${parts.find((p) => p.type === "month")!.value}`;
}

type Tally = { runs: number; right: number; misjudged: number; toCause: number[] };
const figures = (t: Tally) => ({
  runs: t.runs,
  rightShare: t.runs ? t.right / t.runs : null,
  misjudgedPerRun: t.runs ? t.misjudged / t.runs : null,
  medianToCauseMs: median(t.toCause),
});

/**
 * Each trainee's finished practice runs, in all and by month (the shop's time zone), newest month
 * first: how many, the share that ended at the hidden fault, misjudged readings per run (undone
 * ones included: the misjudgement was made), and the median time from the start to a cause.
 */
export async function traineeProgress(ctx: Ctx) {
  authorize(ctx, "training.summary");
  const [done, timeZone] = await Promise.all([
    db()
      .select({ run: runs, trainee: trainee.name, faultNode: trainingScenarios.faultNode, world: trainingScenarios.world })
      .from(runs)
      .innerJoin(trainee, eq(trainee.id, runs.technicianId))
      .innerJoin(trainingScenarios, eq(trainingScenarios.id, runs.scenarioId))
      .where(and(eq(runs.shopId, ctx.shopId), eq(runs.practice, true), eq(runs.status, "done")))
      .orderBy(asc(runs.completedAt)),
    shopTimeZone(ctx),
  ]);
  const ids = done.map((d) => d.run.id);
  const steps = ids.length
    ? await db().select().from(runSteps).where(inArray(runSteps.runId, ids)).orderBy(asc(runSteps.runId), asc(runSteps.seq))
    : [];
  const byRun = new Map<string, (typeof steps)[number][]>();
  for (const s of steps) (byRun.get(s.runId) ?? byRun.set(s.runId, []).get(s.runId)!).push(s);

  const people = new Map<string, { id: string; name: string; all: Tally; months: Map<string, Tally> }>();
  for (const d of done) {
    const tree = (await versionContent(ctx, d.run.versionId)).tree;
    const rows = byRun.get(d.run.id) ?? [];
    const r = reviewPractice(tree, scriptOf(d), {
      log: rows.map((x) =>
        entryOf({ type: x.type, node: x.nodeKey, answer: x.answer, typed: x.typed, meter: x.meter, call: x.call }),
      ) as PracticeEntry[],
      at: rows.map((x) => (x.clientAt ?? x.recordedAt).getTime()),
      startedAt: d.run.startedAt.getTime(),
    });
    const p = people.get(d.run.technicianId) ?? {
      id: d.run.technicianId,
      name: d.trainee,
      all: { runs: 0, right: 0, misjudged: 0, toCause: [] },
      months: new Map<string, Tally>(),
    };
    people.set(p.id, p);
    const month = monthOf(d.run.completedAt ?? d.run.startedAt, timeZone);
    if (!p.months.has(month)) p.months.set(month, { runs: 0, right: 0, misjudged: 0, toCause: [] });
    for (const t of [p.all, p.months.get(month)!]) {
      t.runs++;
      if (r.rightFault) t.right++;
      t.misjudged += r.misjudged.length;
      if (r.timeToCauseMs !== null) t.toCause.push(r.timeToCauseMs);
    }
  }
  return [...people.values()]
    .sort((a, b) => a.name.localeCompare(b.name))
    .map((p) => ({
      id: p.id,
      name: p.name,
      all: figures(p.all),
      months: [...p.months].sort((a, b) => b[0].localeCompare(a[0])).map(([month, t]) => ({ month, ...figures(t) })),
    }));
}
