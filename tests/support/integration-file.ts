// Runs before each integration test file: the file gets its own copy of the seeded template
// database, so no file sees what another wrote and any file can run alone or in any order.
// The copy is dropped after the file (docs/decisions/0140-a-database-per-test-file.md).
import { randomBytes } from "node:crypto";
import { afterAll, inject } from "vitest";
import { copyDatabase, databaseName, dropDatabase } from "./database";

const template = inject("templateDatabaseUrl");
const url = await copyDatabase(template, `${databaseName(template)}_f${randomBytes(4).toString("hex")}`);
// Read by app/lib/env.server.ts on first use: the app's pool in this file opens on the copy.
process.env.DATABASE_URL = url;

afterAll(async () => {
  const { closeDb } = await import("../../app/lib/db.server");
  await closeDb();
  await dropDatabase(url);
});
