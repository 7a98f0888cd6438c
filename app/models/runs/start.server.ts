// Starting a run: a technician (or a lead) walks the tree's version published now, from a call or
// on its own; the run keeps that version whatever is published later. A phone with no signal makes
// the run's id itself and starts it here when it syncs: the same id again is the same run.
import { and, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import { runs, serviceCalls, treeVersions } from "../../../db/schema";
import type { Ctx } from "../../lib/context";
import { writeTx, type Tx } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { Refusal } from "../../lib/refusal";
import { isDuplicate, lockOwn } from "../_query.server";
import { currentPublished, OPEN, versionContent } from "./_version.server";

export type StartInput = {
  treeId: string;
  callId?: string;
  practice?: boolean;
  scenarioId?: string;
  /** A run id made on the phone (offline start); the same id again answers with the same run. */
  runId?: string;
  /** The published version the phone walked offline (else the tree's newest published one). */
  versionId?: string;
  /** The phone's clock when the run was started there. */
  startedAt?: Date;
};

export type StartResult = { runId: string; versionId: string; replayed: boolean };

/** What a phone sends to start a run it began without signal (POST /api/runs). */
export const startPayload = z.object({
  id: z.string().uuid("The run needs an id (a UUID)."),
  treeId: z.string().uuid("Choose a procedure to run."),
  versionId: z.string().uuid("Say which version of the procedure was walked."),
  callId: z.string().uuid("Say which call the run is for.").nullish(),
  at: z.iso.datetime({ offset: true }).nullish(),
});
export type StartPayload = z.infer<typeof startPayload>;

/** How far back a phone's start time is believed; older or future clocks fall back to the server's. */
const PHONE_CLOCK_WINDOW_MS = 14 * 86_400_000;

function startTime(phone: Date | undefined, now: Date): Date {
  if (!phone || Number.isNaN(phone.getTime())) return now;
  const age = now.getTime() - phone.getTime();
  return age >= 0 && age <= PHONE_CLOCK_WINDOW_MS ? phone : now;
}

/** The run already made with this id: the same start again answers with it, anything else is refused. */
async function replayOf(tx: Tx, ctx: Ctx, input: StartInput): Promise<StartResult | null> {
  if (!input.runId) return null;
  const [row] = await tx.select().from(runs).where(eq(runs.id, input.runId)).limit(1);
  if (!row) return null;
  const same =
    row.shopId === ctx.shopId &&
    row.startedBy === ctx.userId &&
    row.treeId === input.treeId &&
    (row.callId ?? null) === (input.callId ?? null) &&
    (!input.versionId || row.versionId === input.versionId);
  if (!same) throw new Refusal("rejected", "This run id was already used for another run.", { code: "key-reused" });
  return { runId: row.id, versionId: row.versionId, replayed: true };
}

/** The version to walk: the one the phone walked (published or since retired, never a draft), else the newest published. */
async function versionToWalk(tx: Tx, ctx: Ctx, input: StartInput) {
  if (!input.versionId) return currentPublished(ctx, input.treeId, tx);
  const [row] = await tx
    .select({ id: treeVersions.id, state: treeVersions.state })
    .from(treeVersions)
    .where(and(eq(treeVersions.id, input.versionId), eq(treeVersions.treeId, input.treeId), eq(treeVersions.shopId, ctx.shopId)))
    .limit(1);
  if (!row) throw new Refusal("not-found", "That version of the procedure was not found.");
  if (row.state === "draft")
    throw new Refusal("conflict", "That version is a draft; runs walk published versions only.", { code: "unpublished" });
  return { id: row.id };
}

/**
 * Starts a run on the tree's version published now (or the version a phone walked offline); the
 * run keeps that version whatever is published later. From a call, the call must be open and have
 * no run in progress (the refusal then names that run: `details.runId`). With a phone-made
 * `runId`, the same start again answers with the same run (`replayed`).
 */
export async function startRun(ctx: Ctx, input: StartInput): Promise<StartResult> {
  authorize(ctx, "runs.start");
  try {
    return await writeTx((tx) => insertRun(tx, ctx, input));
  } catch (e) {
    // Two tries of one phone-made start at the same moment: the second finds the first's row.
    if (input.runId && isDuplicate(e)) {
      const again = await writeTx((tx) => replayOf(tx, ctx, input));
      if (again) return again;
    }
    throw e;
  }
}

async function insertRun(tx: Tx, ctx: Ctx, input: StartInput): Promise<StartResult> {
  let unitId: string | null = null;
  if (input.callId) {
    const call = await lockOwn(tx, ctx, serviceCalls, input.callId);
    if (!call) throw new Refusal("not-found", "That service call was not found.");
    // Looked up after the call's lock, so a retry that arrives after the first try is answered with it.
    const replayed = await replayOf(tx, ctx, input);
    if (replayed) return replayed;
    if (call.status === "done" || call.status === "cancelled")
      throw new Refusal("conflict", "This call is closed. Reopen it before starting another run.", { code: "closed" });
    const [busy] = await tx
      .select({ id: runs.id })
      .from(runs)
      .where(and(eq(runs.callId, call.id), inArray(runs.status, OPEN)))
      .limit(1);
    if (busy)
      throw new Refusal("conflict", "This call already has a run in progress: carry on with it.", {
        code: "run-open",
        details: { runId: busy.id },
      });
    unitId = call.unitId;
  } else {
    const replayed = await replayOf(tx, ctx, input);
    if (replayed) return replayed;
  }
  const version = await versionToWalk(tx, ctx, input);
  if (!version) throw new Refusal("conflict", "That tree has no published version to run.", { code: "unpublished" });
  const content = await versionContent(ctx, version.id, tx);
  const runId = input.runId ?? crypto.randomUUID();
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
    startedAt: startTime(input.startedAt, now),
    updatedAt: now,
  });
  if (input.callId) {
    await tx
      .update(serviceCalls)
      .set({ status: "in_progress", updatedAt: now })
      .where(and(eq(serviceCalls.id, input.callId), eq(serviceCalls.status, "open")));
  }
  return { runId, versionId: version.id, replayed: false };
}
