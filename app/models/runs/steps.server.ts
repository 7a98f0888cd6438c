// Recording a run's steps. Every log entry is a step row; the engine replays the stored log to
// judge each new entry, on the server as on the phone. Retries carry the same idempotency key.
import { createHash } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { LRUCache } from "lru-cache";
import { z } from "zod";
import { runs, runSteps, type RunStatus } from "../../../db/schema";
import { practiceTryEntry, type PracticeEntry } from "../../engine/training/practice";
import { tryEntry, type LogEntry, type Rejection, type RunState } from "../../engine/traversal";
import { VERDICTS, type Meter } from "../../engine/types";
import type { Ctx } from "../../lib/context";
import { writeTx } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { notFound, Refusal } from "../../lib/refusal";
import { canonicalPayload, entryOf, meterAccuracy, type StepView } from "../../lib/run-log";
import { lockRunForStep, readLog, stepByKey, stepView, type LoggedEntry, type StepViewSource } from "./_log.server";
import { nodeOf, versionContent } from "./_version.server";

export const nodeKey = z.string().min(1).max(64);
export const stepPayload = z.object({
  key: z.string().uuid("Each step needs an idempotency key (a UUID)."),
  entry: z.discriminatedUnion("type", [
    z.object({ type: z.literal("answer"), node: nodeKey, answer: z.string().min(1).max(220) }),
    z.object({
      type: z.literal("reading"),
      node: nodeKey,
      reading: z.string().trim().min(1, "Enter the reading.").max(120),
      /** Practice runs only: the trainee's own call, which the run follows. */
      call: z.enum(VERDICTS).optional(),
      /** The technician confirms a reading the engine found implausible (refused without it, code "needs-confirmation"). */
      confirmed: z.boolean().optional(),
    }),
    z.object({ type: z.literal("nameplate"), node: nodeKey, value: z.string().trim().min(1, "Enter the value.").max(120) }),
    z.object({ type: z.literal("acknowledge"), node: nodeKey }),
    z.object({ type: z.literal("continue"), node: nodeKey }),
    z.object({ type: z.literal("undo") }),
  ]),
  meterId: z.string().uuid().nullish(),
  at: z.iso.datetime({ offset: true }).nullish(),
});
export type StepInput = z.infer<typeof stepPayload>;

export type StepResult = {
  replayed: boolean;
  step: StepView;
  run: { status: RunStatus; currentNode: string | null; endKind: string | null; stepCount: number };
};

const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");

function runSummary(r: { status: RunStatus; currentNode: string | null; endKind: string | null; stepCount: number }) {
  return { status: r.status, currentNode: r.currentNode, endKind: r.endKind, stepCount: r.stepCount };
}

function endOf(state: RunState): { endKind: string | null; endNode: string | null } {
  return state.finished ? { endKind: state.finished.kind, endNode: state.finished.node } : { endKind: null, endNode: null };
}

/** The engine's refusal as the API's: its words and code, with what to ask (`confirm`) or offer (`suggestions`). */
function refusalOf(r: Rejection): Refusal {
  const details = { ...(r.confirm ? { confirm: r.confirm } : {}), ...(r.suggestions ? { suggestions: r.suggestions } : {}) };
  return new Refusal("rejected", r.message, Object.keys(details).length ? { code: r.code, details } : { code: r.code });
}

/**
 * Each run's log as this process last stored it, with the step count it had then. A log only ever
 * grows by one step row per step count (postStep is its only writer), so when the locked run still
 * has that step count, this is its log and the step need not read it again; when another server
 * (or an earlier failure) moved the count on, the log is read after the lock as usual.
 */
const knownLogs = new LRUCache<string, { stepCount: number; log: LoggedEntry[] }>({ max: 1000 });

/**
 * Records one step. The same idempotency key again answers with the stored step (no second row);
 * the same key with another payload is refused (422). The engine judges the entry against the
 * stored log; the verdict stored is the server's.
 *
 * A reading costs six statements with the session's: BEGIN, the run locked with its log and meter
 * (lockRunForStep; the log left out while knownLogs has it), INSERT, UPDATE of the run, COMMIT. The
 * key is checked against that log, and the answer is the row as inserted, not read back.
 */
export async function postStep(ctx: Ctx, runId: string, input: StepInput): Promise<StepResult> {
  authorize(ctx, "runs.view");
  const meterId = input.entry.type === "reading" ? (input.meterId ?? null) : null;
  const hash = sha256(canonicalPayload(input.entry as LogEntry, meterId));
  const known = knownLogs.get(runId);
  const { result, log } = await writeTx(async (tx) => {
    const locked = (await lockRunForStep(tx, ctx, runId, meterId, !known)) ?? notFound("That run");
    const { run, meter } = locked;
    const log = locked.log ?? (known?.stepCount === run.stepCount ? known.log : await readLog(tx, runId));

    // A retry: the stored answer, looked up before the holder and status checks.
    const logged = log.find((e) => e.key === input.key);
    if (logged) {
      if (logged.hash !== hash)
        throw new Refusal("rejected", "This idempotency key was already used for a different step.", { code: "key-reused" });
      const stored = (await stepByKey(tx, runId, input.key))!;
      return { result: { replayed: true, step: stepView(stored), run: runSummary(run) }, log };
    }
    authorize(ctx, "runs.step", { holder: run.technicianId === ctx.userId });
    if (run.status !== "active" && run.status !== "paused")
      throw new Refusal("conflict", `This run is ${run.status === "done" ? "finished" : run.status}; it takes no more steps.`, {
        code: "closed",
      });
    const content = await versionContent(ctx, run.versionId, tx);

    // A reading is judged with the accuracy of the shop meter chosen, else the procedure's own.
    let entry = input.entry as LogEntry;
    if (entry.type === "reading") {
      const node = nodeOf(content.tree, entry.node);
      if (meterId) {
        if (!meter) throw new Refusal("rejected", "That meter is not in your shop's list.", { code: "meter" });
        if (node?.kind === "measurement" && meter.quantity !== node.quantity)
          throw new Refusal("rejected", `${meter.name} does not measure ${node.quantity}; choose another meter.`, { code: "meter" });
        entry = { ...entry, meter: meterAccuracy(meter) };
      } else if (node?.kind === "measurement" && node.meter) {
        entry = { ...entry, meter: node.meter };
      }
    }

    // Practice runs follow the trainee's call on each reading; the engine's verdict is kept beside it.
    const call = entry.type === "reading" ? (entry as PracticeEntry & { type: "reading" }).call : undefined;
    if (call && !run.practice)
      throw new Refusal("rejected", "Only a practice run takes your own call on a reading.", { code: "not-practice" });
    const past = log.map(entryOf);
    const tried = run.practice
      ? practiceTryEntry(content.tree, past as PracticeEntry[], entry as PracticeEntry)
      : tryEntry(content.tree, past, entry);
    if (!tried.ok) throw refusalOf(tried.rejection);

    const seq = run.stepCount;
    const s = tried.step;
    const v = s?.verdict;
    const undoneSeq = entry.type === "undo" ? (tried.state.undone[tried.state.undone.length - 1] ?? null) : null;
    const usedMeter: Meter | null = entry.type === "reading" ? (entry.meter ?? null) : null;
    const row = {
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
      call: call ?? null,
      limitsLo: v?.limits.lo ?? null,
      limitsHi: v?.limits.hi ?? null,
      limits: v?.limits ?? null,
      message: v ? v.message.slice(0, 600) : s?.nameplate ? `${s.nameplate.display} ${s.nameplate.unit}` : null,
      meterId: meterId && meter ? meter.id : null,
      meter: usedMeter,
      confirmed: s?.confirmed === true,
      uncertainty: v?.uncertainty?.value ?? null,
      branch: s?.branch ?? null,
      toNode: s?.to ?? null,
      undoesSeq: undoneSeq,
      undone: false,
      enteredBy: ctx.userId,
      clientAt: input.at ? new Date(input.at) : null,
      recordedAt: new Date(),
    } satisfies typeof runSteps.$inferInsert & StepViewSource;
    await tx.insert(runSteps).values(row);
    if (undoneSeq !== null)
      await tx
        .update(runSteps)
        .set({ undone: true })
        .where(and(eq(runSteps.runId, runId), eq(runSteps.seq, undoneSeq)));
    const next = { status: "active" as RunStatus, currentNode: tried.state.current, ...endOf(tried.state), stepCount: seq + 1 };
    await tx
      .update(runs)
      .set({ ...next, pausedAt: null, updatedAt: new Date() })
      .where(eq(runs.id, runId));
    const stored: LoggedEntry = {
      seq,
      key: row.idempotencyKey,
      hash,
      type: row.type,
      node: row.nodeKey,
      answer: row.answer,
      typed: row.typed,
      meter: row.meter,
      call: row.call,
      confirmed: row.confirmed,
    };
    return { result: { replayed: false, step: stepView(row), run: runSummary(next) }, log: [...log, stored] };
  });
  knownLogs.set(runId, { stepCount: result.run.stepCount, log });
  return result;
}
