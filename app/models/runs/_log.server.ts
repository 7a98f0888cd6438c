// A run's step rows, read in order and shown as the wire's StepView. Used by the run models only.
import { asc, eq } from "drizzle-orm";
import { runSteps } from "../../../db/schema";
import { db, type Db, type Tx } from "../../lib/db.server";
import type { StepView } from "../../lib/run-log";

export type StepRow = typeof runSteps.$inferSelect;

export function stepView(row: StepRow): StepView {
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
