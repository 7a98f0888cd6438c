// Invented history at scale, into its own database (never the app's): the demo shop with its
// starter trees, 20 technicians and 2 leads, and RUNS runs over two years ending 2026-12-01.
// Deterministic: the same --runs and --seed always give the same rows.
//
//   scripts/db start                                  # a MariaDB on 127.0.0.1:$DB_PORT (default 3307)
//   npm run db:history -- --runs 100000               # → database cluepath_history_100000
//   npm run db:history -- --runs 10000 --database my_history --seed 7
//
// DATABASE_URL names the server (its database part is replaced). About a million step rows at
// 100,000 runs; expect several minutes on 2 cores.
import { and, eq, sql } from "drizzle-orm";
import mysql from "mysql2/promise";
import { parseArgs } from "node:util";
import { fileURLToPath } from "node:url";

export const HISTORY_END = new Date("2026-12-01T06:00:00Z");

/** A UUID-shaped id that sorts in the order it was made (kind first), so bulk inserts append. */
function sequentialId(kind: string, n: number): string {
  const k = [...kind]
    .reduce((h, c) => (h * 31 + c.charCodeAt(0)) >>> 0, 7)
    .toString(16)
    .padStart(8, "0");
  return `${k}-0000-4000-8000-${n.toString(16).padStart(12, "0")}`;
}

export function historyDatabaseUrl(runs: number, name?: string): string {
  const url = new URL(process.env.DATABASE_URL ?? "mysql://root@127.0.0.1:3307/cluepath");
  url.pathname = `/${name ?? `cluepath_history_${runs}`}`;
  return url.toString();
}

/** Drops and fills the history database; returns its URL. */
export async function buildHistory(
  runs: number,
  opts: { database?: string; seed?: number; log?: (s: string) => void } = {},
): Promise<string> {
  const log = opts.log ?? ((s: string) => console.log(s));
  const url = historyDatabaseUrl(runs, opts.database);
  const name = new URL(url).pathname.slice(1);
  if (!/^[A-Za-z0-9_]+$/.test(name)) throw new Error(`Unusable database name "${name}"`);
  const server = new URL(url);
  server.pathname = "/";
  const admin = await mysql.createConnection({ uri: server.toString() });
  await admin.query(`DROP DATABASE IF EXISTS \`${name}\``);
  await admin.end();

  process.env.DATABASE_URL = url;
  const { migrateDatabase } = await import("../db/migrate");
  await migrateDatabase(url);
  const { seed, stableId } = await import("../db/seed");
  const { DEMO_SHOP } = await import("../db/demo");
  const { generateHistory } = await import("../db/history");
  const { db, closeDb } = await import("../app/lib/db.server");
  const { memberships, users } = await import("../db/schema");
  await seed({ history: false });
  const shopId = stableId(DEMO_SHOP.key);
  const [owner] = await db()
    .select({ hash: users.passwordHash })
    .from(users)
    .where(eq(users.id, stableId("user:owner@tinderbox.example")));
  const people = async (role: "technician" | "lead", count: number) => {
    const ids: string[] = [];
    for (let i = 1; i <= count; i++) {
      const id = sequentialId(`user-${role}`, i);
      const label = role === "lead" ? "Lead tech" : "Field tech";
      await db()
        .insert(users)
        .values({ id, email: `${role}${i}@history.example`, name: `${label} ${String(i).padStart(2, "0")}`, passwordHash: owner!.hash })
        .onDuplicateKeyUpdate({ set: { id } });
      const [m] = await db()
        .select({ id: memberships.id })
        .from(memberships)
        .where(and(eq(memberships.userId, id), eq(memberships.shopId, shopId)));
      if (!m)
        await db()
          .insert(memberships)
          .values({ id: sequentialId(`member-${role}`, i), shopId, userId: id, role });
      ids.push(id);
    }
    return ids;
  };
  const technicians = await people("technician", 20);
  const leads = await people("lead", 2);
  const started = Date.now();
  const totals = await generateHistory({
    shopId,
    runs,
    days: 730,
    end: HISTORY_END,
    seed: opts.seed ?? 1,
    idOf: sequentialId,
    technicians,
    leads,
    meanGapDays: 60,
    callNumberFrom: 5001,
    reportNumberFrom: 1,
    town: DEMO_SHOP.town,
    progress: (n) => {
      if (n % 10_000 < 400) log(`  … ${n.toLocaleString("en-US")} runs written (${Math.round((Date.now() - started) / 1000)} s)`);
    },
  });
  // The generator writes unit by unit, so summary rows land out of time order and leave half-full
  // pages; in service they arrive as runs end, in time order. Pack them the way service would.
  await db().execute(sql`OPTIMIZE TABLE insight_runs, insight_readings, insight_parts`);
  await closeDb();
  log(
    `› ${name}: ${totals.runs.toLocaleString("en-US")} ended runs + ${totals.practice.toLocaleString("en-US")} practice runs, ` +
      `${totals.steps.toLocaleString("en-US")} step rows, ${totals.calls.toLocaleString("en-US")} calls, ${totals.units.toLocaleString("en-US")} units ` +
      `in ${Math.round((Date.now() - started) / 1000)} s`,
  );
  return url;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const { values } = parseArgs({
    options: { runs: { type: "string", default: "10000" }, database: { type: "string" }, seed: { type: "string", default: "1" } },
  });
  const runs = Number(values.runs);
  if (!Number.isInteger(runs) || runs < 1 || runs > 2_000_000) {
    console.error("--runs takes a whole number from 1 to 2,000,000, e.g. --runs 100000");
    process.exit(2);
  }
  buildHistory(runs, { database: values.database, seed: Number(values.seed) }).catch((e) => {
    console.error("History failed:", e instanceof Error ? e.message : e);
    process.exit(1);
  });
}
