// Runs as lists: open escalations for the leads, the runs on a call, and a unit's history (its runs
// with root causes, and the parts replaced on it).
import { and, asc, desc, eq, inArray, isNull } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import {
  customers,
  equipmentUnits,
  escalations,
  reports,
  runParts,
  runs,
  runSteps,
  serviceCalls,
  sites,
  treeVersions,
  users,
} from "../../../db/schema";
import type { Ctx } from "../../lib/context";
import { db } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { stepsDone } from "../../lib/run-log";
import { withOptionalPlace } from "../_query.server";
import { nodeOf, versionContent } from "./_version.server";

const technician = alias(users, "technician");

/** Open escalations of the shop, oldest first, with where each run stands. */
export async function listOpenEscalations(ctx: Ctx) {
  authorize(ctx, "escalations.view");
  const raiser = alias(users, "raiser");
  const query = db()
    .select({
      id: escalations.id,
      reason: escalations.reason,
      raisedAt: escalations.raisedAt,
      fromTree: escalations.fromTree,
      nodeKey: escalations.nodeKey,
      raisedBy: raiser.name,
      runId: runs.id,
      versionId: runs.versionId,
      callNumber: serviceCalls.number,
      symptom: serviceCalls.symptom,
      model: equipmentUnits.model,
      customerName: customers.name,
      siteName: sites.name,
    })
    .from(escalations)
    .innerJoin(runs, eq(runs.id, escalations.runId))
    .innerJoin(raiser, eq(raiser.id, escalations.raisedBy))
    .leftJoin(serviceCalls, eq(serviceCalls.id, runs.callId))
    .leftJoin(equipmentUnits, eq(equipmentUnits.id, runs.unitId))
    .$dynamic();
  const rows = await withOptionalPlace(query)
    .where(and(eq(escalations.shopId, ctx.shopId), isNull(escalations.closedAt)))
    .orderBy(asc(escalations.raisedAt));
  const steps = rows.length
    ? await db()
        .select({ runId: runSteps.runId, type: runSteps.type, undone: runSteps.undone })
        .from(runSteps)
        .where(
          and(
            eq(runSteps.shopId, ctx.shopId),
            inArray(
              runSteps.runId,
              rows.map((r) => r.runId),
            ),
          ),
        )
    : [];
  return Promise.all(
    rows.map(async (r) => {
      const content = await versionContent(ctx, r.versionId);
      const stepCount = stepsDone(steps.filter((s) => s.runId === r.runId));
      return { ...r, stepCount, treeTitle: content.title, nodeTitle: nodeOf(content.tree, r.nodeKey)?.title ?? null };
    }),
  );
}

export async function countOpenEscalations(ctx: Ctx): Promise<number> {
  authorize(ctx, "escalations.view");
  const rows = await db()
    .select({ id: escalations.id })
    .from(escalations)
    .where(and(eq(escalations.shopId, ctx.shopId), isNull(escalations.closedAt)));
  return rows.length;
}

function runListQuery(ctx: Ctx) {
  return db()
    .select({
      id: runs.id,
      status: runs.status,
      practice: runs.practice,
      rootCause: runs.rootCause,
      actionTaken: runs.actionTaken,
      startedAt: runs.startedAt,
      completedAt: runs.completedAt,
      abandonReason: runs.abandonReason,
      callId: runs.callId,
      callNumber: serviceCalls.number,
      symptom: serviceCalls.symptom,
      treeTitle: treeVersions.title,
      versionNumber: treeVersions.number,
      technician: technician.name,
      technicianId: runs.technicianId,
      reportId: reports.id,
      reportNumber: reports.number,
    })
    .from(runs)
    .innerJoin(treeVersions, eq(treeVersions.id, runs.versionId))
    .innerJoin(technician, eq(technician.id, runs.technicianId))
    .leftJoin(serviceCalls, eq(serviceCalls.id, runs.callId))
    .leftJoin(reports, eq(reports.runId, runs.id))
    .$dynamic()
    .where(eq(runs.shopId, ctx.shopId));
}

/** The runs on one call, newest first. */
export async function runsOfCall(ctx: Ctx, callId: string) {
  authorize(ctx, "runs.view");
  return runListQuery(ctx)
    .where(and(eq(runs.shopId, ctx.shopId), eq(runs.callId, callId)))
    .orderBy(desc(runs.startedAt));
}

/** A unit's history: its runs (with root causes) and the parts replaced on it. */
export async function historyOfUnit(ctx: Ctx, unitId: string) {
  authorize(ctx, "runs.view");
  const [unitRuns, parts] = await Promise.all([
    runListQuery(ctx)
      .where(and(eq(runs.shopId, ctx.shopId), eq(runs.unitId, unitId), eq(runs.practice, false)))
      .orderBy(desc(runs.startedAt)),
    db()
      .select({
        partNumber: runParts.partNumber,
        description: runParts.description,
        quantity: runParts.quantity,
        runId: runs.id,
        completedAt: runs.completedAt,
        callNumber: serviceCalls.number,
      })
      .from(runParts)
      .innerJoin(runs, eq(runs.id, runParts.runId))
      .leftJoin(serviceCalls, eq(serviceCalls.id, runs.callId))
      .where(and(eq(runParts.shopId, ctx.shopId), eq(runs.unitId, unitId), eq(runs.status, "done")))
      .orderBy(desc(runs.completedAt), asc(runParts.position)),
  ]);
  return { runs: unitRuns, parts };
}
