// A run's step rows, read in order and shown as the wire's StepView, and the one statement a step
// starts with (the run locked, with its log and the meter chosen). Used by the run models only.
import { and, asc, eq, sql } from "drizzle-orm";
import { meters, runs, runSteps } from "../../../db/schema";
import type { Ctx } from "../../lib/context";
import { db, type Db, type Tx } from "../../lib/db.server";
import type { MeterView, StepView } from "../../lib/run-log";
import { fromJson, jsonIso, jsonObject, jsonRows, type JsonOf } from "../_query.server";

export type StepRow = typeof runSteps.$inferSelect;

/** The columns a StepView is made of: a stored row, or the row a step has just inserted. */
export type StepViewSource = Pick<
  StepRow,
  | "seq"
  | "idempotencyKey"
  | "type"
  | "nodeKey"
  | "kind"
  | "answer"
  | "typed"
  | "value"
  | "unit"
  | "siValue"
  | "siUnit"
  | "verdict"
  | "call"
  | "message"
  | "limits"
  | "meterId"
  | "meter"
  | "confirmed"
  | "toNode"
  | "undone"
  | "undoesSeq"
  | "enteredBy"
  | "recordedAt"
>;

export function stepView(row: StepViewSource): StepView {
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
    call: row.call,
    message: row.message,
    limitsText: row.limits?.text ?? null,
    meterId: row.meterId,
    meter: row.meter,
    confirmed: row.confirmed,
    to: row.toNode,
    undone: row.undone,
    undoesSeq: row.undoesSeq,
    enteredBy: row.enteredBy,
    recordedAt: row.recordedAt.toISOString(),
  };
}

/** The run's step rows in log order. */
export async function stepRows(runId: string, tx: Tx | Db = db()): Promise<StepRow[]> {
  return tx.select().from(runSteps).where(eq(runSteps.runId, runId)).orderBy(asc(runSteps.seq));
}

/** A step row as a JSON object with the StepView's names, for reading a run's steps inside its own statement. */
export const STEP_JSON = {
  seq: runSteps.seq,
  key: runSteps.idempotencyKey,
  type: runSteps.type,
  node: runSteps.nodeKey,
  kind: runSteps.kind,
  answer: runSteps.answer,
  typed: runSteps.typed,
  value: runSteps.value,
  unit: runSteps.unit,
  si: runSteps.siValue,
  siUnit: runSteps.siUnit,
  verdict: runSteps.verdict,
  call: runSteps.call,
  message: runSteps.message,
  limitsText: sql<string | null>`JSON_VALUE(${runSteps.limits}, '$.text')`,
  meterId: runSteps.meterId,
  meter: runSteps.meter,
  confirmed: runSteps.confirmed,
  to: runSteps.toNode,
  undone: runSteps.undone,
  undoesSeq: runSteps.undoesSeq,
  enteredBy: runSteps.enteredBy,
  recordedAt: runSteps.recordedAt,
};

export function stepViewFromJson(j: JsonOf<typeof STEP_JSON>): StepView {
  return { ...j, undone: Boolean(j.undone), confirmed: Boolean(j.confirmed), recordedAt: jsonIso(j.recordedAt) };
}

/** One stored step by its idempotency key (a retry's answer). */
export async function stepByKey(tx: Tx, runId: string, key: string): Promise<StepRow | undefined> {
  const [row] = await tx
    .select()
    .from(runSteps)
    .where(and(eq(runSteps.runId, runId), eq(runSteps.idempotencyKey, key)))
    .limit(1);
  return row;
}

/** A log entry as the replay needs it: what the engine reads, and the key and hash a retry is told by. */
export type LoggedEntry = Pick<StepView, "seq" | "key" | "type" | "node" | "answer" | "typed" | "meter" | "call" | "confirmed"> & {
  hash: string;
};

/** The shop meter chosen, with its range: a reading above it is refused, "OL" judged against it. */
export type MeterChoice = MeterView;

export type LockedRun = {
  run: Pick<
    typeof runs.$inferSelect,
    "id" | "versionId" | "technicianId" | "status" | "stepCount" | "currentNode" | "endKind" | "practice"
  >;
  /** The log so far, in order; null when it was not asked for. */
  log: LoggedEntry[] | null;
  /** The shop meter asked for, or null when none was asked for or it is not the shop's. */
  meter: MeterChoice | null;
};

// The pieces of the step's first statement, built once: a step is the hottest write, and building
// the statement with the select builder cost more CPU than MariaDB took to run it.
const LOG = jsonRows(
  {
    seq: runSteps.seq,
    key: runSteps.idempotencyKey,
    hash: runSteps.payloadHash,
    type: runSteps.type,
    node: runSteps.nodeKey,
    answer: runSteps.answer,
    typed: runSteps.typed,
    meter: runSteps.meter,
    call: runSteps.call,
    confirmed: runSteps.confirmed,
  },
  sql`FROM ${runSteps} WHERE ${runSteps.runId} = ${runs.id}`,
  sql`${runSteps.seq}`,
);
/** A shop meter as a JSON object inside a run's statements (the runner's MeterView). */
export const METER_JSON = {
  id: meters.id,
  name: meters.name,
  quantity: meters.quantity,
  unit: meters.unit,
  rangeMax: meters.rangeMax,
  resolution: meters.resolution,
  percent: meters.percent,
  counts: meters.counts,
};
const METER = jsonObject(METER_JSON);
const RUN = sql`${runs.id} AS id, ${runs.versionId} AS versionId, ${runs.technicianId} AS technicianId, ${runs.status} AS status,
  ${runs.stepCount} AS stepCount, ${runs.currentNode} AS currentNode, ${runs.endKind} AS endKind, ${runs.practice} AS practice`;

type LockedRow = Omit<LockedRun["run"], "practice"> & {
  practice: number | boolean;
  log: LoggedEntry[] | string | null;
  meter: MeterChoice | string | null;
};

/**
 * Locks one of the shop's runs for a step (SELECT … FOR UPDATE) and, in the same statement, reads
 * the shop meter asked for and (unless `withLog` is false) the run's log. Both are correlated
 * subqueries of the locked row, so MariaDB evaluates them after the lock is granted: they see every
 * step committed before it, and they take no locks of their own (a meter shared by many runs is not
 * serialised). Null when the run is not in the shop.
 */
export async function lockRunForStep(tx: Tx, ctx: Ctx, runId: string, meterId: string | null, withLog: boolean): Promise<LockedRun | null> {
  const meter = meterId
    ? sql`(SELECT ${METER} FROM ${meters} WHERE ${meters.id} = ${meterId} AND ${meters.shopId} = ${runs.shopId})`
    : sql`NULL`;
  const [rows] = (await tx.execute(
    sql`SELECT ${RUN}, ${withLog ? LOG : sql`NULL`} AS log, ${meter} AS meter FROM ${runs} WHERE ${runs.id} = ${runId} AND ${runs.shopId} = ${ctx.shopId} FOR UPDATE`,
  )) as unknown as [LockedRow[]];
  const row = rows[0];
  if (!row) return null;
  const { log, meter: meterJson, practice, ...rest } = row;
  return { run: { ...rest, practice: Boolean(practice) }, log: withLog ? (fromJson(log) ?? []) : null, meter: fromJson(meterJson) };
}

/** A locked run's log, read after the lock (lockRunForStep without it). */
export async function readLog(tx: Tx, runId: string): Promise<LoggedEntry[]> {
  const [rows] = (await tx.execute(sql`SELECT ${LOG} AS log FROM ${runs} WHERE ${runs.id} = ${runId}`)) as unknown as [
    { log: LoggedEntry[] | string | null }[],
  ];
  return fromJson(rows[0]?.log ?? null) ?? [];
}
