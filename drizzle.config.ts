import { defineConfig } from "drizzle-kit";
import { databaseUrl } from "./app/lib/env.server";

export default defineConfig({
  dialect: "mysql",
  schema: "./db/schema/index.ts",
  out: "./db/migrations",
  dbCredentials: { url: databaseUrl() },
});
