// Reading a run: everything the runner shows (the pinned version, the step log, notes, photos,
// parts, the shop's meters, escalation and report), for the run's own shop only.
import { alias } from "drizzle-orm/mysql-core";
import { and, asc, desc, eq, isNull } from "drizzle-orm";
import { escalations, meters, reports, runNotes, runParts, runPhotos, runs, serviceCalls, users } from "../../../db/schema";
import type { Ctx } from "../../lib/context";
import { db } from "../../lib/db.server";
import { authorize, can } from "../../lib/policy";
import { notFound } from "../../lib/refusal";
import { photoUrl, type NoteView, type PhotoView, type RunView } from "../../lib/run-log";
import { unitView, unitWithPlace } from "../_query.server";
import { shopTimeZone } from "../shop.server";
import { practiceViewOf } from "../training/_scenario.server";
import { stepRows, stepView } from "./_log.server";
import { OPEN, versionContent } from "./_version.server";

const iso = (d: Date | null) => (d ? d.toISOString() : null);

const technician = alias(users, "technician");
const starter = alias(users, "starter");

async function runHead(ctx: Ctx, runId: string) {
  const [row] = await db()
    .select({ run: runs, technicianName: technician.name, starterName: starter.name })
    .from(runs)
    .innerJoin(technician, eq(technician.id, runs.technicianId))
    .innerJoin(starter, eq(starter.id, runs.startedBy))
    .where(and(eq(runs.id, runId), eq(runs.shopId, ctx.shopId)))
    .limit(1);
  return row ?? null;
}

/** Everything the runner shows, for the run's own shop only. */
export async function getRunView(ctx: Ctx, runId: string): Promise<RunView> {
  authorize(ctx, "runs.view");
  const head = (await runHead(ctx, runId)) ?? notFound("That run");
  const { run } = head;
  const content = await versionContent(ctx, run.versionId);
  const author = alias(users, "author");
  const raiser = alias(users, "raiser");
  const taker = alias(users, "taker");
  const [steps, notes, photos, parts, meterRows, escalation, report, call, unit, timeZone, practice] = await Promise.all([
    stepRows(runId),
    db()
      .select({ note: runNotes, author: author.name })
      .from(runNotes)
      .innerJoin(author, eq(author.id, runNotes.authorId))
      .where(eq(runNotes.runId, runId))
      .orderBy(asc(runNotes.createdAt)),
    db()
      .select()
      .from(runPhotos)
      .where(and(eq(runPhotos.runId, runId), isNull(runPhotos.deletedAt)))
      .orderBy(asc(runPhotos.createdAt)),
    db().select().from(runParts).where(eq(runParts.runId, runId)).orderBy(asc(runParts.position)),
    db()
      .select()
      .from(meters)
      .where(and(eq(meters.shopId, ctx.shopId), isNull(meters.retiredAt)))
      .orderBy(asc(meters.name)),
    db()
      .select({ e: escalations, raisedBy: raiser.name, takenBy: taker.name })
      .from(escalations)
      .innerJoin(raiser, eq(raiser.id, escalations.raisedBy))
      .leftJoin(taker, eq(taker.id, escalations.takenBy))
      .where(eq(escalations.runId, runId))
      .orderBy(desc(escalations.raisedAt))
      .limit(1),
    db().select().from(reports).where(eq(reports.runId, runId)).limit(1),
    run.callId ? db().select().from(serviceCalls).where(eq(serviceCalls.id, run.callId)).limit(1) : Promise.resolve([]),
    run.unitId ? unitWithPlace(ctx, run.unitId) : Promise.resolve(null),
    shopTimeZone(ctx),
    run.practice ? practiceViewOf(ctx, run) : Promise.resolve(null),
  ]);
  const c = call[0];
  const u = unit;
  const e = escalation[0];
  const r = report[0];
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
      technician: { id: run.technicianId, name: head.technicianName },
      startedBy: { id: run.startedBy, name: head.starterName },
    },
    call: c ? { id: c.id, number: c.number, symptom: c.symptom, priority: c.priority } : null,
    unit: u ? unitView(u) : null,
    version: { id: content.versionId, treeId: content.treeId, number: content.number, title: content.title },
    tree: content.tree,
    bodies: content.bodies,
    description: content.description,
    steps: steps.map(stepView),
    notes: notes.map(({ note, author }): NoteView => ({ id: note.id, key: note.idempotencyKey, node: note.nodeKey, text: note.text, author, createdAt: note.createdAt.toISOString() })),
    photos: photos.map((p): PhotoView => ({ id: p.id, key: p.idempotencyKey, node: p.nodeKey, url: photoUrl(p.id), bytes: p.bytes, createdAt: p.createdAt.toISOString() })),
    parts: parts.map((p) => ({ partNumber: p.partNumber, description: p.description, quantity: p.quantity })),
    meters: meterRows.map((m) => ({ id: m.id, name: m.name, quantity: m.quantity, unit: m.unit, rangeMax: m.rangeMax, resolution: m.resolution, percent: m.percent, counts: m.counts })),
    escalation: e
      ? { id: e.e.id, reason: e.e.reason, raisedBy: e.raisedBy, raisedAt: e.e.raisedAt.toISOString(), takenBy: e.takenBy, fromTree: e.e.fromTree }
      : null,
    practice,
    report: r ? { id: r.id, number: r.number, sentTo: r.sentTo, sentAt: iso(r.sentAt) } : null,
    viewer: { id: ctx.userId, holds, canTakeOver: open && !holds && can(ctx, "runs.take-over") },
    timeZone,
  };
}
