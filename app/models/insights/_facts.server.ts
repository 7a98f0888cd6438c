// The insight summary rows (db/schema/insights.ts): written in the transaction that ends a real
// run, and rebuilt from the raw rows by the same statements with a wider scope. One set of SQL
// statements for both, so "kept up to date" and "rebuilt" cannot drift apart; the tallies add
// counts (ON DUPLICATE KEY UPDATE runs = runs + …), so a rebuild starts from empty tables.
import { inArray, sql, type SQL } from "drizzle-orm";
import {
  insightCauseTallies,
  insightKeys,
  insightParts,
  insightReadings,
  insightRuns,
  insightStepTallies,
  runs,
  shopCounters,
} from "../../../db/schema";
import { db, writeTx, type Db, type Tx } from "../../lib/db.server";

/** Which ended runs to summarise: some runs, one shop, or every shop. */
export type FactScope = { runIds: readonly string[] } | { shopId: string } | { all: true };

/** The scope as a condition on a run id column and a shop id column. */
function inScope(scope: FactScope, runColumn: string, shopColumn: string): SQL {
  if ("runIds" in scope)
    return scope.runIds.length
      ? sql`${sql.raw(runColumn)} IN (${sql.join(
          scope.runIds.map((id) => sql`${id}`),
          sql`, `,
        )})`
      : sql`FALSE`;
  if ("shopId" in scope) return sql`${sql.raw(shopColumn)} = ${scope.shopId}`;
  return sql`TRUE`;
}

/** The ended real runs in scope, with their unit, site and tree (alias r, u, s, t). */
const ENDED = (runs: SQL) => sql`FROM runs r
  JOIN trees t ON t.id = r.tree_id
  LEFT JOIN equipment_units u ON u.id = r.unit_id
  LEFT JOIN sites s ON s.id = u.site_id
  WHERE ${runs} AND r.practice = 0 AND r.status IN ('done', 'abandoned') AND r.completed_at IS NOT NULL`;

const EQUIPMENT = "CONCAT_WS('|', COALESCE(u.category, t.category), COALESCE(u.make, ''), COALESCE(u.model, ''))";
/** A key of the shop by kind and name, joined as `alias` (LEFT JOIN when the thing may be absent). */
const key = (alias: string, kind: string, name: string, join = "JOIN") =>
  sql.raw(`${join} insight_keys ${alias} ON ${alias}.shop_id = r.shop_id AND ${alias}.kind = '${kind}' AND ${alias}.name = ${name}`);

const DIMS = sql.raw("shop_id, ended_at, run_id, tree_k, technician_k, equipment_k, unit_k, site_k, customer_k");
const F_DIMS = sql.raw("f.shop_id, f.ended_at, f.run_id, f.tree_k, f.technician_k, f.equipment_k, f.unit_k, f.site_k, f.customer_k");
const KEY_COLUMNS = sql.raw("INSERT INTO insight_keys (shop_id, kind, name, category, make, model, a, b)");
const KEEP = sql.raw("ON DUPLICATE KEY UPDATE insight_keys.id = insight_keys.id");

/** The statements that summarise the runs in scope, in order (later ones read what earlier ones wrote). */
function statements(scope: FactScope): SQL[] {
  const runs = inScope(scope, "r.id", "r.shop_id");
  const facts = inScope(scope, "f.run_id", "f.shop_id");
  const plain = (kind: string, column: string) =>
    sql`${KEY_COLUMNS} SELECT DISTINCT r.shop_id, ${kind}, ${sql.raw(column)}, NULL, NULL, NULL, NULL, NULL ${ENDED(runs)} AND ${sql.raw(column)} IS NOT NULL ${KEEP}`;
  return [
    plain("tree", "r.tree_id"),
    plain("technician", "r.started_by"),
    plain("unit", "r.unit_id"),
    plain("site", "u.site_id"),
    plain("customer", "s.customer_id"),
    sql`${KEY_COLUMNS} SELECT DISTINCT r.shop_id, 'cause', r.root_cause, NULL, NULL, NULL, NULL, NULL ${ENDED(runs)} AND r.status = 'done' AND r.root_cause IS NOT NULL ${KEEP}`,
    sql`${KEY_COLUMNS} SELECT DISTINCT r.shop_id, 'equipment', ${sql.raw(EQUIPMENT)}, COALESCE(u.category, t.category), COALESCE(u.make, ''), COALESCE(u.model, ''), NULL, NULL ${ENDED(runs)} ${KEEP}`,
    sql`${KEY_COLUMNS} SELECT DISTINCT r.shop_id, 'node', CONCAT(r.tree_id, '|', st.node_key), NULL, NULL, NULL, r.tree_id, st.node_key
      FROM runs r JOIN run_steps st ON st.run_id = r.id
      WHERE ${runs} AND r.practice = 0 AND r.status IN ('done', 'abandoned') AND r.completed_at IS NOT NULL
        AND st.type = 'reading' AND st.undone = 0 AND st.verdict IS NOT NULL ${KEEP}`,
    sql`${KEY_COLUMNS} SELECT DISTINCT r.shop_id, 'part', CONCAT(p.part_number, '|', p.description), NULL, NULL, NULL, p.part_number, p.description
      FROM runs r JOIN run_parts p ON p.run_id = r.id
      WHERE ${runs} AND r.practice = 0 AND r.status = 'done' ${KEEP}`,
    sql`INSERT INTO insight_runs (${DIMS}, status, cause_k, end_node, diagnose_seconds, job_minutes, escalated, on_call, first_on_call)
      SELECT r.shop_id, r.completed_at, r.id, kt.id, kh.id, ke.id, ku.id, ks.id, kc.id,
        r.status, IF(r.status = 'done', kr.id, NULL), IF(r.status = 'done', r.end_node, NULL),
        IF(r.status = 'done',
          (SELECT TIMESTAMPDIFF(SECOND, r.started_at, MAX(st.created_at)) FROM run_steps st
            WHERE st.run_id = r.id AND st.undone = 0 AND st.type <> 'undo'),
          NULL),
        IF(r.status = 'done', r.minutes_on_job, NULL),
        EXISTS (SELECT 1 FROM escalations e WHERE e.run_id = r.id),
        r.call_id IS NOT NULL,
        r.call_id IS NOT NULL AND NOT EXISTS (
          SELECT 1 FROM runs r2 WHERE r2.call_id = r.call_id AND r2.practice = 0 AND r2.id <> r.id AND r2.started_at <= r.started_at)
      FROM runs r
      JOIN trees t ON t.id = r.tree_id
      LEFT JOIN equipment_units u ON u.id = r.unit_id
      LEFT JOIN sites s ON s.id = u.site_id
      ${key("kt", "tree", "r.tree_id")}
      ${key("kh", "technician", "r.started_by")}
      ${key("ke", "equipment", EQUIPMENT)}
      ${key("ku", "unit", "r.unit_id", "LEFT JOIN")}
      ${key("ks", "site", "u.site_id", "LEFT JOIN")}
      ${key("kc", "customer", "s.customer_id", "LEFT JOIN")}
      ${key("kr", "cause", "r.root_cause", "LEFT JOIN")}
      WHERE ${runs} AND r.practice = 0 AND r.status IN ('done', 'abandoned') AND r.completed_at IS NOT NULL`,
    // A new call on the same unit within the return window (normally set later, when that call is opened).
    sql`UPDATE insight_runs f JOIN insight_keys ku ON ku.id = f.unit_k SET f.came_back = EXISTS (
        SELECT 1 FROM service_calls c FORCE INDEX (service_calls_unit_opened_idx)
        WHERE c.shop_id = f.shop_id AND c.unit_id = ku.name
          AND c.opened_at > f.ended_at AND c.opened_at <= f.ended_at + INTERVAL ${RETURN_WINDOW_DAYS} DAY)
      WHERE ${facts} AND f.status = 'done'`,
    sql`INSERT INTO insight_readings (${DIMS}, seq, node_k, verdict)
      SELECT ${F_DIMS}, st.seq, kn.id, st.verdict
      FROM insight_runs f
      JOIN insight_keys kt ON kt.id = f.tree_k
      JOIN run_steps st ON st.run_id = f.run_id
      JOIN insight_keys kn ON kn.shop_id = f.shop_id AND kn.kind = 'node' AND kn.name = CONCAT(kt.name, '|', st.node_key)
      WHERE ${facts} AND st.type = 'reading' AND st.undone = 0 AND st.verdict IS NOT NULL`,
    sql`INSERT INTO insight_parts (${DIMS}, position, part_k, quantity)
      SELECT ${F_DIMS}, p.position, kp.id, p.quantity
      FROM insight_runs f
      JOIN run_parts p ON p.run_id = f.run_id
      JOIN insight_keys kp ON kp.shop_id = f.shop_id AND kp.kind = 'part' AND kp.name = CONCAT(p.part_number, '|', p.description)
      WHERE ${facts} AND f.status = 'done'`,
    // Each completed run's last visit of each question or measurement step, by the branch it took.
    sql`INSERT INTO insight_step_tallies (shop_id, tree_id, node_key, branch, runs)
      SELECT f.shop_id, kt.name, st.node_key, st.branch, COUNT(*)
      FROM insight_runs f JOIN insight_keys kt ON kt.id = f.tree_k JOIN run_steps st ON st.run_id = f.run_id
      WHERE ${facts} AND f.status = 'done' AND st.type IN ('answer', 'reading') AND st.undone = 0 AND st.branch IS NOT NULL
        AND NOT EXISTS (SELECT 1 FROM run_steps later WHERE later.run_id = st.run_id AND later.node_key = st.node_key
          AND later.type = st.type AND later.undone = 0 AND later.seq > st.seq)
      GROUP BY f.shop_id, kt.name, st.node_key, st.branch
      ORDER BY f.shop_id, kt.name, st.node_key, st.branch
      ON DUPLICATE KEY UPDATE runs = runs + VALUES(runs)`,
    sql`INSERT INTO insight_cause_tallies (shop_id, tree_id, make, model, end_node, runs)
      SELECT f.shop_id, kt.name, ke.make, ke.model, f.end_node, COUNT(*)
      FROM insight_runs f JOIN insight_keys kt ON kt.id = f.tree_k JOIN insight_keys ke ON ke.id = f.equipment_k
      WHERE ${facts} AND f.status = 'done' AND f.end_node IS NOT NULL
      GROUP BY f.shop_id, kt.name, ke.make, ke.model, f.end_node
      ORDER BY f.shop_id, kt.name, ke.make, ke.model, f.end_node
      ON DUPLICATE KEY UPDATE runs = runs + VALUES(runs)`,
  ];
}

/** Days after a fix within which a new call on the same unit means it was not fixed first time. */
export const RETURN_WINDOW_DAYS = 30;

/**
 * A call was just opened on a unit: runs that fixed it in the 30 days before did not fix it for
 * good. Called by the model right after it stores the call.
 */
export async function recordNewCall(tx: Tx | Db, shopId: string, unitId: string, openedAt: Date): Promise<void> {
  await tx.execute(sql`UPDATE insight_runs SET came_back = TRUE
    WHERE shop_id = ${shopId} AND status = 'done'
      AND unit_k = (SELECT id FROM insight_keys WHERE shop_id = ${shopId} AND kind = 'unit' AND name = ${unitId})
      AND ended_at < ${openedAt} AND ended_at >= ${openedAt} - INTERVAL ${RETURN_WINDOW_DAYS} DAY`);
}

/** Writes the summary rows of runs that have just ended, inside the caller's transaction. Runs already summarised are skipped. */
export async function writeRunFacts(tx: Tx | Db, runIds: readonly string[]): Promise<void> {
  if (!runIds.length) return;
  const done = await tx
    .select({ runId: insightRuns.runId })
    .from(insightRuns)
    .where(inArray(insightRuns.runId, [...runIds]));
  const seen = new Set(done.map((d) => d.runId));
  const fresh = runIds.filter((id) => !seen.has(id));
  if (!fresh.length) return;
  await queueForShops(tx, fresh);
  for (const statement of statements({ runIds: fresh })) await tx.execute(statement);
}

/**
 * Fact writes of a shop take turns: each locks the shop's "insights" queue row first (held to the
 * end of the transaction). Runs ending at once upsert the same key and tally rows, and in parallel
 * the unique indexes' gap locks deadlocked them (32 outcomes at once ran out of retries). Callers
 * that also number something take that number first, so the order is always counter, then queue.
 */
async function queueForShops(tx: Tx | Db, runIds: readonly string[]): Promise<void> {
  const shops = await tx
    .selectDistinct({ shopId: runs.shopId })
    .from(runs)
    .where(inArray(runs.id, [...runIds]));
  for (const { shopId } of shops.sort((a, b) => a.shopId.localeCompare(b.shopId))) {
    await tx.execute(
      sql`INSERT INTO ${shopCounters} (shop_id, name, last) VALUES (${shopId}, 'insights', 1) ON DUPLICATE KEY UPDATE last = last + 1`,
    );
  }
}

/** The summary rows of one run that just ended: called by the model in the transaction that ends it. */
export function recordRunFacts(tx: Tx, runId: string): Promise<void> {
  return writeRunFacts(tx, [runId]);
}

const TABLES = [insightRuns, insightReadings, insightParts, insightStepTallies, insightCauseTallies, insightKeys];

/** Throws away the summary rows of one shop (or all) and writes them again from the raw run rows. */
export async function rebuildInsights(scope: { shopId: string } | { all: true }): Promise<void> {
  await writeTx(async (tx) => {
    for (const table of TABLES) await tx.delete(table).where("shopId" in scope ? sql`${table.shopId} = ${scope.shopId}` : undefined);
    for (const statement of statements(scope)) await tx.execute(statement);
  });
}

/**
 * For tests: every summary row of a shop with its keys spelled out (a rebuild numbers keys anew),
 * in a stable order.
 */
export async function factsOf(shopId: string) {
  const d = db();
  const where = (t: (typeof TABLES)[number]) => sql`${t.shopId} = ${shopId}`;
  const [keys, runRows, readings, parts, steps, causes] = await Promise.all([
    d.select().from(insightKeys).where(where(insightKeys)),
    d.select().from(insightRuns).where(where(insightRuns)),
    d.select().from(insightReadings).where(where(insightReadings)),
    d.select().from(insightParts).where(where(insightParts)),
    d
      .select()
      .from(insightStepTallies)
      .where(where(insightStepTallies))
      .orderBy(insightStepTallies.treeId, insightStepTallies.nodeKey, insightStepTallies.branch),
    d
      .select()
      .from(insightCauseTallies)
      .where(where(insightCauseTallies))
      .orderBy(insightCauseTallies.treeId, insightCauseTallies.make, insightCauseTallies.model, insightCauseTallies.endNode),
  ]);
  const names = new Map(keys.map((k) => [k.id, `${k.kind}:${k.name}`]));
  const spell = <T extends Record<string, unknown>>(row: T) =>
    Object.fromEntries(Object.entries(row).map(([k, v]) => [k, k.endsWith("K") && typeof v === "number" ? names.get(v) : v]));
  const order = (a: Record<string, unknown>, b: Record<string, unknown>) => (JSON.stringify(a) < JSON.stringify(b) ? -1 : 1);
  return {
    keys: keys.map(({ id: _id, ...k }) => k).sort(order),
    runs: runRows.map(spell).sort(order),
    readings: readings.map(spell).sort(order),
    parts: parts.map(spell).sort(order),
    steps,
    causes,
  };
}
