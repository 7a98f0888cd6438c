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
