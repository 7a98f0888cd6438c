import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

/** Browser test files that need the database to themselves (see the "e2e-quiet" project). */
const E2E_QUIET = ["tests/e2e/route-sweep.test.ts", "tests/e2e/insights.test.ts"];

// Under Vitest the React Router plugin stays out (it wants to own the whole app build).
const underVitest = Boolean(process.env.VITEST);

export default defineConfig(({ isSsrBuild }) => ({
  // The server build's entry is the app's request handler (React Router's custom-server way):
  // build/server/index.js exports createApp, which server.js mounts on node:http.
  build: isSsrBuild ? { rollupOptions: { input: "./server/app.ts" } } : undefined,
  plugins: [tailwindcss(), !underVitest && reactRouter()],
  resolve: {
    alias: { "~": fileURLToPath(new URL("./app", import.meta.url)) },
  },
  test: {
    // Vitest's default on two cores is one worker; the projects' files are mostly waiting (on the
    // browser, the servers, MariaDB), so two keep both cores busy.
    maxWorkers: 2,
    projects: [
      {
        extends: true,
        test: {
          name: "unit",
          include: ["tests/unit/**/*.test.{ts,tsx}"],
          environment: "node",
        },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          globalSetup: ["tests/support/integration-setup.ts"],
          setupFiles: ["tests/support/integration-file.ts"],
          environment: "node",
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: {
          name: "e2e",
          include: ["tests/e2e/**/*.test.ts"],
          exclude: E2E_QUIET,
          globalSetup: ["tests/support/e2e-setup.ts"],
          setupFiles: ["tests/support/e2e-file.ts"],
          environment: "node",
          // Two files at a time: each drives one browser and mostly waits on it and the servers.
          // They make their own records, or work the demo shop in ways that do not meet.
          testTimeout: 90_000,
          hookTimeout: 90_000,
        },
      },
      {
        extends: true,
        test: {
          // Files that read a whole database or a shop's totals ("no change anywhere", root-cause
          // counts) and so need no other test writing meanwhile: their own database and servers
          // (tests/support/e2e-setup.ts), one file at a time.
          name: "e2e-quiet",
          include: E2E_QUIET,
          globalSetup: ["tests/support/e2e-setup.ts"],
          setupFiles: ["tests/support/e2e-file.ts"],
          environment: "node",
          fileParallelism: false,
          testTimeout: 90_000,
          hookTimeout: 90_000,
        },
      },
    ],
  },
}));
