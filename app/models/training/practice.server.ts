// Practice: a trainer assigns a scenario to technicians; a technician starts the practice run from
// their list, walks it in the phone runner (app/models/runs/steps.server.ts follows their call on
// each reading), and finishes it at an end of the tree. A practice run has no call, no unit and no
// customer, escalates to nobody and makes no report: it never reaches a unit's history, the
// outbox, the reports or the owner's figures.
import { and, asc, desc, eq, inArray, isNull } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { z } from "zod";
import { memberships, runs, trainingAssignments, trainingComments, trainingReviews, trainingScenarios, users } from "../../../db/schema";
import { checkScript } from "../../engine/training/script";
import type { Ctx } from "../../lib/context";
import { db, writeTx } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { fieldRefusal, notFound, Refusal } from "../../lib/refusal";
import { assignmentState } from "../../lib/training";
import { lockOwn } from "../_query.server";
import { nodeOf, versionContent } from "../runs/_version.server";
import { shopTimeZone } from "../shop.server";
import { scenarioRow, scriptOf } from "./_scenario.server";

export const assignInput = z.object({
  trainees: z.array(z.string().uuid()).min(1, "Choose at least one technician."),
  dueOn: z.preprocess((v) => (v === "" ? null : v), z.iso.date("Give the date as YYYY-MM-DD, or leave it empty.").nullable()).default(null),
});
export type AssignInput = z.infer<typeof assignInput>;

/**
 * Assigns a scenario to technicians of the shop (each at most once while it is open). Refused
 * while the scenario's script does not reach its hidden fault: the message names the step.
 */
export async function assignScenario(ctx: Ctx, scenarioId: string, input: AssignInput): Promise<{ assigned: number; already: number }> {
  authorize(ctx, "training.write");
  return writeTx(async (tx) => {
    const s = (await scenarioRow(ctx, scenarioId, tx, true)) ?? notFound("That scenario");
    if (s.retiredAt)
      throw new Refusal("conflict", "This scenario has been replaced by a copy on a newer version: assign the copy.", { code: "retired" });
    const content = await versionContent(ctx, s.versionId, tx);
    const check = checkScript(content.tree, scriptOf(s));
    if (!check.ok) {
      const first = check.findings.find((f) => f.severity === "error")!;
      throw new Refusal("rejected", `This scenario can't be assigned until its check passes. ${first.message}`, {
        code: "script",
        details: { findings: check.findings },
      });
    }
    const ids = [...new Set(input.trainees)];
    const techs = await tx
      .select({ id: memberships.userId })
      .from(memberships)
      .where(and(eq(memberships.shopId, ctx.shopId), eq(memberships.role, "technician"), inArray(memberships.userId, ids)));
    if (techs.length !== ids.length) throw fieldRefusal("trainees", "Choose technicians of your shop.");
    const open = await tx
      .select({ traineeId: trainingAssignments.traineeId, runStatus: runs.status })
      .from(trainingAssignments)
      .leftJoin(runs, eq(runs.id, trainingAssignments.runId))
      .where(
        and(
          eq(trainingAssignments.scenarioId, scenarioId),
          inArray(trainingAssignments.traineeId, ids),
          isNull(trainingAssignments.withdrawnAt),
        ),
      );
    const busy = new Set(open.filter((a) => a.runStatus !== "done").map((a) => a.traineeId));
    const fresh = ids.filter((id) => !busy.has(id));
    if (fresh.length) {
      await tx.insert(trainingAssignments).values(
        fresh.map((traineeId) => ({
          id: crypto.randomUUID(),
          shopId: ctx.shopId,
          scenarioId,
          traineeId,
          assignedBy: ctx.userId,
          dueOn: input.dueOn,
          createdAt: new Date(),
        })),
      );
    }
    return { assigned: fresh.length, already: ids.length - fresh.length };
  });
}

/** Withdraws an assignment nobody has started. */
export async function withdrawAssignment(ctx: Ctx, assignmentId: string): Promise<void> {
  authorize(ctx, "training.write");
  await writeTx(async (tx) => {
    const [a] = await tx
      .select()
      .from(trainingAssignments)
      .where(and(eq(trainingAssignments.id, assignmentId), eq(trainingAssignments.shopId, ctx.shopId)))
      .for("update");
    if (!a) notFound("That assignment");
    if (a.withdrawnAt) return;
    if (a.runId) throw new Refusal("conflict", "The technician has started this practice; it stays on their list.", { code: "started" });
    await tx.update(trainingAssignments).set({ withdrawnAt: new Date() }).where(eq(trainingAssignments.id, assignmentId));
  });
}

/** The technician's own practice: to do first, then finished ones newest first, with results and the trainer's comments. */
export async function myPractice(ctx: Ctx) {
  authorize(ctx, "training.practice");
  const reviewer = alias(users, "reviewer");
  const rows = await db()
    .select({
      id: trainingAssignments.id,
      dueOn: trainingAssignments.dueOn,
      createdAt: trainingAssignments.createdAt,
      withdrawnAt: trainingAssignments.withdrawnAt,
      runId: trainingAssignments.runId,
      scenarioId: trainingScenarios.id,
      name: trainingScenarios.name,
      complaint: trainingScenarios.complaint,
      unitText: trainingScenarios.unitText,
      faultNode: trainingScenarios.faultNode,
      versionId: trainingScenarios.versionId,
      runStatus: runs.status,
      endNode: runs.endNode,
      endKind: runs.endKind,
      completedAt: runs.completedAt,
      reviewedAt: trainingReviews.reviewedAt,
      note: trainingReviews.note,
      reviewer: reviewer.name,
    })
    .from(trainingAssignments)
    .innerJoin(trainingScenarios, eq(trainingScenarios.id, trainingAssignments.scenarioId))
    .leftJoin(runs, eq(runs.id, trainingAssignments.runId))
    .leftJoin(trainingReviews, eq(trainingReviews.runId, trainingAssignments.runId))
    .leftJoin(reviewer, eq(reviewer.id, trainingReviews.reviewerId))
    .where(
      and(
        eq(trainingAssignments.shopId, ctx.shopId),
        eq(trainingAssignments.traineeId, ctx.userId),
        isNull(trainingAssignments.withdrawnAt),
      ),
    )
    .orderBy(desc(trainingAssignments.createdAt));
  const runIds = rows.map((r) => r.runId).filter((x): x is string => Boolean(x));
  const comments = runIds.length
    ? await db()
        .select({
          runId: trainingComments.runId,
          seq: trainingComments.seq,
          node: trainingComments.nodeKey,
          text: trainingComments.text,
          author: users.name,
          createdAt: trainingComments.createdAt,
        })
        .from(trainingComments)
        .innerJoin(users, eq(users.id, trainingComments.authorId))
        .where(and(eq(trainingComments.shopId, ctx.shopId), inArray(trainingComments.runId, runIds)))
        .orderBy(asc(trainingComments.seq), asc(trainingComments.createdAt))
    : [];
  const timeZone = await shopTimeZone(ctx);
  const items = await Promise.all(
    rows.map(async (r) => {
      const state = assignmentState(r);
      const done = r.runStatus === "done";
      const tree = done ? (await versionContent(ctx, r.versionId)).tree : null;
      const title = (id: string | null) => (tree ? (nodeOf(tree, id)?.title ?? id) : null);
      return {
        id: r.id,
        name: r.name,
        complaint: r.complaint,
        unitText: r.unitText,
        dueOn: r.dueOn,
        createdAt: r.createdAt,
        state,
        runId: r.runId,
        runStatus: r.runStatus,
        completedAt: r.completedAt,
        // The hidden fault and the cause reached only once the run is finished.
        result: done
          ? {
              reached: r.endKind === "outcome" ? title(r.endNode) : null,
              endKind: r.endKind,
              fault: title(r.faultNode),
              right: r.endKind === "outcome" && r.endNode === r.faultNode,
            }
          : null,
        review: r.reviewedAt ? { note: r.note ?? "", reviewer: r.reviewer ?? "", reviewedAt: r.reviewedAt } : null,
        comments: done ? comments.filter((c) => c.runId === r.runId).map((c) => ({ ...c, step: title(c.node) ?? c.node })) : [],
      };
    }),
  );
  const rank = (s: string) => (s === "in progress" ? 0 : s === "to do" || s === "abandoned" ? 1 : 2);
  items.sort((a, b) => rank(a.state) - rank(b.state));
  return { items, timeZone };
}

/**
 * Starts (or resumes) the practice run of one of the caller's assignments: a run on the scenario's
 * pinned version, marked practice, with no call, unit or customer.
 */
export async function startPractice(ctx: Ctx, assignmentId: string): Promise<{ runId: string }> {
  authorize(ctx, "training.practice");
  return writeTx(async (tx) => {
    const [a] = await tx
      .select()
      .from(trainingAssignments)
      .where(
        and(
          eq(trainingAssignments.id, assignmentId),
          eq(trainingAssignments.shopId, ctx.shopId),
          eq(trainingAssignments.traineeId, ctx.userId),
          isNull(trainingAssignments.withdrawnAt),
        ),
      )
      .for("update");
    if (!a) notFound("That practice");
    if (a.runId) {
      const [run] = await tx.select({ id: runs.id, status: runs.status }).from(runs).where(eq(runs.id, a.runId));
      if (run && (run.status === "active" || run.status === "paused")) return { runId: run.id };
      if (run?.status === "done") throw new Refusal("conflict", "You have finished this practice already.", { code: "finished" });
    }
    const s = (await scenarioRow(ctx, a.scenarioId, tx)) ?? notFound("That practice");
    const content = await versionContent(ctx, s.versionId, tx);
    if (!checkScript(content.tree, scriptOf(s)).ok)
      throw new Refusal("conflict", "This practice needs fixing by your trainer before it can start.", { code: "script" });
    const runId = crypto.randomUUID();
    const now = new Date();
    await tx.insert(runs).values({
      id: runId,
      shopId: ctx.shopId,
      callId: null,
      unitId: null,
      treeId: s.treeId,
      versionId: s.versionId,
      technicianId: ctx.userId,
      startedBy: ctx.userId,
      practice: true,
      scenarioId: s.id,
      status: "active",
      stepCount: 0,
      currentNode: content.tree.start,
      startedAt: now,
      updatedAt: now,
    });
    await tx.update(trainingAssignments).set({ runId }).where(eq(trainingAssignments.id, a.id));
    return { runId };
  });
}

/**
 * Finishes a practice run that stands at an end of the tree: the trainee then sees the hidden
 * fault. Repeating it does nothing. No root cause is recorded on the run (the end node says where
 * it ended): root causes are the owner's figures, and practice stays out of them.
 */
export async function finishPractice(ctx: Ctx, runId: string): Promise<{ status: "done" }> {
  authorize(ctx, "runs.view");
  return writeTx(async (tx) => {
    const run = (await lockOwn(tx, ctx, runs, runId)) ?? notFound("That run");
    if (!run.practice) throw new Refusal("conflict", "This is not a practice run.", { code: "not-practice" });
    if (run.status === "done") return { status: "done" as const };
    authorize(ctx, "runs.outcome", { holder: run.technicianId === ctx.userId });
    if (run.status !== "active" && run.status !== "paused")
      throw new Refusal("conflict", "This practice run is closed.", { code: "closed" });
    if (!run.endKind) throw new Refusal("conflict", "The practice has not reached an end of the procedure yet.", { code: "not-at-end" });
    const now = new Date();
    await tx.update(runs).set({ status: "done", completedAt: now, pausedAt: null, updatedAt: now }).where(eq(runs.id, runId));
    return { status: "done" as const };
  });
}
