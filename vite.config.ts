import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { fileURLToPath } from "node:url";
import { defineConfig, type TestProjectInlineConfiguration } from "vitest/config";

/**
 * Browser test files that read a whole database or a shop's totals ("no change anywhere",
 * root-cause counts), so no other test may write there meanwhile: each is a project of its own,
 * "e2e-<name>", with its own database and app servers (tests/support/e2e-setup.ts).
 */
const E2E_ALONE = { sweep: "tests/e2e/route-sweep.test.ts", insights: "tests/e2e/insights.test.ts" };

const browserProject = (name: string, include: string[], exclude: string[] = []): TestProjectInlineConfiguration => ({
  extends: true,
  test: {
    name,
    include,
    exclude,
    globalSetup: ["tests/support/e2e-setup.ts"],
    setupFiles: ["tests/support/e2e-file.ts"],
    environment: "node",
    testTimeout: 90_000,
    hookTimeout: 90_000,
  },
});

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
    // Two files at a time (Vitest's default on two cores is one): the browser files mostly wait on
    // the browser and the servers. scripts/test runs the browser projects in one Vitest and the unit
    // and integration projects in another, side by side, each with its own S3 fake and mail catcher.
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
          // One file at a time: they share the demo shop's ids in the mail catcher and the S3 fake.
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      // Browser files run side by side too: they make their own records, or work the demo shop in
      // ways that do not meet.
      browserProject("e2e", ["tests/e2e/**/*.test.ts"], Object.values(E2E_ALONE)),
      ...Object.entries(E2E_ALONE).map(([name, file]) => browserProject(`e2e-${name}`, [file])),
    ],
  },
}));
