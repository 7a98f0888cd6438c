import mysql from "mysql2/promise";
import { afterAll, describe, expect, it } from "vitest";
import { migrateDatabase } from "../../db/migrate";

const base = new URL(process.env.DATABASE_URL!);
const name = `cluepath_fresh_${process.pid}`;
const freshUrl = new URL(base);
freshUrl.pathname = `/${name}`;

async function tablesOf(db: string): Promise<string[]> {
  const server = new URL(base);
  server.pathname = "/";
  const conn = await mysql.createConnection({ uri: server.toString() });
  const [rows] = await conn.query("SELECT table_name AS t FROM information_schema.tables WHERE table_schema = ? ORDER BY 1", [db]);
  await conn.end();
  return (rows as { t: string }[]).map((r) => r.t);
}

afterAll(async () => {
  const server = new URL(base);
  server.pathname = "/";
  const conn = await mysql.createConnection({ uri: server.toString() });
  await conn.query(`DROP DATABASE IF EXISTS \`${name}\``);
  await conn.end();
});

describe("migrations", () => {
  it("apply to an empty database and create every table of the schema", async () => {
    expect(await tablesOf(name)).toEqual([]);
    await migrateDatabase(freshUrl.toString());
    const tables = await tablesOf(name);
    for (const t of ["shops", "users", "memberships", "invitations", "sessions", "sign_in_attempts", "customers", "sites", "equipment_units"]) {
      expect(tables).toContain(t);
    }
  });

  it("are idempotent: a second run changes nothing and does not fail", async () => {
    const before = await tablesOf(name);
    await migrateDatabase(freshUrl.toString());
    expect(await tablesOf(name)).toEqual(before);
  });
});
