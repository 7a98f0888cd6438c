import { drizzle, type MySql2Database } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import * as schema from "../../db/schema";
import { env } from "./env.server";

export type Db = MySql2Database<typeof schema>;

type Holder = { pool?: mysql.Pool; db?: Db };
// One pool per process; kept on globalThis so dev-server reloads do not open another.
const holder = ((globalThis as { __cluepathDb?: Holder }).__cluepathDb ??= {});

/** What a request waiting too long for a pool connection gets (mapped to 503 by errors.server.ts). */
export class PoolAcquireTimeout extends Error {
  override name = "PoolAcquireTimeout";
  readonly code = "POOL_ACQUIRE_TIMEOUT";
}

export type PoolOptions = { size?: number; acquireTimeoutMs?: number };

export function createPool(url: string, options: PoolOptions = {}): mysql.Pool {
  const { size = 20, acquireTimeoutMs = 5000 } = options;
  const pool = mysql.createPool({
    uri: url,
    connectionLimit: size,
    // Idle connections are closed after a minute (and checked by keep-alive), so a pool that saw
    // MariaDB restart holds few dead ones; a dead one fails once and is dropped by mysql2.
    maxIdle: Math.min(size, 10),
    idleTimeout: 60_000,
    enableKeepAlive: true,
    connectTimeout: 3000,
    timezone: "Z",
    dateStrings: false,
    charset: "utf8mb4_unicode_ci",
    // No caller's stack captured on every query (mysql2's `trace`, on by default): it cost a step
    // a twentieth of its CPU. An error still carries its own stack and the request id in the log.
    trace: false,
  });
  pool.on("connection", (conn) => {
    // UTC; and room for a long run's log read as one JSON_ARRAYAGG (MariaDB cuts at 1 MB by default).
    conn.query("SET time_zone = '+00:00', group_concat_max_len = 67108864");
  });
  withAcquireTimeout(pool, acquireTimeoutMs);
  return pool;
}

/**
 * mysql2 has no acquire timeout: a request queued behind a full pool waits forever. Every query,
 * execute and transaction asks the core pool's getConnection, so that one method gets a deadline;
 * a connection that arrives after its waiter gave up goes straight back to the pool.
 */
function withAcquireTimeout(pool: mysql.Pool, ms: number): void {
  type Callback = (err: Error | null, conn?: { release(): void }) => void;
  const core = pool.pool as unknown as { getConnection(cb: Callback): void };
  const acquire = core.getConnection.bind(core);
  core.getConnection = (cb: Callback) => {
    let settled = false;
    const timer = setTimeout(() => {
      settled = true;
      cb(new PoolAcquireTimeout(`No database connection became free within ${ms} ms`));
    }, ms);
    acquire((err, conn) => {
      if (settled) {
        if (!err) conn?.release();
        return;
      }
      settled = true;
      clearTimeout(timer);
      cb(err, conn);
    });
  };
}

export function pool(): mysql.Pool {
  const e = env();
  return (holder.pool ??= createPool(e.DATABASE_URL, { size: e.DB_POOL_SIZE, acquireTimeoutMs: e.DB_ACQUIRE_TIMEOUT_MS }));
}

export function db(): Db {
  return (holder.db ??= drizzle(pool(), { schema, mode: "default" }));
}

/**
 * A query whose SQL text is built once per pool (drizzle's `prepare()`, values as
 * `sql.placeholder("name")`), not on every call: building a select with its joins and subqueries
 * costs more CPU than MariaDB takes to answer it. For queries on the pool, not inside a transaction.
 */
export function prepared<T>(build: (db: Db) => T): () => T {
  const built = new WeakMap<Db, T>();
  return () => {
    const d = db();
    let query = built.get(d);
    if (!query) built.set(d, (query = build(d)));
    return query;
  };
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
    await Promise.race([pool().query("SELECT 1"), new Promise((_, reject) => setTimeout(() => reject(new Error("timeout")), timeoutMs))]);
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

/** The MariaDB error number that makes `error` worth a retry, or null. */
function retryable(error: unknown): number | null {
  for (let e: unknown = error, depth = 0; e && depth < 4; e = (e as { cause?: unknown }).cause, depth++) {
    const errno = (e as { errno?: unknown }).errno;
    if (typeof errno === "number" && RETRYABLE.has(errno)) return errno;
  }
  return null;
}

// Transactions this process ran again, by MariaDB error number. A deadlock between two of our own
// transactions means two code paths take locks in different orders (docs/decisions/0240): the
// tests race such paths and expect no retry at all.
const retries = new Map<number, number>();

/** How many times writeTx ran a transaction again, by MariaDB error number (1213 deadlock, 1205 lock wait). */
export function writeTxRetries(): Record<number, number> {
  return Object.fromEntries(retries);
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
      const errno = retryable(error);
      if (attempt >= attempts || errno === null) throw error;
      retries.set(errno, (retries.get(errno) ?? 0) + 1);
      await new Promise((r) => setTimeout(r, 5 + Math.random() * 20 * attempt));
    }
  }
}
