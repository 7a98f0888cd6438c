// The committed migrations build exactly the schema the app is written against: every table and
// every column of db/schema (read from the schema itself, so a new table is checked without
// anyone listing it), on an empty database, and a second run changes nothing.
import { is } from "drizzle-orm";
import { getTableConfig, MySqlTable } from "drizzle-orm/mysql-core";
import { afterAll, describe, expect, inject, it } from "vitest";
import * as schema from "../../db/schema";
import { migrateDatabase } from "../../db/migrate";
import { columnsOf, databaseName, dropDatabase, tablesOf, withDatabase } from "../support/database";

const template = inject("templateDatabaseUrl");
const freshUrl = withDatabase(template, `${databaseName(template)}_m${process.pid}`);

/** Every table declared in db/schema, with its columns as the database names them. */
const declared = new Map(
  (Object.values(schema) as unknown[])
    .filter((v): v is MySqlTable => is(v, MySqlTable))
    .map((t) => {
      const c = getTableConfig(t);
      return [c.name, c.columns.map((col) => col.name).sort()] as const;
    }),
);

afterAll(() => dropDatabase(freshUrl));

/** The committed migrations applied to a new, empty database. */
async function migratedFresh() {
  await dropDatabase(freshUrl);
  await migrateDatabase(freshUrl);
}

describe("migrations", () => {
  it("db/schema declares the tables the app uses (the list below is read from it)", () => {
    // A floor, not the list: guards against the schema import silently finding nothing.
    expect(declared.size).toBeGreaterThanOrEqual(23);
    for (const t of ["shops", "users", "tree_versions", "run_steps"]) expect(declared.has(t)).toBe(true);
  });

  it("apply to an empty database and create every table of db/schema with every column, and nothing else", async () => {
    await migratedFresh();
    const tables = await tablesOf(freshUrl);
    // drizzle's own bookkeeping table is the one table that is not the app's.
    expect(tables.filter((t) => t !== "__drizzle_migrations")).toEqual([...declared.keys()].sort());
    const columns = await columnsOf(freshUrl);
    for (const [table, cols] of declared) expect([...(columns.get(table) ?? [])].sort(), table).toEqual(cols);
  });

  it("are idempotent: running them again on a migrated database changes nothing and does not fail", async () => {
    // The template the global setup migrated and seeded.
    const before = await columnsOf(template);
    expect(before.size).toBe(declared.size + 1);
    await migrateDatabase(template);
    expect(await columnsOf(template)).toEqual(before);
  });
});
