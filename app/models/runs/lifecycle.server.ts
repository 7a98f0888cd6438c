// A run's life after its start: pause and resume, escalate to a lead, take over, abandon with a
// reason, and the outcome that closes the run and the call and makes the service report.
import { and, eq, inArray, isNull } from "drizzle-orm";
import { z } from "zod";
import { escalations, reports, runParts, runs, serviceCalls, users, type RunStatus } from "../../../db/schema";
import type { OutcomeNode } from "../../engine/types";
import type { Ctx } from "../../lib/context";
import { db, writeTx, type Tx } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { notFound, Refusal } from "../../lib/refusal";
import { byCaller, recordAudit } from "../_audit.server";
import { lockRunAndCall, nextNumber } from "../_query.server";
import { nodeOf, OPEN, versionContent } from "./_version.server";
import { recordRunFacts } from "../insights/_facts.server";

export const statusInput = z.discriminatedUnion("action", [
  z.object({ action: z.literal("pause") }),
  z.object({ action: z.literal("resume") }),
  z.object({
    action: z.literal("abandon"),
    reason: z.string().trim().min(3, "Say why the run is abandoned.").max(500, "Keep it under 500 characters."),
  }),
  z.object({
    action: z.literal("escalate"),
    reason: z.string().trim().min(3, "Say what the lead should look at.").max(500, "Keep it under 500 characters."),
  }),
  z.object({ action: z.literal("take-over") }),
]);
export type StatusInput = z.infer<typeof statusInput>;

export type StatusResult = { status: RunStatus };

async function setCallStatus(tx: Tx, callId: string | null, status: "open" | "in_progress" | "escalated" | "done", from?: string[]) {
  if (!callId) return;
  const now = new Date();
  await tx
    .update(serviceCalls)
    .set({ status, updatedAt: now, ...(status === "done" ? { closedAt: now } : {}) })
    .where(
      and(eq(serviceCalls.id, callId), from ? inArray(serviceCalls.status, from as ("open" | "in_progress" | "escalated")[]) : undefined),
    );
}

async function closeEscalations(tx: Tx, runId: string, takenBy?: string) {
  const now = new Date();
  await tx
    .update(escalations)
    .set(takenBy ? { takenBy, takenAt: now, closedAt: now } : { closedAt: now })
    .where(and(eq(escalations.runId, runId), isNull(escalations.closedAt)));
}

/** The take-over in the audit trail: whose run it was, on which call. */
async function recordTakeOver(tx: Tx, ctx: Ctx, run: typeof runs.$inferSelect) {
  const [from] = await tx.select({ name: users.name }).from(users).where(eq(users.id, run.technicianId));
  const [call] = run.callId
    ? await tx.select({ number: serviceCalls.number }).from(serviceCalls).where(eq(serviceCalls.id, run.callId))
    : [];
  await recordAudit(
    {
      ...byCaller(ctx),
      action: "run.taken-over",
      subjectType: "run",
      subjectId: run.id,
      summary: `Took over ${from?.name ?? "a technician"}'s run${call ? ` on call ${call.number}` : ""}`,
      details: { fromUserId: run.technicianId, callId: run.callId, wasStatus: run.status },
    },
    tx,
  );
}

/** Pause, resume, abandon (with a reason), escalate to a lead (with a reason), or take over (leads). */
export async function changeRunStatus(ctx: Ctx, runId: string, input: StatusInput): Promise<StatusResult> {
  authorize(ctx, "runs.view");
  return writeTx(async (tx): Promise<StatusResult> => {
    const run = (await lockRunAndCall(tx, ctx, runId)) ?? notFound("That run");
    const facts = { holder: run.technicianId === ctx.userId };
    const now = new Date();
    const set = (patch: Partial<typeof runs.$inferInsert>) =>
      tx
        .update(runs)
        .set({ ...patch, updatedAt: now })
        .where(eq(runs.id, runId));
    if (!OPEN.includes(run.status)) throw new Refusal("conflict", "This run is closed.", { code: "closed" });
    // A practice run stays the trainee's: no lead is called to it (escalations are real work).
    if (run.practice && (input.action === "escalate" || input.action === "take-over"))
      throw new Refusal("conflict", "A practice run is not handed to a lead: finish it or abandon it.", { code: "practice" });
    switch (input.action) {
      case "pause":
        authorize(ctx, "runs.pause", facts);
        if (run.status === "paused") return { status: "paused" };
        if (run.status !== "active") throw new Refusal("conflict", "Only a run in progress can be paused.");
        await set({ status: "paused", pausedAt: now });
        return { status: "paused" };
      case "resume":
        authorize(ctx, "runs.pause", facts);
        if (run.status === "active") return { status: "active" };
        if (run.status !== "paused") throw new Refusal("conflict", "This run is waiting for a lead.");
        await set({ status: "active", pausedAt: null });
        return { status: "active" };
      case "abandon":
        authorize(ctx, "runs.abandon", facts);
        await set({ status: "abandoned", abandonReason: input.reason, completedAt: now });
        await closeEscalations(tx, runId);
        await setCallStatus(tx, run.callId, "open", ["in_progress", "escalated"]);
        await recordRunFacts(tx, runId);
        return { status: "abandoned" };
      case "escalate": {
        authorize(ctx, "runs.escalate", facts);
        if (run.status === "escalated") return { status: "escalated" };
        await set({ status: "escalated", pausedAt: null });
        await tx.insert(escalations).values({
          id: crypto.randomUUID(),
          runId,
          shopId: ctx.shopId,
          reason: input.reason,
          nodeKey: run.endNode ?? run.currentNode,
          fromTree: run.endKind === "escalate" || run.endKind === "recheck-limit",
          raisedBy: ctx.userId,
          raisedAt: now,
        });
        await setCallStatus(tx, run.callId, "escalated", ["open", "in_progress"]);
        return { status: "escalated" };
      }
      case "take-over":
        authorize(ctx, "runs.take-over", facts);
        await set({ technicianId: ctx.userId, status: "active", pausedAt: null });
        await closeEscalations(tx, runId, ctx.userId);
        await setCallStatus(tx, run.callId, "in_progress", ["open", "escalated"]);
        await recordTakeOver(tx, ctx, run);
        return { status: "active" };
    }
  });
}

// --- outcome ---------------------------------------------------------------------------------------

export const outcomeInput = z.object({
  action: z.string().trim().min(3, "Say what you did about it.").max(4000, "Keep it under 4000 characters."),
  // Numbers must be JSON numbers: `true` or "30" is refused, never coerced (issue 9 item 9).
  minutes: z
    .number({ message: "Send the time on the job as a number of minutes." })
    .int("Whole minutes, please.")
    .min(1, "At least 1 minute.")
    .max(1440, "At most 24 hours (1440 minutes)."),
  parts: z
    .array(
      z.object({
        partNumber: z.string().trim().max(60, "Keep the part number under 60 characters.").default(""),
        description: z.string().trim().min(1, "Describe the part.").max(300, "Keep it under 300 characters."),
        quantity: z
          .number({ message: "Send each part's quantity as a number." })
          .int("A whole number.")
          .min(1, "At least 1.")
          .max(999, "At most 999."),
      }),
    )
    .max(30, "At most 30 parts on one run."),
});
export type OutcomeInput = z.infer<typeof outcomeInput>;

/**
 * Ends a run that stands at an outcome: the root cause (the outcome's title), the action taken,
 * parts and time. Makes the service report and closes the call. Repeating it answers with the
 * report already made.
 */
export async function recordOutcome(ctx: Ctx, runId: string, input: OutcomeInput): Promise<{ reportId: string; number: number }> {
  authorize(ctx, "runs.view");
  const existing = async () => {
    const [r] = await db()
      .select()
      .from(reports)
      .where(and(eq(reports.runId, runId), eq(reports.shopId, ctx.shopId)))
      .limit(1);
    return r ? { reportId: r.id, number: r.number } : null;
  };
  const result = await writeTx(async (tx) => {
    const run = (await lockRunAndCall(tx, ctx, runId)) ?? notFound("That run");
    if (run.status === "done") return null;
    authorize(ctx, "runs.outcome", { holder: run.technicianId === ctx.userId });
    // A practice run makes no report and closes no call: it is finished from the training model.
    if (run.practice)
      throw new Refusal("conflict", "A practice run makes no service report: finish the practice instead.", { code: "practice" });
    if (run.status !== "active" && run.status !== "paused")
      throw new Refusal("conflict", "This run is not in progress.", { code: "closed" });
    const content = await versionContent(ctx, run.versionId, tx);
    const outcome = nodeOf(content.tree, run.endNode);
    if (run.endKind !== "outcome" || outcome?.kind !== "outcome")
      throw new Refusal("conflict", "The run has not reached a root cause yet.", { code: "not-at-outcome" });
    const now = new Date();
    await tx
      .update(runs)
      .set({
        status: "done",
        rootCause: (outcome as OutcomeNode).title.slice(0, 300),
        actionTaken: input.action,
        minutesOnJob: input.minutes,
        completedAt: now,
        pausedAt: null,
        updatedAt: now,
      })
      .where(eq(runs.id, runId));
    await tx.delete(runParts).where(eq(runParts.runId, runId));
    if (input.parts.length) {
      await tx.insert(runParts).values(
        input.parts.map((p, i) => ({
          id: crypto.randomUUID(),
          runId,
          shopId: ctx.shopId,
          position: i,
          partNumber: p.partNumber,
          description: p.description,
          quantity: p.quantity,
        })),
      );
    }
    await closeEscalations(tx, runId);
    await setCallStatus(tx, run.callId, "done");
    // The report's number before the summary rows: counter, then the shop's insights queue (_facts.server.ts).
    const id = crypto.randomUUID();
    const number = await nextNumber(tx, ctx.shopId, "report");
    await recordRunFacts(tx, runId);
    await tx.insert(reports).values({ id, shopId: ctx.shopId, number, runId, callId: run.callId, createdBy: ctx.userId });
    return { reportId: id, number };
  });
  return result ?? (await existing()) ?? notFound("That run");
}
