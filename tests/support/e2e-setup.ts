// Vitest global setup for browser tests: a freshly migrated and seeded database and two app
// processes on it (to show that app servers hold no state). Needs a production build (`npm run
// build`; scripts/test and `npm run test:e2e` make it first). Tests make their own records
// (tests/support/fixtures.ts); the seed is only read.
import { spawn, type ChildProcess } from "node:child_process";
import { existsSync } from "node:fs";
import { createServer } from "node:net";
import type { TestProject } from "vitest/node";
import { freshSeededDatabase } from "./database";

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.listen(0, "127.0.0.1", () => {
      const addr = s.address();
      s.close(() => (typeof addr === "object" && addr ? resolve(addr.port) : reject(new Error("no port"))));
    });
  });
}

/** Signs the app servers' session cookies; tests that mint a session cookie need the same. */
const AUTH_SECRET = "e2e-secret-e2e-secret-e2e-secret-e2e";

async function waitFor(url: string, child: ChildProcess, log: () => string) {
  for (let i = 0; i < 150; i++) {
    if (child.exitCode !== null) throw new Error(`app server exited early:\n${log()}`);
    try {
      if ((await fetch(url)).ok) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`app server did not answer ${url}:\n${log()}`);
}

export default async function setup(project: TestProject) {
  const base = process.env.E2E_DATABASE_URL;
  if (!base) throw new Error("Browser tests need E2E_DATABASE_URL (scripts/test and `npm run test:e2e` set it; see DEVELOPERS.md).");
  const buildDir = process.env.BUILD_DIR ?? "build";
  if (!existsSync(`${buildDir}/server/index.js`))
    throw new Error(`Browser tests need a build in ${buildDir}/: run \`npm run build\` first.`);
  // Each browser project has a database of its own (cluepath_e2e, cluepath_e2e_quiet, …), so the
  // files that need a quiet database get one while the others run.
  const url = new URL(base);
  if (project.name !== "e2e") url.pathname = `${url.pathname}_${project.name.replace(/^e2e-/, "")}`;
  const dbUrl = url.toString();
  await freshSeededDatabase(dbUrl);

  const children: ChildProcess[] = [];
  const urls: string[] = [];
  for (let i = 0; i < 2; i++) {
    const port = await freePort();
    let output = "";
    const child = spawn(process.execPath, ["server.js"], {
      env: {
        ...process.env,
        PORT: String(port),
        HOST: "127.0.0.1",
        DATABASE_URL: dbUrl,
        NODE_ENV: "production",
        SECURE_COOKIES: "0",
        AUTH_SECRET,
      },
      stdio: ["ignore", "pipe", "pipe"],
    });
    child.stdout?.on("data", (d) => (output += d));
    child.stderr?.on("data", (d) => (output += d));
    children.push(child);
    const url = `http://127.0.0.1:${port}`;
    await waitFor(`${url}/healthz`, child, () => output);
    urls.push(url);
  }
  project.provide("baseUrl", urls[0]!);
  project.provide("secondBaseUrl", urls[1]!);
  project.provide("e2eDatabaseUrl", dbUrl);
  project.provide("e2eAuthSecret", AUTH_SECRET);
  return async () => {
    for (const c of children) c.kill("SIGTERM");
    await Promise.all(children.map((c) => new Promise((r) => (c.exitCode !== null ? r(null) : c.once("exit", r)))));
  };
}
