// Reading a run: everything the runner shows (the pinned version, the step log, notes, photos,
// parts, the shop's meters, escalation and report), for the run's own shop only.
import { alias } from "drizzle-orm/mysql-core";
import { and, eq, sql } from "drizzle-orm";
import {
  customers,
  equipmentUnits,
  escalations,
  meters,
  reports,
  runNotes,
  runParts,
  runPhotos,
  runs,
  runSteps,
  serviceCalls,
  shops,
  sites,
  users,
} from "../../../db/schema";
import type { Ctx } from "../../lib/context";
import { prepared } from "../../lib/db.server";
import { authorize, can } from "../../lib/policy";
import { notFound } from "../../lib/refusal";
import { photoUrl, type NoteView, type PhotoView, type RunView } from "../../lib/run-log";
import { fromJson, jsonIso, jsonRow, jsonRows } from "../_query.server";
import { METER_JSON, STEP_JSON, stepViewFromJson } from "./_log.server";
import { practiceViewOf } from "../training/_scenario.server";
import { OPEN, versionContent } from "./_version.server";

const iso = (d: Date | null) => (d ? d.toISOString() : null);

const technician = alias(users, "technician");
const starter = alias(users, "starter");
const author = alias(users, "author");
const raiser = alias(users, "raiser");
const taker = alias(users, "taker");

/**
 * The run with everything it shows, in one statement: the run row with its holder's and starter's
 * names, and each related list or row as a JSON subquery of it (_query.server.ts), scoped to the
 * run's shop. Two statements per view with the session's, where there were twelve. Built once
 * (prepared): only the run id and shop change.
 */
const runViewQuery = prepared((db) =>
  db
    .select({
      run: runs,
      technicianName: technician.name,
      starterName: starter.name,
      timeZone: sql<string | null>`(SELECT JSON_VALUE(${shops.settings}, '$.timeZone') FROM ${shops} WHERE ${shops.id} = ${runs.shopId})`,
      call: jsonRow(
        { id: serviceCalls.id, number: serviceCalls.number, symptom: serviceCalls.symptom, priority: serviceCalls.priority },
        sql`FROM ${serviceCalls} WHERE ${serviceCalls.id} = ${runs.callId} AND ${serviceCalls.shopId} = ${runs.shopId}`,
      ),
      unit: jsonRow(
        {
          id: equipmentUnits.id,
          category: equipmentUnits.category,
          make: equipmentUnits.make,
          model: equipmentUnits.model,
          serial: equipmentUnits.serial,
          nameplate: equipmentUnits.nameplate,
          site: sites.name,
          customer: customers.name,
          contactName: sites.contactName,
          contactEmail: sites.contactEmail,
        },
        sql`FROM ${equipmentUnits} JOIN ${sites} ON ${sites.id} = ${equipmentUnits.siteId} JOIN ${customers} ON ${customers.id} = ${sites.customerId}
            WHERE ${equipmentUnits.id} = ${runs.unitId} AND ${equipmentUnits.shopId} = ${runs.shopId}`,
      ),
      steps: jsonRows(STEP_JSON, sql`FROM ${runSteps} WHERE ${runSteps.runId} = ${runs.id}`, sql`${runSteps.seq}`),
      notes: jsonRows(
        {
          id: runNotes.id,
          key: runNotes.idempotencyKey,
          node: runNotes.nodeKey,
          text: runNotes.text,
          author: author.name,
          createdAt: runNotes.createdAt,
        },
        sql`FROM ${runNotes} JOIN ${users} AS ${author} ON ${author.id} = ${runNotes.authorId} WHERE ${runNotes.runId} = ${runs.id}`,
        sql`${runNotes.createdAt}`,
      ),
      photos: jsonRows(
        {
          id: runPhotos.id,
          key: runPhotos.idempotencyKey,
          node: runPhotos.nodeKey,
          bytes: runPhotos.bytes,
          createdAt: runPhotos.createdAt,
        },
        sql`FROM ${runPhotos} WHERE ${runPhotos.runId} = ${runs.id} AND ${runPhotos.deletedAt} IS NULL`,
        sql`${runPhotos.createdAt}`,
      ),
      parts: jsonRows(
        { partNumber: runParts.partNumber, description: runParts.description, quantity: runParts.quantity },
        sql`FROM ${runParts} WHERE ${runParts.runId} = ${runs.id}`,
        sql`${runParts.position}`,
      ),
      meters: jsonRows(
        METER_JSON,
        sql`FROM ${meters} WHERE ${meters.shopId} = ${runs.shopId} AND ${meters.retiredAt} IS NULL`,
        sql`${meters.name}, ${meters.id}`,
      ),
      escalation: jsonRow(
        {
          id: escalations.id,
          reason: escalations.reason,
          raisedBy: raiser.name,
          raisedAt: escalations.raisedAt,
          takenBy: taker.name,
          fromTree: escalations.fromTree,
        },
        sql`FROM ${escalations} JOIN ${users} AS ${raiser} ON ${raiser.id} = ${escalations.raisedBy} LEFT JOIN ${users} AS ${taker} ON ${taker.id} = ${escalations.takenBy}
            WHERE ${escalations.runId} = ${runs.id} ORDER BY ${escalations.raisedAt} DESC`,
      ),
      report: jsonRow(
        { id: reports.id, number: reports.number, sentTo: reports.sentTo, sentAt: reports.sentAt },
        sql`FROM ${reports} WHERE ${reports.runId} = ${runs.id}`,
      ),
    })
    .from(runs)
    .innerJoin(technician, eq(technician.id, runs.technicianId))
    .innerJoin(starter, eq(starter.id, runs.startedBy))
    .where(and(eq(runs.id, sql.placeholder("runId")), eq(runs.shopId, sql.placeholder("shopId"))))
    .limit(1)
    .prepare(),
);

/** Everything the runner shows, for the run's own shop only. */
export async function getRunView(ctx: Ctx, runId: string): Promise<RunView> {
  authorize(ctx, "runs.view");
  const [row] = await runViewQuery().execute({ runId, shopId: ctx.shopId });
  if (!row) notFound("That run");
  const { run } = row;
  const [content, practice] = await Promise.all([versionContent(ctx, run.versionId), run.practice ? practiceViewOf(ctx, run) : null]);
  const c = fromJson(row.call);
  const u = fromJson(row.unit);
  const e = fromJson(row.escalation);
  const r = fromJson(row.report);
  const holds = run.technicianId === ctx.userId;
  const open = OPEN.includes(run.status);
  return {
    run: {
      id: run.id,
      status: run.status,
      practice: run.practice,
      stepCount: run.stepCount,
      currentNode: run.currentNode,
      endKind: run.endKind,
      rootCause: run.rootCause,
      actionTaken: run.actionTaken,
      minutesOnJob: run.minutesOnJob,
      abandonReason: run.abandonReason,
      startedAt: run.startedAt.toISOString(),
      pausedAt: iso(run.pausedAt),
      completedAt: iso(run.completedAt),
      technician: { id: run.technicianId, name: row.technicianName },
      startedBy: { id: run.startedBy, name: row.starterName },
    },
    call: c,
    unit: u,
    version: { id: content.versionId, treeId: content.treeId, number: content.number, title: content.title },
    tree: content.tree,
    bodies: content.bodies,
    description: content.description,
    steps: (fromJson(row.steps) ?? []).map(stepViewFromJson),
    notes: (fromJson(row.notes) ?? []).map((n): NoteView => ({ ...n, createdAt: jsonIso(n.createdAt) })),
    photos: (fromJson(row.photos) ?? []).map((p): PhotoView => ({ ...p, url: photoUrl(p.id), createdAt: jsonIso(p.createdAt) })),
    parts: fromJson(row.parts) ?? [],
    meters: fromJson(row.meters) ?? [],
    escalation: e ? { ...e, raisedAt: jsonIso(e.raisedAt), fromTree: Boolean(e.fromTree) } : null,
    practice,
    report: r ? { ...r, sentAt: jsonIso(r.sentAt) } : null,
    viewer: { id: ctx.userId, holds, canTakeOver: open && !holds && can(ctx, "runs.take-over") },
    timeZone: row.timeZone || "UTC",
  };
}
