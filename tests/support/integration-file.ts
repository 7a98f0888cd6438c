// Runs before each integration test file: the file starts from the seeded template's rows and
// nothing else, in its worker's own database, so no file sees what another wrote and any file can
// run alone or in any order (docs/decisions/0140-a-database-per-test-file.md).
import { afterAll, inject } from "vitest";
import { databaseName, resetFromTemplate } from "./database";

const template = inject("templateDatabaseUrl");
// One database per worker (Vitest numbers them), so files may also run side by side.
process.env.DATABASE_URL = await resetFromTemplate(template, `${databaseName(template)}_w${process.env.VITEST_POOL_ID ?? "1"}`);

afterAll(async () => {
  const { closeDb } = await import("../../app/lib/db.server");
  await closeDb();
});
