// The overview's queries over the summary rows (db/schema/insights.ts), one per group of tables,
// with the filters resolved to the shop's keys. overview.server.ts authorises and calls them.
import { and, asc, eq, inArray, ne, sql } from "drizzle-orm";
import { treeNodes, treeVersions } from "../../../db/schema";
import { db } from "../../lib/db.server";
import { percentile } from "../../lib/insights/stats";
import { share, type Row, type Table, type TableId } from "../../lib/insights/table";
import { RETURN_WINDOW_DAYS } from "./_facts.server";
import { equipmentLabel, keysOf, minutes, num, rows, TOP, treeLabel, treeTitles, where, type Key, type Keyed } from "./_scope.server";

/** The trade's first-time fix, as the page states it. */
export const FIRST_TIME_FIX_DEFINITION =
  `A call counts as fixed first time when the first run started on it reached a root cause and closed the call, and no new call ` +
  `was opened on the same unit in the ${RETURN_WINDOW_DAYS} days after. Calls are counted in the month they closed; ` +
  `calls closed in the last ${RETURN_WINDOW_DAYS} days can still lose their first-time fix.`;

export { filterKeys, num, type Keyed } from "./_scope.server";

// --- the queries, one per figure ---------------------------------------------------------------

async function rootCauses(scope: Keyed): Promise<Table[]> {
  const list = await rows<{ k: number; n: number }>(sql`
    SELECT f.cause_k AS k, COUNT(*) AS n
    FROM insight_runs f WHERE ${where(scope, "f")} AND f.status = 'done'
    GROUP BY f.cause_k ORDER BY NULL`);
  const total = list.reduce((s, r) => s + num(r.n), 0);
  const keys = await keysOf(
    scope.shopId,
    list.map((r) => r.k),
  );
  const sorted = list
    .map((r) => ({ cause: keys.get(num(r.k))?.name ?? "", runs: num(r.n) }))
    .sort((a, b) => b.runs - a.runs || a.cause.localeCompare(b.cause));
  return [
    {
      id: "root-causes",
      title: "Most common root causes",
      caption: `Root causes of ${total} completed run${total === 1 ? "" : "s"}${sorted.length > TOP ? `: the ${TOP} most common of ${sorted.length}` : ""}. Share is of all completed runs in the filters.`,
      columns: [
        { key: "cause", label: "Root cause", kind: "text" },
        { key: "runs", label: "Runs", kind: "count" },
        { key: "share", label: "Share", kind: "percent" },
      ],
      rows: sorted.slice(0, TOP).map((r) => ({ ...r, share: share(r.runs, total) })),
    },
  ];
}

async function firstTimeFix(scope: Keyed): Promise<Table[]> {
  const bucket =
    scope.months.length > 1
      ? sql`CASE ${sql.join(
          scope.months.slice(1).map((m, i) => sql`WHEN f.ended_at < ${m.start} THEN ${i}`),
          sql` `,
        )} ELSE ${scope.months.length - 1} END`
      : sql`0`;
  const list = await rows<{ month: number; k: number; calls: number; fixed: number }>(sql`
    SELECT ${bucket} AS month, f.equipment_k AS k, COUNT(*) AS calls, SUM(f.first_on_call AND NOT f.came_back) AS fixed
    FROM insight_runs f WHERE ${where(scope, "f")} AND f.status = 'done' AND f.on_call
    GROUP BY month, f.equipment_k ORDER BY NULL`);
  const keys = await keysOf(
    scope.shopId,
    list.map((r) => r.k),
  );
  const byMonth = scope.months.map(() => ({ calls: 0, fixed: 0 }));
  const byUnit = new Map<number, { key: Key | undefined; calls: number; fixed: number }>();
  for (const r of list) {
    const m = byMonth[num(r.month)]!;
    m.calls += num(r.calls);
    m.fixed += num(r.fixed);
    const u = byUnit.get(num(r.k)) ?? { key: keys.get(num(r.k)), calls: 0, fixed: 0 };
    u.calls += num(r.calls);
    u.fixed += num(r.fixed);
    byUnit.set(num(r.k), u);
  }
  const columns = [
    { key: "calls", label: "Calls closed", kind: "count" as const },
    { key: "fixed", label: "Fixed first time", kind: "count" as const },
    { key: "rate", label: "First-time-fix rate", kind: "percent" as const },
  ];
  const equipment = [...byUnit.values()].sort((a, b) => b.calls - a.calls || equipmentLabel(a.key).localeCompare(equipmentLabel(b.key)));
  return [
    {
      id: "first-time-fix-by-month",
      title: "First-time-fix rate by month",
      caption: "Calls closed each month and how many were fixed first time.",
      columns: [{ key: "month", label: "Month", kind: "month" }, ...columns],
      rows: scope.months.map((m, i) => ({
        month: m.label,
        calls: byMonth[i]!.calls,
        fixed: byMonth[i]!.fixed,
        rate: share(byMonth[i]!.fixed, byMonth[i]!.calls),
      })),
    },
    {
      id: "first-time-fix-by-equipment",
      title: "First-time-fix rate by equipment",
      caption: `Calls closed per make and model${equipment.length > TOP ? `: the ${TOP} with the most calls of ${equipment.length}` : ""}.`,
      columns: [
        { key: "category", label: "Category", kind: "text" },
        { key: "equipment", label: "Make and model", kind: "text" },
        ...columns,
      ],
      rows: equipment.slice(0, TOP).map((u) => ({
        category: u.key?.category ?? "",
        equipment: equipmentLabel(u.key),
        calls: u.calls,
        fixed: u.fixed,
        rate: share(u.fixed, u.calls),
      })),
    },
  ];
}

type Times = { diagnose: number[]; job: number[] };
function timeRow(t: Times): { runs: number } & Row {
  const d = t.diagnose.sort((a, b) => a - b);
  const j = t.job.sort((a, b) => a - b);
  return {
    runs: Math.max(d.length, j.length),
    diagnoseMedian: minutes(percentile(d, 0.5)),
    diagnoseP90: minutes(percentile(d, 0.9)),
    jobMedian: percentile(j, 0.5),
    jobP90: percentile(j, 0.9),
  };
}

/** "120,480,660" → [120, 480, 660] (GROUP_CONCAT of sorted numbers). */
const numbers = (list: string | null) => (list ? list.split(",").map(Number) : []);

async function timeToDiagnose(scope: Keyed): Promise<Table[]> {
  // One row per tree and equipment, each carrying its times sorted by the server: 50,000 runs come
  // back as a few dozen strings rather than 50,000 rows.
  const [list, titles] = await Promise.all([
    rows<{ t: number; e: number; n: number; d: string | null; j: string | null; dn: number; jn: number }>(sql`
      SELECT f.tree_k AS t, f.equipment_k AS e, COUNT(*) AS n,
        COUNT(f.diagnose_seconds) AS dn, GROUP_CONCAT(f.diagnose_seconds ORDER BY f.diagnose_seconds SEPARATOR ',') AS d,
        COUNT(f.job_minutes) AS jn, GROUP_CONCAT(f.job_minutes ORDER BY f.job_minutes SEPARATOR ',') AS j
      FROM insight_runs f WHERE ${where(scope, "f")} AND f.status = 'done'
      GROUP BY f.tree_k, f.equipment_k ORDER BY NULL`),
    treeTitles(scope.shopId),
  ]);
  const all: Times = { diagnose: [], job: [] };
  const byTree = new Map<number, Times>();
  const byUnit = new Map<number, Times>();
  for (const r of list) {
    const d = numbers(r.d);
    const j = numbers(r.j);
    // group_concat_max_len (1 MiB by default) cuts a list short with only a warning: refuse to show wrong figures.
    if (d.length !== num(r.dn) || j.length !== num(r.jn)) throw new Error("time lists were cut short: raise group_concat_max_len");
    const t = byTree.get(r.t) ?? { diagnose: [], job: [] };
    byTree.set(r.t, t);
    const u = byUnit.get(r.e) ?? { diagnose: [], job: [] };
    byUnit.set(r.e, u);
    for (const x of [all, t, u]) {
      for (const v of d) x.diagnose.push(v);
      for (const v of j) x.job.push(v);
    }
  }
  const keys = await keysOf(scope.shopId, [...byTree.keys(), ...byUnit.keys()]);
  const columns = [
    { key: "runs", label: "Runs", kind: "count" as const },
    { key: "diagnoseMedian", label: "To diagnose, median (min)", kind: "minutes" as const },
    { key: "diagnoseP90", label: "To diagnose, 90th percentile (min)", kind: "minutes" as const },
    { key: "jobMedian", label: "On the job, median (min)", kind: "minutes" as const },
    { key: "jobP90", label: "On the job, 90th percentile (min)", kind: "minutes" as const },
  ];
  const treeRows = [...byTree.entries()].map(([k, t]) => ({ tree: treeLabel(keys.get(k), titles), ...timeRow(t) }));
  treeRows.sort((a, b) => b.runs - a.runs || a.tree.localeCompare(b.tree));
  if (treeRows.length) treeRows.unshift({ tree: "All trees", ...timeRow(all) });
  const unitRows = [...byUnit.entries()].map(([k, u]) => ({
    category: keys.get(k)?.category ?? "",
    equipment: equipmentLabel(keys.get(k)),
    ...timeRow(u),
  }));
  unitRows.sort((a, b) => b.runs - a.runs || a.equipment.localeCompare(b.equipment));
  return [
    {
      id: "time-by-tree",
      title: "Time to diagnose and on the job, by tree",
      caption:
        "Completed runs. Time to diagnose runs from the start of the run to the step that reached the root cause; time on the job is what the technician recorded with the outcome. The first row is all trees together.",
      columns: [{ key: "tree", label: "Tree (symptom)", kind: "text" }, ...columns],
      rows: treeRows,
    },
    {
      id: "time-by-equipment",
      title: "Time to diagnose and on the job, by equipment",
      caption: `The same times per make and model${unitRows.length > TOP ? `: the ${TOP} with the most runs of ${unitRows.length}` : ""}.`,
      columns: [
        { key: "category", label: "Category", kind: "text" },
        { key: "equipment", label: "Make and model", kind: "text" },
        ...columns,
      ],
      rows: unitRows.slice(0, TOP),
    },
  ];
}

async function parts(scope: Keyed): Promise<Table[]> {
  const list = await rows<{ e: number; p: number; qty: number; runs: number }>(sql`
    SELECT p.equipment_k AS e, p.part_k AS p, SUM(p.quantity) AS qty, COUNT(DISTINCT p.run_id) AS runs
    FROM insight_parts p WHERE ${where(scope, "p")}
    GROUP BY p.equipment_k, p.part_k ORDER BY NULL`);
  const byPart = new Map<number, { p: number; qty: number; runs: number }>();
  for (const r of list) {
    const x = byPart.get(num(r.p)) ?? { p: num(r.p), qty: 0, runs: 0 };
    x.qty += num(r.qty);
    x.runs += num(r.runs);
    byPart.set(num(r.p), x);
  }
  const keys = await keysOf(scope.shopId, [...list.map((r) => r.e), ...list.map((r) => r.p)]);
  const desc = (k: number) => keys.get(k)?.b ?? "";
  const pn = (k: number) => keys.get(k)?.a ?? "";
  const top = [...byPart.values()].sort((a, b) => b.qty - a.qty || desc(a.p).localeCompare(desc(b.p)));
  const perModel = list
    .map((r) => ({
      equipment: equipmentLabel(keys.get(num(r.e))),
      partNumber: pn(num(r.p)),
      description: desc(num(r.p)),
      quantity: num(r.qty),
      runs: num(r.runs),
    }))
    .sort((a, b) => b.quantity - a.quantity || a.equipment.localeCompare(b.equipment) || a.description.localeCompare(b.description));
  return [
    {
      id: "parts",
      title: "Parts used",
      caption: `Parts recorded with root causes, by quantity${top.length > TOP ? `: the ${TOP} most used of ${top.length}` : ""}.`,
      columns: [
        { key: "partNumber", label: "Part number", kind: "text" },
        { key: "description", label: "Part", kind: "text" },
        { key: "quantity", label: "Quantity", kind: "count" },
        { key: "runs", label: "Runs", kind: "count" },
      ],
      rows: top.slice(0, TOP).map((p) => ({ partNumber: pn(p.p), description: desc(p.p), quantity: p.qty, runs: p.runs })),
    },
    {
      id: "parts-by-model",
      title: "Parts used by make and model",
      caption: `What to stock for each make and model${perModel.length > TOP * 2 ? `: the ${TOP * 2} largest of ${perModel.length}` : ""}.`,
      columns: [
        { key: "equipment", label: "Make and model", kind: "text" },
        { key: "partNumber", label: "Part number", kind: "text" },
        { key: "description", label: "Part", kind: "text" },
        { key: "quantity", label: "Quantity", kind: "count" },
        { key: "runs", label: "Runs", kind: "count" },
      ],
      rows: perModel.slice(0, TOP * 2),
    },
  ];
}

async function readingsOutOfLimits(scope: Keyed): Promise<Table[]> {
  const list = await rows<{ k: number; n: number; out: number; marginal: number }>(sql`
    SELECT r.node_k AS k, COUNT(*) AS n, SUM(r.verdict IN ('low', 'high')) AS \`out\`, SUM(r.verdict = 'marginal') AS marginal
    FROM insight_readings r WHERE ${where(scope, "r")}
    GROUP BY r.node_k ORDER BY NULL`);
  const top = list
    .map((r) => ({ k: num(r.k), n: num(r.n), out: num(r.out), marginal: num(r.marginal) }))
    .filter((r) => r.out > 0)
    .sort((a, b) => b.out - a.out || b.out / b.n - a.out / a.n || a.k - b.k)
    .slice(0, TOP);
  const keys = await keysOf(
    scope.shopId,
    top.map((r) => r.k),
  );
  const [titles, nodes] = await Promise.all([
    treeTitles(scope.shopId),
    stepTitles(
      scope.shopId,
      [...keys.values()].map((k) => k.a ?? ""),
    ),
  ]);
  return [
    {
      id: "readings-out-of-limits",
      title: "Measurement steps most often out of limits",
      caption:
        "Readings kept in ended runs (undone ones left out). Out of limits means low or high; marginal readings sat within the meter's accuracy of a limit.",
      columns: [
        { key: "step", label: "Measurement step", kind: "text" },
        { key: "tree", label: "Tree", kind: "text" },
        { key: "readings", label: "Readings", kind: "count" },
        { key: "out", label: "Out of limits", kind: "count" },
        { key: "share", label: "Share out of limits", kind: "percent" },
        { key: "marginal", label: "Marginal", kind: "count" },
      ],
      rows: top.map((r) => {
        const k = keys.get(r.k);
        return {
          step: nodes.get(`${k?.a}\u0000${k?.b}`) ?? k?.b ?? "",
          tree: titles.get(k?.a ?? "") ?? "",
          readings: r.n,
          out: r.out,
          share: share(r.out, r.n),
          marginal: r.marginal,
        };
      }),
    },
  ];
}

/** Step titles of the shop's trees, from their newest published (or retired) version holding the step. */
async function stepTitles(shopId: string, treeIds: string[]): Promise<Map<string, string>> {
  if (!treeIds.length) return new Map();
  const list = await db()
    .select({ treeId: treeVersions.treeId, node: treeNodes.nodeKey, title: treeNodes.title })
    .from(treeNodes)
    .innerJoin(treeVersions, eq(treeVersions.id, treeNodes.versionId))
    .where(
      and(
        eq(treeVersions.shopId, shopId),
        inArray(treeVersions.treeId, [...new Set(treeIds)]),
        ne(treeVersions.state, "draft"),
        eq(treeNodes.kind, "measurement"),
      ),
    )
    .orderBy(asc(treeVersions.number));
  return new Map(list.map((n) => [`${n.treeId}\u0000${n.node}`, n.title]));
}

async function handOffs(scope: Keyed): Promise<Table[]> {
  const [list, titles] = await Promise.all([
    rows<{ t: number; n: number; handed: number }>(sql`
      SELECT f.tree_k AS t, COUNT(*) AS n, SUM(f.escalated) AS handed
      FROM insight_runs f WHERE ${where(scope, "f")}
      GROUP BY f.tree_k ORDER BY NULL`),
    treeTitles(scope.shopId),
  ]);
  const keys = await keysOf(
    scope.shopId,
    list.map((r) => r.t),
  );
  const byTree = list.map((r) => ({
    tree: treeLabel(keys.get(num(r.t)), titles),
    runs: num(r.n),
    handed: num(r.handed),
    share: share(num(r.handed), num(r.n)),
  }));
  byTree.sort((a, b) => b.handed - a.handed || b.runs - a.runs || a.tree.localeCompare(b.tree));
  return [
    {
      id: "hand-offs",
      title: "Runs handed to a lead",
      caption: "Ended runs (completed or abandoned) per tree, and how many were handed to a lead on the way.",
      columns: [
        { key: "tree", label: "Tree (symptom)", kind: "text" },
        { key: "runs", label: "Runs ended", kind: "count" },
        { key: "handed", label: "Handed to a lead", kind: "count" },
        { key: "share", label: "Share", kind: "percent" },
      ],
      rows: byTree,
    },
  ];
}

export const QUERIES: Record<string, (scope: Keyed) => Promise<Table[]>> = {
  rootCauses,
  firstTimeFix,
  timeToDiagnose,
  parts,
  readingsOutOfLimits,
  handOffs,
};

export const TABLE_QUERY: Record<TableId, keyof typeof QUERIES> = {
  "root-causes": "rootCauses",
  "first-time-fix-by-month": "firstTimeFix",
  "first-time-fix-by-equipment": "firstTimeFix",
  "time-by-tree": "timeToDiagnose",
  "time-by-equipment": "timeToDiagnose",
  parts: "parts",
  "parts-by-model": "parts",
  "readings-out-of-limits": "readingsOutOfLimits",
  "hand-offs": "handOffs",
};
