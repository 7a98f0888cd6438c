// Vitest for the cluster tests only (npm run test:cluster → scripts/test-cluster): kept out of the
// main projects in vite.config.ts so scripts/test never starts a cluster.
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

export default defineConfig({
  root: fileURLToPath(new URL("../..", import.meta.url)),
  resolve: { alias: { "~": fileURLToPath(new URL("../../app", import.meta.url)) } },
  test: {
    include: ["tests/cluster/**/*.test.ts"],
    environment: "node",
    fileParallelism: false,
    testTimeout: 300_000,
    hookTimeout: 420_000,
  },
});
