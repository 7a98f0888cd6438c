// Vitest global setup for integration tests: migrate and seed the test database once.
import { migrateDatabase } from "../../db/migrate";

export default async function setup() {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("Integration tests need DATABASE_URL (scripts/test starts a throwaway MariaDB and sets it).");
  await migrateDatabase(url);
  const { seed } = await import("../../db/seed");
  const { closeDb } = await import("../../app/lib/db.server");
  await seed();
  await closeDb();
}
