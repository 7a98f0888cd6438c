// Vitest global setup for integration tests: the template database, made once from the migrations
// and the demo seed. Before each test file its worker's database is reset to it
// (tests/support/integration-file.ts); the working databases are dropped at the end.
import type { TestProject } from "vitest/node";
import { databaseName, dropDatabasesStartingWith, freshSeededDatabase } from "./database";

export default async function setup(project: TestProject) {
  const url = process.env.DATABASE_URL;
  if (!url)
    throw new Error("Integration tests need DATABASE_URL (scripts/test starts a throwaway MariaDB and sets it; see DEVELOPERS.md).");
  const workPrefix = `${databaseName(url)}_w`;
  await dropDatabasesStartingWith(url, workPrefix);
  await freshSeededDatabase(url);
  project.provide("templateDatabaseUrl", url);
  return () => dropDatabasesStartingWith(url, workPrefix);
}
