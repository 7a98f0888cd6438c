// @ts-check
// ESLint (flat config): JavaScript's and typescript-eslint's recommended rules, the rules of hooks,
// and the architecture as import boundaries (docs/decisions/0201-lint-and-format.md):
//   app/engine      imports no React, router, database, Node I/O, and nothing else of the app;
//   app/models      imports no components and no routes;
//   app/lib         imports no models;
//   client code     (everything under app/ that is not a route module, the server entry or a
//                   *.server file) imports no *.server module.
// A route module's UI using a *.server import is caught by React Router's build instead (it refuses
// a server-only module in a client chunk), which scripts/test runs.
// Formatting is Prettier's job (.prettierrc.json), so no style rules here.
import js from "@eslint/js";
import { defineConfig } from "eslint/config";
import reactHooks from "eslint-plugin-react-hooks";
import globals from "globals";
import { builtinModules } from "node:module";
import tseslint from "typescript-eslint";

const escape = (/** @type {string} */ s) => s.replace(/[.*+?^${}()|[\]\\/-]/g, "\\$&");

/** @typedef {{ regex: string, message: string }} Pattern */

/** @type {Pattern} */
const SERVER_MODULES = {
  regex: String.raw`\.server(\.[cm]?[jt]sx?)?$|(^|/)\.server/`,
  message:
    "Client code cannot import a *.server module. Move what the browser needs into a module without .server, or read it in a route's loader.",
};

/** @type {Pattern[]} */
const ENGINE = [
  {
    regex: String.raw`^(react|react-dom|react-router|@react-router/.*|@tanstack/.*)(/.*)?$`,
    message: "The engine is pure: no React or router. Put UI in app/components.",
  },
  {
    regex: String.raw`^(drizzle-orm|drizzle-kit|mysql2)(/.*)?$|(^|/)db(/|$)`,
    message: "The engine is pure: no database. Data access belongs in app/models.",
  },
  {
    regex: `^node:|^(${builtinModules.map(escape).join("|")})(/.*)?$`,
    message: "The engine is pure: no Node I/O (it runs on the phone too).",
  },
  {
    regex: String.raw`^~/|(^|/)(lib|models|components|routes)(/|$)`,
    message: "The engine depends on nothing else in the app; the app depends on the engine.",
  },
];

/** @type {Pattern[]} */
const MODELS = [
  {
    regex: String.raw`(^|/)(components|routes)(/|$)`,
    message: "Models never import components or routes: data flows from models to routes to UI.",
  },
];

/** @type {Pattern[]} */
const LIB = [{ regex: String.raw`(^|/)models(/|$)`, message: "app/lib is below the models: it never imports them." }];

/**
 * @param {Pattern[]} patterns
 * @returns {import("eslint").Linter.RulesRecord}
 */
const restrict = (patterns) => ({ "no-restricted-imports": ["error", { patterns }] });

export default defineConfig(
  {
    ignores: [
      "build/",
      "build-*/",
      ".react-router/",
      ".data/",
      ".tmp/",
      "node_modules/",
      "db/migrations/",
      "tests/screenshots/",
      "public/",
    ],
  },
  js.configs.recommended,
  tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    // The plugin's own types lag ESLint 10's Plugin type; it works as is.
    plugins: { "react-hooks": /** @type {import("eslint").ESLint.Plugin} */ (/** @type {unknown} */ (reactHooks)) },
    rules: {
      "react-hooks/rules-of-hooks": "error",
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrors: "none" }],
    },
  },
  // Client code: app/ except route modules, the server entry and *.server files.
  {
    files: ["app/**/*.{ts,tsx}"],
    ignores: ["app/routes/**", "app/root.tsx", "app/entry.server.tsx", "app/**/*.server.{ts,tsx}"],
    rules: restrict([SERVER_MODULES]),
  },
  { files: ["app/engine/**"], rules: restrict([...ENGINE, SERVER_MODULES]) },
  { files: ["app/models/**"], ignores: ["app/models/**/*.server.{ts,tsx}"], rules: restrict([...MODELS, SERVER_MODULES]) },
  {
    files: ["app/models/**/*.server.{ts,tsx}"],
    rules: restrict(MODELS),
  },
  { files: ["app/lib/**"], ignores: ["app/lib/**/*.server.{ts,tsx}"], rules: restrict([...LIB, SERVER_MODULES]) },
  {
    files: ["app/lib/**/*.server.{ts,tsx}"],
    rules: restrict(LIB),
  },
);
