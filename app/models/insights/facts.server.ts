// The insight summary rows (db/schema/insights.ts): written in the transaction that ends a real
// run, and rebuilt from the raw rows by the same statements with a wider scope. One set of SQL
// statements for both, so "kept up to date" and "rebuilt" cannot drift apart; the tallies add
// counts (ON DUPLICATE KEY UPDATE runs = runs + …), so a rebuild starts from empty tables.
import { inArray, sql, type SQL } from "drizzle-orm";
import { insightCauseTallies, insightParts, insightReadings, insightRuns, insightStepTallies } from "../../../db/schema";
import { db, writeTx, type Db, type Tx } from "../../lib/db.server";

/** Which ended runs to summarise: some runs, one shop, or every shop. */
export type FactScope = { runIds: readonly string[] } | { shopId: string } | { all: true };

/** The scope as a condition on a run id column and a shop id column. */
function inScope(scope: FactScope, runColumn: string, shopColumn: string): SQL {
  if ("runIds" in scope) return scope.runIds.length ? sql`${sql.raw(runColumn)} IN (${sql.join(scope.runIds.map((id) => sql`${id}`), sql`, `)})` : sql`FALSE`;
  if ("shopId" in scope) return sql`${sql.raw(shopColumn)} = ${scope.shopId}`;
  return sql`TRUE`;
}

const DIMS = sql.raw("shop_id, ended_at, run_id, tree_id, technician_id, unit_id, site_id, customer_id, category, make, model");
const F_DIMS = sql.raw("f.shop_id, f.ended_at, f.run_id, f.tree_id, f.technician_id, f.unit_id, f.site_id, f.customer_id, f.category, f.make, f.model");

/** The statements that summarise the runs in scope, in order (later ones read insight_runs). */
function statements(scope: FactScope): SQL[] {
  const runs = inScope(scope, "r.id", "r.shop_id");
  const facts = inScope(scope, "f.run_id", "f.shop_id");
  return [
    sql`INSERT INTO insight_runs (${DIMS}, status, version_id, call_id, end_node, root_cause, started_at, diagnose_seconds, job_minutes, escalated, first_on_call)
      SELECT r.shop_id, r.completed_at, r.id, r.tree_id, r.started_by, r.unit_id, u.site_id, s.customer_id,
        COALESCE(u.category, t.category), COALESCE(u.make, ''), COALESCE(u.model, ''),
        r.status, r.version_id, r.call_id,
        IF(r.status = 'done', r.end_node, NULL), IF(r.status = 'done', r.root_cause, NULL), r.started_at,
        IF(r.status = 'done',
          (SELECT TIMESTAMPDIFF(SECOND, r.started_at, MAX(st.created_at)) FROM run_steps st
            WHERE st.run_id = r.id AND st.undone = 0 AND st.type <> 'undo'),
          NULL),
        IF(r.status = 'done', r.minutes_on_job, NULL),
        EXISTS (SELECT 1 FROM escalations e WHERE e.run_id = r.id),
        r.call_id IS NOT NULL AND NOT EXISTS (
          SELECT 1 FROM runs r2 WHERE r2.call_id = r.call_id AND r2.practice = 0 AND r2.id <> r.id AND r2.started_at <= r.started_at)
      FROM runs r
      JOIN trees t ON t.id = r.tree_id
      LEFT JOIN equipment_units u ON u.id = r.unit_id
      LEFT JOIN sites s ON s.id = u.site_id
      WHERE ${runs} AND r.practice = 0 AND r.status IN ('done', 'abandoned') AND r.completed_at IS NOT NULL`,
    // A new call on the same unit within the return window (normally set later, when that call is opened).
    sql`UPDATE insight_runs f SET f.came_back = EXISTS (
        SELECT 1 FROM service_calls c FORCE INDEX (service_calls_unit_opened_idx)
        WHERE c.shop_id = f.shop_id AND c.unit_id = f.unit_id AND c.id <> f.call_id
          AND c.opened_at > f.ended_at AND c.opened_at <= f.ended_at + INTERVAL ${RETURN_WINDOW_DAYS} DAY)
      WHERE ${facts} AND f.status = 'done' AND f.unit_id IS NOT NULL AND f.call_id IS NOT NULL`,
    sql`INSERT INTO insight_readings (${DIMS}, seq, node_key, verdict)
      SELECT ${F_DIMS}, st.seq, st.node_key, st.verdict
      FROM insight_runs f JOIN run_steps st ON st.run_id = f.run_id
      WHERE ${facts} AND st.type = 'reading' AND st.undone = 0 AND st.verdict IS NOT NULL`,
    sql`INSERT INTO insight_parts (${DIMS}, position, part_number, description, quantity)
      SELECT ${F_DIMS}, p.position, p.part_number, p.description, p.quantity
      FROM insight_runs f JOIN run_parts p ON p.run_id = f.run_id
      WHERE ${facts} AND f.status = 'done'`,
    // Each completed run's last visit of each question or measurement step, by the branch it took.
    sql`INSERT INTO insight_step_tallies (shop_id, tree_id, node_key, branch, runs)
      SELECT f.shop_id, f.tree_id, st.node_key, st.branch, COUNT(*)
      FROM insight_runs f JOIN run_steps st ON st.run_id = f.run_id
      WHERE ${facts} AND f.status = 'done' AND st.type IN ('answer', 'reading') AND st.undone = 0 AND st.branch IS NOT NULL
        AND NOT EXISTS (SELECT 1 FROM run_steps later WHERE later.run_id = st.run_id AND later.node_key = st.node_key
          AND later.type = st.type AND later.undone = 0 AND later.seq > st.seq)
      GROUP BY f.shop_id, f.tree_id, st.node_key, st.branch
      ORDER BY f.shop_id, f.tree_id, st.node_key, st.branch
      ON DUPLICATE KEY UPDATE runs = runs + VALUES(runs)`,
    sql`INSERT INTO insight_cause_tallies (shop_id, tree_id, make, model, end_node, runs)
      SELECT f.shop_id, f.tree_id, f.make, f.model, f.end_node, COUNT(*)
      FROM insight_runs f
      WHERE ${facts} AND f.status = 'done' AND f.end_node IS NOT NULL
      GROUP BY f.shop_id, f.tree_id, f.make, f.model, f.end_node
      ORDER BY f.shop_id, f.tree_id, f.make, f.model, f.end_node
      ON DUPLICATE KEY UPDATE runs = runs + VALUES(runs)`,
  ];
}

/** Days after a fix within which a new call on the same unit means it was not fixed first time. */
export const RETURN_WINDOW_DAYS = 30;

/**
 * A call was just opened on a unit: runs that fixed it in the 30 days before did not fix it for
 * good. Called by the model right after it stores the call.
 */
export async function recordNewCall(tx: Tx | Db, shopId: string, unitId: string, callId: string, openedAt: Date): Promise<void> {
  await tx.execute(sql`UPDATE insight_runs SET came_back = TRUE
    WHERE shop_id = ${shopId} AND unit_id = ${unitId} AND status = 'done' AND call_id <> ${callId}
      AND ended_at < ${openedAt} AND ended_at >= ${openedAt} - INTERVAL ${RETURN_WINDOW_DAYS} DAY`);
}

/** Writes the summary rows of runs that have just ended, inside the caller's transaction. Runs already summarised are skipped. */
export async function writeRunFacts(tx: Tx | Db, runIds: readonly string[]): Promise<void> {
  if (!runIds.length) return;
  const done = await tx.select({ runId: insightRuns.runId }).from(insightRuns).where(inArray(insightRuns.runId, [...runIds]));
  const seen = new Set(done.map((d) => d.runId));
  const fresh = runIds.filter((id) => !seen.has(id));
  if (!fresh.length) return;
  for (const statement of statements({ runIds: fresh })) await tx.execute(statement);
}

/** The summary rows of one run that just ended: called by the model in the transaction that ends it. */
export function recordRunFacts(tx: Tx, runId: string): Promise<void> {
  return writeRunFacts(tx, [runId]);
}

const TABLES = [insightRuns, insightReadings, insightParts, insightStepTallies, insightCauseTallies];

/** Throws away the summary rows of one shop (or all) and writes them again from the raw run rows. */
export async function rebuildInsights(scope: { shopId: string } | { all: true }): Promise<void> {
  await writeTx(async (tx) => {
    for (const table of TABLES) await tx.delete(table).where("shopId" in scope ? sql`${table.shopId} = ${scope.shopId}` : undefined);
    for (const statement of statements(scope)) await tx.execute(statement);
  });
}

/** For tests and the benchmark: every summary row of a shop, in key order. */
export async function factsOf(shopId: string) {
  const d = db();
  const where = (t: (typeof TABLES)[number]) => sql`${t.shopId} = ${shopId}`;
  const [runRows, readings, parts, steps, causes] = await Promise.all([
    d.select().from(insightRuns).where(where(insightRuns)).orderBy(insightRuns.runId),
    d.select().from(insightReadings).where(where(insightReadings)).orderBy(insightReadings.runId, insightReadings.seq),
    d.select().from(insightParts).where(where(insightParts)).orderBy(insightParts.runId, insightParts.position),
    d.select().from(insightStepTallies).where(where(insightStepTallies)).orderBy(insightStepTallies.treeId, insightStepTallies.nodeKey, insightStepTallies.branch),
    d.select().from(insightCauseTallies).where(where(insightCauseTallies)).orderBy(insightCauseTallies.treeId, insightCauseTallies.make, insightCauseTallies.model, insightCauseTallies.endNode),
  ]);
  return { runs: runRows, readings, parts, steps, causes };
}
