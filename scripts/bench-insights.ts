// Insights benchmark (not a timed test): every overview query and the found-here-before lookup on
// the invented history at 10,000 and 100,000 runs (built with db:history when missing). Prints
// the median and 95th percentile of wall-clock ms over repeated calls and the growth ratio
// t(100k)/t(10k). Targets on this 2-core machine: each overview query p50 ≤ 150 ms at 100k runs,
// found-here-before p50 ≤ 20 ms, growth ≤ 10.
//
//   scripts/db start && npm run bench:insights            # add --rebuild to make the histories again
import { spawnSync } from "node:child_process";
import { availableParallelism, loadavg } from "node:os";
import { parseArgs } from "node:util";
import { fileURLToPath } from "node:url";
import mysql from "mysql2/promise";

const SIZES = [10_000, 100_000];
const REPEAT = 30;

type Figure = { name: string; p50: number; p95: number };

function pct(sorted: number[], p: number) {
  return sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)]!;
}

async function time(name: string, fn: () => Promise<unknown>): Promise<Figure> {
  for (let i = 0; i < 3; i++) await fn();
  const ms: number[] = [];
  for (let i = 0; i < REPEAT; i++) {
    const t = performance.now();
    await fn();
    ms.push(performance.now() - t);
  }
  ms.sort((a, b) => a - b);
  return { name, p50: pct(ms, 0.5), p95: pct(ms, 0.95) };
}

/** In a child process with DATABASE_URL set: measure and print JSON. */
async function measure(): Promise<void> {
  const { HISTORY_END } = await import("./history");
  const { stableId } = await import("../db/seed");
  const { DEMO_SHOP } = await import("../db/demo");
  const { db, closeDb } = await import("../app/lib/db.server");
  const { equipmentUnits, runs } = await import("../db/schema");
  const { and, eq, sql } = await import("drizzle-orm");
  const { QUERY_NAMES, runQuery, filterOptions } = await import("../app/models/insights/overview.server");
  const { foundHereBefore } = await import("../app/models/insights/found-here.server");
  const ctx = { shopId: stableId(DEMO_SHOP.key), userId: stableId("user:owner@tinderbox.example"), role: "owner" as const };
  const year = { period: "365" as const };
  const figures: Figure[] = [];
  for (const name of QUERY_NAMES) figures.push(await time(`${name} (365 days)`, () => runQuery(ctx, name, year, HISTORY_END)));
  figures.push(
    await time("rootCauses (365 days, one category)", () => runQuery(ctx, "rootCauses", { ...year, category: "rotisserie" }, HISTORY_END)),
  );
  figures.push(await time("filterOptions", () => filterOptions(ctx, {})));
  const version = stableId("tree-version:rotisserie-uneven-heat.md:1");
  const [unit] = await db()
    .select({ id: equipmentUnits.id })
    .from(equipmentUnits)
    .where(and(eq(equipmentUnits.shopId, ctx.shopId), eq(equipmentUnits.category, "rotisserie")))
    .limit(1);
  const tech = { ...ctx, role: "technician" as const };
  figures.push(await time("found here before: whole tree + unit", () => foundHereBefore(tech, { versionId: version, unitId: unit!.id })));
  figures.push(await time("found here before: one step", () => foundHereBefore(tech, { versionId: version, node: "fans" })));
  const [counts] = (await db().execute(
    sql`SELECT (SELECT COUNT(*) FROM ${runs}) AS runs, (SELECT COUNT(*) FROM run_steps) AS steps`,
  )) as unknown as [{ runs: number; steps: number }[]];
  await closeDb();
  process.stdout.write(JSON.stringify({ figures, rows: counts[0] }));
}

async function historyReady(url: string, runs: number): Promise<boolean> {
  const conn = await mysql.createConnection({ uri: new URL("/", url).toString() });
  try {
    const [rows] = (await conn.query("SELECT COUNT(*) AS n FROM `" + new URL(url).pathname.slice(1) + "`.insight_runs")) as unknown as [
      { n: number }[],
    ];
    return Number(rows[0]?.n) === runs;
  } catch {
    return false;
  } finally {
    await conn.end();
  }
}

async function main() {
  const { values } = parseArgs({ options: { rebuild: { type: "boolean", default: false }, measure: { type: "boolean", default: false } } });
  if (values.measure) return measure();
  const { historyDatabaseUrl } = await import("./history");
  const results = new Map<number, { figures: Figure[]; rows: { runs: number; steps: number } }>();
  for (const size of SIZES) {
    const url = historyDatabaseUrl(size);
    if (values.rebuild || !(await historyReady(url, size))) {
      console.log(`› building the ${size.toLocaleString("en-US")}-run history (npm run db:history -- --runs ${size})`);
      const child = spawnSync(
        process.execPath,
        ["--import", "tsx", fileURLToPath(new URL("./history.ts", import.meta.url)), "--runs", String(size)],
        { stdio: "inherit", env: process.env },
      );
      if (child.status !== 0) throw new Error("building the history failed");
    }
    const child = spawnSync(process.execPath, ["--import", "tsx", fileURLToPath(import.meta.url), "--measure"], {
      env: { ...process.env, DATABASE_URL: url },
      encoding: "utf8",
      maxBuffer: 1 << 24,
    });
    if (child.status !== 0) throw new Error(`measuring failed:\n${child.stderr}`);
    results.set(size, JSON.parse(child.stdout));
  }
  const small = results.get(SIZES[0]!)!;
  const large = results.get(SIZES[1]!)!;
  const f = (n: number) => (n < 10 ? n.toFixed(2) : n < 100 ? n.toFixed(1) : n.toFixed(0));
  console.log(
    `\nInsights benchmark — Node ${process.versions.node}, ${availableParallelism()} cores, load ${loadavg()[0]!.toFixed(2)}, ${REPEAT} calls each after 3 warm-ups`,
  );
  for (const [size, r] of results)
    console.log(
      `  ${size.toLocaleString("en-US")}-run history: ${Number(r.rows.runs).toLocaleString("en-US")} runs, ${Number(r.rows.steps).toLocaleString("en-US")} step rows`,
    );
  console.log("\n| query | 10k p50 ms | 10k p95 ms | 100k p50 ms | 100k p95 ms | t(100k)/t(10k) |\n|---|--:|--:|--:|--:|--:|");
  for (const a of small.figures) {
    const b = large.figures.find((x) => x.name === a.name)!;
    console.log(`| ${a.name} | ${f(a.p50)} | ${f(a.p95)} | ${f(b.p50)} | ${f(b.p95)} | ${(b.p50 / a.p50).toFixed(1)} |`);
  }
  const overviewWorst = Math.max(...large.figures.filter((x) => !x.name.startsWith("found")).map((x) => x.p50));
  const foundWorst = Math.max(...large.figures.filter((x) => x.name.startsWith("found")).map((x) => x.p50));
  const growthWorst = Math.max(...small.figures.map((a) => large.figures.find((x) => x.name === a.name)!.p50 / a.p50));
  console.log(
    `\nTargets: overview p50 ≤ 150 ms at 100k (worst ${f(overviewWorst)}) ${overviewWorst <= 150 ? "met" : "MISSED"}; ` +
      `found-here-before p50 ≤ 20 ms (worst ${f(foundWorst)}) ${foundWorst <= 20 ? "met" : "MISSED"}; ` +
      `growth ≤ 10 (worst ${growthWorst.toFixed(1)}) ${growthWorst <= 10 ? "met" : "MISSED"}.`,
  );
}

main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
