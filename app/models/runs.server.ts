// Runs: a technician walking one published tree version on a call. Every log entry is a step row;
// the engine replays the stored log to judge each new entry, on the server as on the phone.
import { createHash } from "node:crypto";
import { and, asc, desc, eq, inArray, isNull, max } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { z } from "zod";
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
  treeVersions,
  users,
  type RunStatus,
} from "../../db/schema";
import { tryEntry, type LogEntry, type RunState } from "../engine/traversal";
import type { Meter, OutcomeNode, Tree, TreeNode } from "../engine/types";
import { roleAllows } from "../lib/auth.server";
import type { Ctx } from "../lib/context";
import { db, writeTx, type Db, type Tx } from "../lib/db.server";
import { markdownBlocks } from "../lib/md.server";
import type { MdBlock } from "../lib/md";
import { withNextNumber } from "./calls.server";
import { getUnit } from "./equipment.server";
import { canonicalPayload, logOf, meterAccuracy, type NoteView, type PhotoView, type RunView, type StepView } from "./run-log";
import { loadVersion } from "./trees.server";
import { recordRunFacts } from "./insights/facts.server";


export type Failure = { ok: false; status: 403 | 404 | 409 | 422; message: string; code?: string };
const fail = (status: Failure["status"], message: string, code?: string): Failure => (code ? { ok: false, status, message, code } : { ok: false, status, message });

const OPEN: RunStatus[] = ["active", "paused", "escalated"];

// --- tree versions (immutable once published, so cached per process) ------------------------------

type VersionContent = { shopId: string; versionId: string; treeId: string; number: number | null; title: string; tree: Tree; bodies: Record<string, MdBlock[]>; description: MdBlock[] };
const versionCache = new Map<string, VersionContent>();

/** A run's tree version with its step bodies as safe blocks (cached: published versions never change). */
export async function loadRunVersion(ctx: Ctx, versionId: string): Promise<VersionContent | null> {
  return versionContent(ctx, versionId);
}

async function versionContent(ctx: Ctx, versionId: string): Promise<VersionContent | null> {
  const hit = versionCache.get(versionId);
  if (hit && hit.shopId === ctx.shopId) return hit;
  const loaded = await loadVersion(ctx, versionId);
  if (!loaded) return null;
  const content: VersionContent = {
    shopId: ctx.shopId,
    versionId,
    treeId: loaded.version.treeId,
    number: loaded.version.number,
    title: loaded.version.title,
    tree: loaded.tree,
    bodies: Object.fromEntries(loaded.tree.nodes.map((n) => [n.id, markdownBlocks(n.body)])),
    description: markdownBlocks(loaded.tree.description),
  };
  if (loaded.version.state !== "draft") {
    if (versionCache.size > 500) versionCache.clear();
    versionCache.set(versionId, content);
  }
  return content;
}

function nodeOf(tree: Tree | undefined, id: string | null | undefined): TreeNode | undefined {
  return id && tree ? tree.nodes.find((n) => n.id === id) : undefined;
}

/** The newest published version of one of the shop's trees. */
async function currentPublished(ctx: Ctx, treeId: string, tx: Tx | Db = db()) {
  const [row] = await tx
    .select({ id: treeVersions.id, number: treeVersions.number })
    .from(treeVersions)
    .where(and(eq(treeVersions.treeId, treeId), eq(treeVersions.shopId, ctx.shopId), eq(treeVersions.state, "published")))
    .orderBy(desc(treeVersions.number))
    .limit(1);
  return row ?? null;
}

// --- starting ------------------------------------------------------------------------------------

export type StartInput = { treeId: string; callId?: string; practice?: boolean; scenarioId?: string };

/**
 * Starts a run on the tree's version published now; the run keeps that version whatever is
 * published later. From a call, the call must be open and have no run in progress.
 */
export async function startRun(ctx: Ctx, input: StartInput): Promise<{ ok: true; runId: string; versionId: string } | (Failure & { runId?: string })> {
  return writeTx(async (tx) => {
    let unitId: string | null = null;
    if (input.callId) {
      const [call] = await tx
        .select()
        .from(serviceCalls)
        .where(and(eq(serviceCalls.id, input.callId), eq(serviceCalls.shopId, ctx.shopId)))
        .for("update");
      if (!call) return fail(404, "That service call was not found.");
      if (call.status === "done" || call.status === "cancelled") return fail(409, "This call is closed. Reopen it before starting another run.");
      const [busy] = await tx
        .select({ id: runs.id })
        .from(runs)
        .where(and(eq(runs.callId, call.id), inArray(runs.status, OPEN)))
        .limit(1);
      if (busy) return { ...fail(409, "This call already has a run in progress: carry on with it."), runId: busy.id };
      unitId = call.unitId;
    }
    const version = await currentPublished(ctx, input.treeId, tx);
    if (!version) return fail(404, "That tree has no published version to run.");
    const content = await versionContent(ctx, version.id);
    if (!content) return fail(404, "That tree has no published version to run.");
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
    return { ok: true as const, runId, versionId: version.id };
  });
}

// --- reading a run ---------------------------------------------------------------------------------

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

const iso = (d: Date | null) => (d ? d.toISOString() : null);

export function stepView(row: typeof runSteps.$inferSelect): StepView {
  return {
    seq: row.seq,
    key: row.idempotencyKey,
    type: row.type,
    node: row.nodeKey,
    kind: row.kind ?? null,
    answer: row.answer,
    typed: row.typed,
    value: row.value,
    unit: row.unit,
    si: row.siValue,
    siUnit: row.siUnit,
    verdict: row.verdict,
    message: row.message,
    limitsText: row.limits?.text ?? null,
    meterId: row.meterId,
    meter: row.meter,
    to: row.toNode,
    undone: row.undone,
    undoesSeq: row.undoesSeq,
    enteredBy: row.enteredBy,
    recordedAt: row.recordedAt.toISOString(),
  };
}

export function photoUrl(id: string): string {
  return `/api/photos/${id}`;
}

async function stepRows(runId: string, tx: Tx | Db = db()) {
  return tx.select().from(runSteps).where(eq(runSteps.runId, runId)).orderBy(asc(runSteps.seq));
}

/** Everything the runner shows, for the run's own shop only (null otherwise). */
export async function getRunView(ctx: Ctx, runId: string): Promise<RunView | null> {
  const head = await runHead(ctx, runId);
  if (!head) return null;
  const { run } = head;
  const content = await versionContent(ctx, run.versionId);
  if (!content) return null;
  const author = alias(users, "author");
  const raiser = alias(users, "raiser");
  const taker = alias(users, "taker");
  const [steps, notes, photos, parts, meterRows, escalation, report, call, unit, shop] = await Promise.all([
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
    run.unitId ? getUnit(ctx, run.unitId) : Promise.resolve(null),
    db().select({ settings: shops.settings }).from(shops).where(eq(shops.id, ctx.shopId)).limit(1),
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
    unit: u
      ? {
          id: u.unit.id,
          category: u.unit.category,
          make: u.unit.make,
          model: u.unit.model,
          serial: u.unit.serial,
          nameplate: u.unit.nameplate,
          site: u.site.name,
          customer: u.customer.name,
          contactName: u.site.contactName,
          contactEmail: u.site.contactEmail,
        }
      : null,
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
    report: r ? { id: r.id, number: r.number, sentTo: r.sentTo, sentAt: iso(r.sentAt) } : null,
    viewer: { id: ctx.userId, holds, canTakeOver: open && !holds && roleAllows(ctx.role, ["lead"]) },
    timeZone: shop[0]?.settings.timeZone || "UTC",
  };
}

// --- steps -----------------------------------------------------------------------------------------

const nodeKey = z.string().min(1).max(64);
export const stepPayload = z.object({
  key: z.string().uuid("Each step needs an idempotency key (a UUID)."),
  entry: z.discriminatedUnion("type", [
    z.object({ type: z.literal("answer"), node: nodeKey, answer: z.string().min(1).max(220) }),
    z.object({ type: z.literal("reading"), node: nodeKey, reading: z.string().trim().min(1, "Enter the reading.").max(120) }),
    z.object({ type: z.literal("nameplate"), node: nodeKey, value: z.string().trim().min(1, "Enter the value.").max(120) }),
    z.object({ type: z.literal("acknowledge"), node: nodeKey }),
    z.object({ type: z.literal("continue"), node: nodeKey }),
    z.object({ type: z.literal("undo") }),
  ]),
  meterId: z.string().uuid().nullish(),
  at: z.iso.datetime({ offset: true }).nullish(),
});
export type StepInput = z.infer<typeof stepPayload>;

export type StepResult = { ok: true; replayed: boolean; step: StepView; run: { status: RunStatus; currentNode: string | null; endKind: string | null; stepCount: number } } | Failure;

const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");

async function lockRun(tx: Tx, ctx: Ctx, runId: string) {
  const [row] = await tx
    .select()
    .from(runs)
    .where(and(eq(runs.id, runId), eq(runs.shopId, ctx.shopId)))
    .for("update");
  return row ?? null;
}

function runSummary(r: { status: RunStatus; currentNode: string | null; endKind: string | null; stepCount: number }) {
  return { status: r.status, currentNode: r.currentNode, endKind: r.endKind, stepCount: r.stepCount };
}

function endOf(state: RunState): { endKind: string | null; endNode: string | null } {
  return state.finished ? { endKind: state.finished.kind, endNode: state.finished.node } : { endKind: null, endNode: null };
}

/**
 * Records one step. The same idempotency key again answers with the stored step (no second row);
 * the same key with another payload is refused (422). The engine judges the entry against the
 * stored log; the verdict stored is the server's.
 */
export async function postStep(ctx: Ctx, runId: string, input: StepInput): Promise<StepResult> {
  const meterId = input.entry.type === "reading" ? (input.meterId ?? null) : null;
  const hash = sha256(canonicalPayload(input.entry as LogEntry, meterId));
  return writeTx(async (tx) => {
    const run = await lockRun(tx, ctx, runId);
    if (!run) return fail(404, "That run was not found.");
    const [existing] = await tx
      .select()
      .from(runSteps)
      .where(and(eq(runSteps.runId, runId), eq(runSteps.idempotencyKey, input.key)))
      .limit(1);
    if (existing) {
      if (existing.payloadHash !== hash) return fail(422, "This idempotency key was already used for a different step.", "key-reused");
      return { ok: true as const, replayed: true, step: stepView(existing), run: runSummary(run) };
    }
    if (run.technicianId !== ctx.userId) return fail(403, "Only the technician holding this run can add steps. A lead can take it over first.");
    if (run.status !== "active" && run.status !== "paused") return fail(409, `This run is ${run.status === "done" ? "finished" : run.status}; it takes no more steps.`, "closed");
    const content = await versionContent(ctx, run.versionId);
    if (!content) return fail(404, "The run's tree version was not found.");

    let entry = input.entry as LogEntry;
    let meterRow: typeof meters.$inferSelect | undefined;
    if (entry.type === "reading") {
      const node = nodeOf(content.tree, entry.node);
      if (meterId) {
        [meterRow] = await tx
          .select()
          .from(meters)
          .where(and(eq(meters.id, meterId), eq(meters.shopId, ctx.shopId)))
          .limit(1);
        if (!meterRow) return fail(422, "That meter is not in your shop's list.", "meter");
        if (node?.kind === "measurement" && meterRow.quantity !== node.quantity)
          return fail(422, `${meterRow.name} does not measure ${node.quantity}; choose another meter.`, "meter");
        entry = { ...entry, meter: meterAccuracy(meterRow) };
      } else if (node?.kind === "measurement" && node.meter) {
        entry = { ...entry, meter: node.meter };
      }
    }

    const rows = await stepRows(runId, tx);
    const log = logOf(rows.map(stepView));
    const tried = tryEntry(content.tree, log, entry);
    if (!tried.ok) return fail(422, tried.rejection.message, tried.rejection.code);

    const seq = run.stepCount;
    const s = tried.step;
    const v = s?.verdict;
    const undoneSeq = entry.type === "undo" ? (tried.state.undone[tried.state.undone.length - 1] ?? null) : null;
    const usedMeter: Meter | null = entry.type === "reading" ? (entry.meter ?? null) : null;
    const row: typeof runSteps.$inferInsert = {
      id: crypto.randomUUID(),
      runId,
      shopId: ctx.shopId,
      seq,
      idempotencyKey: input.key,
      payloadHash: hash,
      type: entry.type,
      nodeKey: entry.type === "undo" ? null : entry.node,
      kind: s?.kind ?? null,
      answer: s?.answer ?? null,
      typed: entry.type === "reading" ? entry.reading.trim() : entry.type === "nameplate" ? entry.value.trim() : null,
      value: v?.reading.value ?? s?.nameplate?.value ?? null,
      unit: v?.reading.unit ?? s?.nameplate?.unit ?? null,
      siValue: v?.reading.si ?? s?.nameplate?.si ?? null,
      siUnit: v?.reading.siUnit ?? s?.nameplate?.siUnit ?? null,
      verdict: v?.verdict ?? null,
      limitsLo: v?.limits.lo ?? null,
      limitsHi: v?.limits.hi ?? null,
      limits: v?.limits ?? null,
      message: v ? v.message.slice(0, 600) : s?.nameplate ? `${s.nameplate.display} ${s.nameplate.unit}` : null,
      meterId: meterRow?.id ?? null,
      meter: usedMeter,
      uncertainty: v?.uncertainty?.value ?? null,
      branch: s?.branch ?? null,
      toNode: s?.to ?? null,
      undoesSeq: undoneSeq,
      enteredBy: ctx.userId,
      clientAt: input.at ? new Date(input.at) : null,
      recordedAt: new Date(),
    };
    await tx.insert(runSteps).values(row);
    if (undoneSeq !== null) await tx.update(runSteps).set({ undone: true }).where(and(eq(runSteps.runId, runId), eq(runSteps.seq, undoneSeq)));
    const next = { status: "active" as RunStatus, currentNode: tried.state.current, ...endOf(tried.state), stepCount: seq + 1 };
    await tx
      .update(runs)
      .set({ ...next, pausedAt: null, updatedAt: new Date() })
      .where(eq(runs.id, runId));
    const [stored] = await tx.select().from(runSteps).where(eq(runSteps.id, row.id!));
    return { ok: true as const, replayed: false, step: stepView(stored!), run: runSummary(next) };
  });
}

// --- notes -----------------------------------------------------------------------------------------

export const noteInput = z.object({
  key: z.string().uuid(),
  node: nodeKey,
  text: z.string().trim().min(1, "Write the note first.").max(2000, "Keep a note under 2000 characters."),
});
export type NoteInput = z.infer<typeof noteInput>;

export async function addNote(ctx: Ctx, runId: string, input: NoteInput): Promise<{ ok: true; note: NoteView } | Failure> {
  return writeTx(async (tx) => {
    const run = await lockRun(tx, ctx, runId);
    if (!run) return fail(404, "That run was not found.");
    const [existing] = await tx
      .select()
      .from(runNotes)
      .where(and(eq(runNotes.runId, runId), eq(runNotes.idempotencyKey, input.key)))
      .limit(1);
    const [me] = await tx.select({ name: users.name }).from(users).where(eq(users.id, ctx.userId));
    const view = (n: typeof runNotes.$inferSelect): NoteView => ({ id: n.id, key: n.idempotencyKey, node: n.nodeKey, text: n.text, author: me?.name ?? "", createdAt: n.createdAt.toISOString() });
    if (existing) {
      if (existing.text !== input.text || existing.nodeKey !== input.node) return fail(422, "This idempotency key was already used for a different note.", "key-reused");
      return { ok: true as const, note: view(existing) };
    }
    if (run.technicianId !== ctx.userId) return fail(403, "Only the technician holding this run can add notes.");
    if (!OPEN.includes(run.status)) return fail(409, "This run is closed.", "closed");
    const content = await versionContent(ctx, run.versionId);
    if (!nodeOf(content?.tree, input.node)) return fail(422, "That step is not in this run's tree.");
    const note = { id: crypto.randomUUID(), runId, shopId: ctx.shopId, nodeKey: input.node, idempotencyKey: input.key, text: input.text, authorId: ctx.userId, createdAt: new Date() };
    await tx.insert(runNotes).values(note);
    return { ok: true as const, note: view(note) };
  });
}

// --- pause, resume, abandon, escalate, take over ------------------------------------------------------

export const statusInput = z.discriminatedUnion("action", [
  z.object({ action: z.literal("pause") }),
  z.object({ action: z.literal("resume") }),
  z.object({ action: z.literal("abandon"), reason: z.string().trim().min(3, "Say why the run is abandoned.").max(500, "Keep it under 500 characters.") }),
  z.object({ action: z.literal("escalate"), reason: z.string().trim().min(3, "Say what the lead should look at.").max(500, "Keep it under 500 characters.") }),
  z.object({ action: z.literal("take-over") }),
]);
export type StatusInput = z.infer<typeof statusInput>;

export type StatusResult = { ok: true; status: RunStatus } | Failure;

async function setCallStatus(tx: Tx, callId: string | null, status: "open" | "in_progress" | "escalated" | "done", from?: string[]) {
  if (!callId) return;
  const now = new Date();
  await tx
    .update(serviceCalls)
    .set({ status, updatedAt: now, ...(status === "done" ? { closedAt: now } : {}) })
    .where(and(eq(serviceCalls.id, callId), from ? inArray(serviceCalls.status, from as ("open" | "in_progress" | "escalated")[]) : undefined));
}

async function closeEscalations(tx: Tx, runId: string, takenBy?: string) {
  const now = new Date();
  await tx
    .update(escalations)
    .set(takenBy ? { takenBy, takenAt: now, closedAt: now } : { closedAt: now })
    .where(and(eq(escalations.runId, runId), isNull(escalations.closedAt)));
}

/** Pause, resume, abandon (with a reason), escalate to a lead (with a reason), or take over (leads). */
export async function changeRunStatus(ctx: Ctx, runId: string, input: StatusInput): Promise<StatusResult> {
  return writeTx(async (tx): Promise<StatusResult> => {
    const run = await lockRun(tx, ctx, runId);
    if (!run) return fail(404, "That run was not found.");
    const holds = run.technicianId === ctx.userId;
    const isLead = roleAllows(ctx.role, ["lead"]);
    const now = new Date();
    const set = (patch: Partial<typeof runs.$inferInsert>) => tx.update(runs).set({ ...patch, updatedAt: now }).where(eq(runs.id, runId));
    if (!OPEN.includes(run.status)) return fail(409, "This run is closed.", "closed");
    switch (input.action) {
      case "pause":
        if (!holds) return fail(403, "Only the technician holding this run can pause it.");
        if (run.status === "paused") return { ok: true, status: "paused" };
        if (run.status !== "active") return fail(409, "Only a run in progress can be paused.");
        await set({ status: "paused", pausedAt: now });
        return { ok: true, status: "paused" };
      case "resume":
        if (!holds) return fail(403, "Only the technician holding this run can resume it.");
        if (run.status === "active") return { ok: true, status: "active" };
        if (run.status !== "paused") return fail(409, "This run is waiting for a lead.");
        await set({ status: "active", pausedAt: null });
        return { ok: true, status: "active" };
      case "abandon":
        if (!holds && !isLead) return fail(403, "Only the technician holding this run, or a lead, can abandon it.");
        await set({ status: "abandoned", abandonReason: input.reason, completedAt: now });
        await closeEscalations(tx, runId);
        await setCallStatus(tx, run.callId, "open", ["in_progress", "escalated"]);
        await recordRunFacts(tx, runId);
        return { ok: true, status: "abandoned" };
      case "escalate": {
        if (!holds) return fail(403, "Only the technician holding this run can escalate it.");
        if (run.status === "escalated") return { ok: true, status: "escalated" };
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
        return { ok: true, status: "escalated" };
      }
      case "take-over":
        if (!isLead) return fail(403, "Only a lead or the owner can take over a run.");
        await set({ technicianId: ctx.userId, status: "active", pausedAt: null });
        await closeEscalations(tx, runId, ctx.userId);
        await setCallStatus(tx, run.callId, "in_progress", ["open", "escalated"]);
        return { ok: true, status: "active" };
    }
  });
}

// --- outcome ---------------------------------------------------------------------------------------

export const outcomeInput = z.object({
  action: z.string().trim().min(3, "Say what you did about it.").max(4000, "Keep it under 4000 characters."),
  minutes: z.coerce.number({ message: "Enter the time on the job in minutes." }).int("Whole minutes, please.").min(1, "At least 1 minute.").max(1440, "At most 24 hours (1440 minutes)."),
  parts: z
    .array(
      z.object({
        partNumber: z.string().trim().max(60, "Keep the part number under 60 characters.").default(""),
        description: z.string().trim().min(1, "Describe the part.").max(300, "Keep it under 300 characters."),
        quantity: z.coerce.number({ message: "Enter a quantity." }).int("A whole number.").min(1, "At least 1.").max(999, "At most 999."),
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
export async function recordOutcome(ctx: Ctx, runId: string, input: OutcomeInput): Promise<{ ok: true; reportId: string; number: number } | Failure> {
  const existing = async () => {
    const [r] = await db().select().from(reports).where(and(eq(reports.runId, runId), eq(reports.shopId, ctx.shopId))).limit(1);
    return r ? { ok: true as const, reportId: r.id, number: r.number } : null;
  };
  const result = await writeTx(async (tx) => {
    const run = await lockRun(tx, ctx, runId);
    if (!run) return fail(404, "That run was not found.");
    if (run.status === "done") return null;
    if (run.technicianId !== ctx.userId) return fail(403, "Only the technician holding this run can record its outcome.");
    if (run.status !== "active" && run.status !== "paused") return fail(409, "This run is not in progress.", "closed");
    const content = await versionContent(ctx, run.versionId);
    const outcome = nodeOf(content?.tree, run.endNode);
    if (run.endKind !== "outcome" || outcome?.kind !== "outcome") return fail(409, "The run has not reached a root cause yet.", "not-at-outcome");
    const now = new Date();
    await tx
      .update(runs)
      .set({ status: "done", rootCause: (outcome as OutcomeNode).title.slice(0, 300), actionTaken: input.action, minutesOnJob: input.minutes, completedAt: now, pausedAt: null, updatedAt: now })
      .where(eq(runs.id, runId));
    await tx.delete(runParts).where(eq(runParts.runId, runId));
    if (input.parts.length) {
      await tx.insert(runParts).values(input.parts.map((p, i) => ({ id: crypto.randomUUID(), runId, shopId: ctx.shopId, position: i, partNumber: p.partNumber, description: p.description, quantity: p.quantity })));
    }
    await closeEscalations(tx, runId);
    await setCallStatus(tx, run.callId, "done");
    await recordRunFacts(tx, runId);
    const id = crypto.randomUUID();
    const number = await withNextNumber(
      async () => {
        const [row] = await tx.select({ n: max(reports.number) }).from(reports).where(eq(reports.shopId, ctx.shopId));
        return (row?.n ?? 0) + 1;
      },
      async (n) => {
        await tx.insert(reports).values({ id, shopId: ctx.shopId, number: n, runId, callId: run.callId, createdBy: ctx.userId });
        return n;
      },
    );
    return { ok: true as const, reportId: id, number };
  });
  return result ?? (await existing()) ?? fail(404, "That run was not found.");
}

// --- lists -----------------------------------------------------------------------------------------

/** Open escalations of the shop, oldest first, with where each run stands. */
export async function listOpenEscalations(ctx: Ctx) {
  const raiser = alias(users, "raiser");
  const rows = await db()
    .select({
      id: escalations.id,
      reason: escalations.reason,
      raisedAt: escalations.raisedAt,
      fromTree: escalations.fromTree,
      nodeKey: escalations.nodeKey,
      raisedBy: raiser.name,
      runId: runs.id,
      versionId: runs.versionId,
      stepCount: runs.stepCount,
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
    .leftJoin(sites, eq(sites.id, equipmentUnits.siteId))
    .leftJoin(customers, eq(customers.id, sites.customerId))
    .where(and(eq(escalations.shopId, ctx.shopId), isNull(escalations.closedAt)))
    .orderBy(asc(escalations.raisedAt));
  return Promise.all(
    rows.map(async (r) => {
      const content = await versionContent(ctx, r.versionId);
      return { ...r, treeTitle: content?.title ?? "", nodeTitle: nodeOf(content?.tree, r.nodeKey)?.title ?? null };
    }),
  );
}

export async function countOpenEscalations(ctx: Ctx): Promise<number> {
  const rows = await db().select({ id: escalations.id }).from(escalations).where(and(eq(escalations.shopId, ctx.shopId), isNull(escalations.closedAt)));
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

export async function runsOfCall(ctx: Ctx, callId: string) {
  return runListQuery(ctx)
    .where(and(eq(runs.shopId, ctx.shopId), eq(runs.callId, callId)))
    .orderBy(desc(runs.startedAt));
}

/** A unit's history: its runs (with root causes) and the parts replaced on it. */
export async function historyOfUnit(ctx: Ctx, unitId: string) {
  const [unitRuns, parts] = await Promise.all([
    runListQuery(ctx)
      .where(and(eq(runs.shopId, ctx.shopId), eq(runs.unitId, unitId), eq(runs.practice, false)))
      .orderBy(desc(runs.startedAt)),
    db()
      .select({ partNumber: runParts.partNumber, description: runParts.description, quantity: runParts.quantity, runId: runs.id, completedAt: runs.completedAt, callNumber: serviceCalls.number })
      .from(runParts)
      .innerJoin(runs, eq(runs.id, runParts.runId))
      .leftJoin(serviceCalls, eq(serviceCalls.id, runs.callId))
      .where(and(eq(runParts.shopId, ctx.shopId), eq(runs.unitId, unitId), eq(runs.status, "done")))
      .orderBy(desc(runs.completedAt), asc(runParts.position)),
  ]);
  return { runs: unitRuns, parts };
}
