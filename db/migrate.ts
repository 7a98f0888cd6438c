// Applies the committed migrations in db/migrations to DATABASE_URL (creating the database if needed).
import { drizzle } from "drizzle-orm/mysql2";
import { migrate } from "drizzle-orm/mysql2/migrator";
import mysql from "mysql2/promise";
import { fileURLToPath } from "node:url";
import { databaseUrl } from "../app/lib/env.server";

export async function migrateDatabase(url: string): Promise<void> {
  const target = new URL(url);
  const name = decodeURIComponent(target.pathname.replace(/^\//, ""));
  if (!/^[A-Za-z0-9_]+$/.test(name)) throw new Error(`Unusable database name "${name}" in DATABASE_URL`);
  const server = new URL(url);
  server.pathname = "/";
  const admin = await mysql.createConnection({ uri: server.toString() });
  await admin.query(`CREATE DATABASE IF NOT EXISTS \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await admin.end();
  const conn = await mysql.createConnection({ uri: url, timezone: "Z", multipleStatements: false });
  await conn.query("SET time_zone = '+00:00'");
  await migrate(drizzle(conn), { migrationsFolder: fileURLToPath(new URL("./migrations", import.meta.url)) });
  await conn.end();
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const url = databaseUrl();
  migrateDatabase(url)
    .then(() => console.log(`› migrations applied to ${new URL(url).pathname.slice(1)}`))
    .catch((e) => {
      console.error("Migration failed:", e instanceof Error ? e.message : e);
      process.exit(1);
    });
}
