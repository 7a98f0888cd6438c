// Starting a run: a technician (or a lead) walks the tree's version published now, from a call or
// on its own; the run keeps that version whatever is published later.
import { and, eq, inArray } from "drizzle-orm";
import { runs, serviceCalls } from "../../../db/schema";
import type { Ctx } from "../../lib/context";
import { writeTx } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { Refusal } from "../../lib/refusal";
import { lockOwn } from "../_query.server";
import { currentPublished, OPEN, versionContent } from "./_version.server";

export type StartInput = { treeId: string; callId?: string; practice?: boolean; scenarioId?: string };

/**
 * Starts a run on the tree's version published now; the run keeps that version whatever is
 * published later. From a call, the call must be open and have no run in progress (the refusal
 * then names that run: `details.runId`).
 */
export async function startRun(ctx: Ctx, input: StartInput): Promise<{ runId: string; versionId: string }> {
  authorize(ctx, "runs.start");
  return writeTx(async (tx) => {
    let unitId: string | null = null;
    if (input.callId) {
      const call = await lockOwn(tx, ctx, serviceCalls, input.callId);
      if (!call) throw new Refusal("not-found", "That service call was not found.");
      if (call.status === "done" || call.status === "cancelled") throw new Refusal("conflict", "This call is closed. Reopen it before starting another run.", { code: "closed" });
      const [busy] = await tx
        .select({ id: runs.id })
        .from(runs)
        .where(and(eq(runs.callId, call.id), inArray(runs.status, OPEN)))
        .limit(1);
      if (busy) throw new Refusal("conflict", "This call already has a run in progress: carry on with it.", { code: "run-open", details: { runId: busy.id } });
      unitId = call.unitId;
    }
    const version = await currentPublished(ctx, input.treeId, tx);
    if (!version) throw new Refusal("conflict", "That tree has no published version to run.", { code: "unpublished" });
    const content = await versionContent(ctx, version.id, tx);
    const runId = crypto.randomUUID();
    const now = new Date();
    await tx.insert(runs).values({
      id: runId,
      shopId: ctx.shopId,
      callId: input.callId ?? null,
      unitId,
      treeId: input.treeId,
      versionId: version.id,
      technicianId: ctx.userId,
      startedBy: ctx.userId,
      practice: Boolean(input.practice),
      scenarioId: input.scenarioId ?? null,
      status: "active",
      stepCount: 0,
      currentNode: content.tree.start,
      startedAt: now,
      updatedAt: now,
    });
    if (input.callId) {
      await tx
        .update(serviceCalls)
        .set({ status: "in_progress", updatedAt: now })
        .where(and(eq(serviceCalls.id, input.callId), eq(serviceCalls.status, "open")));
    }
    return { runId, versionId: version.id };
  });
}
