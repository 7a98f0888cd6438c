import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

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
