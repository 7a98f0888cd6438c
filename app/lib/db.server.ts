import { drizzle, type MySql2Database } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import * as schema from "../../db/schema";
import { env } from "./env.server";

export type Db = MySql2Database<typeof schema>;

type Holder = { pool?: mysql.Pool; db?: Db };
// One pool per process; kept on globalThis so dev-server reloads do not open another.
const holder = ((globalThis as { __cluepathDb?: Holder }).__cluepathDb ??= {});

export function createPool(url: string): mysql.Pool {
  const pool = mysql.createPool({
    uri: url,
    connectionLimit: 20,
    connectTimeout: 3000,
    timezone: "Z",
    dateStrings: false,
    charset: "utf8mb4_unicode_ci",
  });
  pool.on("connection", (conn) => {
    conn.query("SET time_zone = '+00:00'");
  });
  return pool;
}

export function pool(): mysql.Pool {
  return (holder.pool ??= createPool(env().DATABASE_URL));
}

export function db(): Db {
  return (holder.db ??= drizzle(pool(), { schema, mode: "default" }));
}

export async function closeDb(): Promise<void> {
  const p = holder.pool;
  holder.pool = undefined;
  holder.db = undefined;
  await p?.end();
}

/** True when MariaDB answers a trivial query within the timeout. */
export async function databaseIsUp(timeoutMs = 2000): Promise<boolean> {
  try {
    await Promise.race([
      pool().query("SELECT 1"),
      new Promise((_, reject) => setTimeout(() => reject(new Error("timeout")), timeoutMs)),
    ]);
    return true;
  } catch {
    return false;
  }
}

export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/** MariaDB error numbers that mean "the transaction was rolled back; run it again". */
const RETRYABLE = new Set([
  1213, // ER_LOCK_DEADLOCK — also how a Galera certification conflict surfaces at commit
  1205, // ER_LOCK_WAIT_TIMEOUT
]);

function retryable(error: unknown): boolean {
  for (let e: unknown = error, depth = 0; e && depth < 4; e = (e as { cause?: unknown }).cause, depth++) {
    const errno = (e as { errno?: unknown }).errno;
    if (typeof errno === "number" && RETRYABLE.has(errno)) return true;
  }
  return false;
}

/**
 * Every write transaction goes through here. When MariaDB aborts it for a deadlock or a lock wait
 * (on a Galera cluster, a certification conflict reads the same), the whole function runs again,
 * a bounded number of times with a short random back-off. `fn` must touch only `tx`: no second
 * pool connection and no side effect outside the database (mail, object storage), since it may run
 * more than once.
 */
export async function writeTx<T>(fn: (tx: Tx) => Promise<T>, attempts = 4): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await db().transaction(fn);
    } catch (error) {
      if (attempt >= attempts || !retryable(error)) throw error;
      await new Promise((r) => setTimeout(r, 5 + Math.random() * 20 * attempt));
    }
  }
}
