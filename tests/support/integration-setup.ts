// Vitest global setup for integration tests: the template database, made once from the migrations
// and the demo seed. Each test file then works on its own copy (tests/support/integration-file.ts).
import type { TestProject } from "vitest/node";
import { freshSeededDatabase } from "./database";

export default async function setup(project: TestProject) {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("Integration tests need DATABASE_URL (scripts/test starts a throwaway MariaDB and sets it; see DEVELOPERS.md).");
  await freshSeededDatabase(url);
  project.provide("templateDatabaseUrl", url);
}
