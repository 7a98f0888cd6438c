// Databases for the test suites: a template made once from the migrations and the demo seed, and
// the integration tests' working databases, reset to it before each test file
// (docs/decisions/0140-a-database-per-test-file.md).
import { execFile } from "node:child_process";
import { promisify } from "node:util";
import { fileURLToPath } from "node:url";
import mysql from "mysql2/promise";
import { migrateDatabase } from "../../db/migrate";

const run = promisify(execFile);
const ROOT = fileURLToPath(new URL("../../", import.meta.url));

/** The database name in a `mysql://…/name` URL. */
export function databaseName(url: string): string {
  return decodeURIComponent(new URL(url).pathname.replace(/^\//, ""));
}

/** The same server, another database. */
export function withDatabase(url: string, name: string): string {
  const u = new URL(url);
  u.pathname = `/${name}`;
  return u.toString();
}

async function onServer<T>(url: string, fn: (conn: mysql.Connection) => Promise<T>): Promise<T> {
  const conn = await mysql.createConnection({ uri: withDatabase(url, ""), timezone: "Z" });
  try {
    return await fn(conn);
  } finally {
    await conn.end();
  }
}

/**
 * Only databases made for tests are ever dropped: their names end in _test or _e2e (or start with
 * one of those followed by a suffix). A DATABASE_URL pointing at a developer's own data is refused.
 */
function assertThrowaway(name: string): void {
  if (!/^[A-Za-z0-9_]+_(test|e2e)(_[a-z0-9]+)?$/.test(name)) {
    throw new Error(`Refusing to recreate database "${name}": test databases are named like cluepath_test or cluepath_e2e.`);
  }
}

export async function dropDatabase(url: string): Promise<void> {
  const name = databaseName(url);
  assertThrowaway(name);
  await onServer(url, (c) => c.query(`DROP DATABASE IF EXISTS \`${name}\``));
}

/**
 * An empty database with the committed migrations applied and the demo data seeded. The seed runs
 * in its own process (as `npm run db:seed` does), so this process's database pool and cached
 * configuration stay untouched.
 */
export async function freshSeededDatabase(url: string): Promise<void> {
  await dropDatabase(url);
  await migrateDatabase(url);
  try {
    await run(process.execPath, ["--import", "tsx", "db/seed.ts"], { cwd: ROOT, env: { ...process.env, DATABASE_URL: url } });
  } catch (e) {
    const err = e as { stderr?: string; message: string };
    throw new Error(`Seeding ${databaseName(url)} failed: ${err.stderr || err.message}`, { cause: e });
  }
}

async function baseTables(c: mysql.Connection, db: string): Promise<string[]> {
  const [rows] = await c.query(
    "SELECT table_name AS t FROM information_schema.tables WHERE table_schema = ? AND table_type = 'BASE TABLE' ORDER BY 1",
    [db],
  );
  return (rows as { t: string }[]).map((r) => r.t);
}

/**
 * Makes `workName` hold exactly the template's rows. The first time (no such database yet) it is
 * created from each table's own CREATE statement (keys, CHECK constraints and foreign keys
 * included); after that only rows move, in one transaction: every table emptied and refilled from
 * the template. Rows only, because DDL is what costs here (a file and an fsync per table): on this
 * machine a fresh copy took 0.1 s idle and 1–2 s under load, a reset 20–100 ms.
 * The binary log is left out: nothing replicates a test database.
 */
export async function resetFromTemplate(templateUrl: string, workName: string): Promise<string> {
  assertThrowaway(workName);
  const template = databaseName(templateUrl);
  await onServer(templateUrl, async (c) => {
    await c.query("SET SESSION sql_log_bin = 0");
    const tables = await baseTables(c, template);
    const existing = await baseTables(c, workName);
    if (existing.join() !== tables.join()) {
      await c.query(`DROP DATABASE IF EXISTS \`${workName}\``);
      await c.query(`CREATE DATABASE \`${workName}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
      await c.query(`USE \`${workName}\``);
      await c.query("SET foreign_key_checks = 0");
      for (const t of tables) {
        const [[created]] = (await c.query(`SHOW CREATE TABLE \`${template}\`.\`${t}\``)) as unknown as [[{ "Create Table": string }]];
        await c.query(created["Create Table"]);
      }
    }
    await c.query(`USE \`${workName}\``);
    await c.query("SET foreign_key_checks = 0");
    await c.query("START TRANSACTION");
    for (const t of tables) {
      await c.query(`DELETE FROM \`${t}\``);
      await c.query(`INSERT INTO \`${t}\` SELECT * FROM \`${template}\`.\`${t}\``);
    }
    await c.query("COMMIT");
  });
  return withDatabase(templateUrl, workName);
}

/** Drops the databases named `<prefix>…` (the work copies of a template). */
export async function dropDatabasesStartingWith(url: string, prefix: string): Promise<void> {
  await onServer(url, async (c) => {
    const [rows] = await c.query("SELECT schema_name AS n FROM information_schema.schemata WHERE schema_name LIKE ?", [
      `${prefix.replace(/_/g, "\\_")}%`,
    ]);
    for (const { n } of rows as { n: string }[]) {
      assertThrowaway(n);
      await c.query(`DROP DATABASE IF EXISTS \`${n}\``);
    }
  });
}

/** Table names of a database, sorted by code point (as JavaScript sorts, not by the collation). */
export async function tablesOf(url: string): Promise<string[]> {
  return onServer(url, async (c) => {
    const [rows] = await c.query("SELECT table_name AS t FROM information_schema.tables WHERE table_schema = ?", [databaseName(url)]);
    return (rows as { t: string }[]).map((r) => r.t).sort();
  });
}

/** Column names of each table of a database. */
export async function columnsOf(url: string): Promise<Map<string, string[]>> {
  return onServer(url, async (c) => {
    const [rows] = await c.query(
      "SELECT table_name AS t, column_name AS c FROM information_schema.columns WHERE table_schema = ? ORDER BY table_name, ordinal_position",
      [databaseName(url)],
    );
    const out = new Map<string, string[]>();
    for (const { t, c: col } of rows as { t: string; c: string }[]) out.set(t, [...(out.get(t) ?? []), col]);
    return out;
  });
}
