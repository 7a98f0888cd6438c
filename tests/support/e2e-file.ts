// Runs before each browser test file: the app's models in this process (used by the fixtures in
// tests/support/fixtures.ts) work on the same database as the app servers, and a session cookie
// minted here (tests/support/session.ts) is one the servers accept.
import { afterAll, inject } from "vitest";

process.env.DATABASE_URL = inject("e2eDatabaseUrl");
// The project's own database (tests/support/e2e-setup.ts), for tests that start servers of their own.
process.env.E2E_DATABASE_URL = inject("e2eDatabaseUrl");
process.env.AUTH_SECRET = inject("e2eAuthSecret");

afterAll(async () => {
  const { closeDb } = await import("../../app/lib/db.server");
  await closeDb();
});
