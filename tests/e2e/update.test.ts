// A new version of the app reaches a phone that holds unsent steps (issue 13: "an update shows a new
// version is ready and never drops queued steps"). Chromium fetches a worker's script past
// playwright's routes, so the second version is a second server: the first is stopped and a copy of
// the build whose service worker differs is started on the same port (one origin, so the same
// worker registration). Both reach MariaDB through a relay the test cuts, so the technician's step
// waits on the phone all through the update. Phone size (390×844); screenshots update-*.png.
import { cpSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runSteps } from "../../db/schema";
import { stableId } from "../../db/seed";
import type { Ctx } from "../../app/lib/context";
import { closeDb, db } from "../../app/lib/db.server";
import { startRun } from "../../app/models/runs/start.server";
import { launchBrowser, PHONE, screenshotPath, signInAs } from "../support/browser";
import { freePort } from "../support/e2e-setup";
import { relayedDatabase, startServer, type DatabaseRelay, type Started } from "../support/server";

const shopId = stableId("shop:tinderbox");
const tech: Ctx = { shopId, userId: stableId("user:tech@tinderbox.example"), role: "technician" };
const rotisserieTree = stableId("tree:rotisserie-uneven-heat.md");
/** A line of the worker's own comments, present in the server bundle (server/worker.js is imported raw). */
const WORKER_LINE = "Cluepath's service worker (served as /sw.js";

let relay: DatabaseRelay;
let port: number;
let env: Record<string, string>;
let server: Started | undefined;
let browser: Browser;
let nextBuild: string;

/** A copy of the build whose service worker's text differs by one comment: a new version to the phone (BUILD_DIR, relative to the project). */
function copyWithNewWorker(): string {
  // Inside the build folder, so the server bundle finds the project's node_modules as the build does.
  const build = process.env.BUILD_DIR ?? "build";
  const dir = mkdtempSync(join(build, ".next-release-"));
  for (const part of ["client", "server"]) cpSync(join(build, part), join(dir, part), { recursive: true });
  let changed = 0;
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else if (p.endsWith(".js")) {
        const text = readFileSync(p, "utf8");
        if (text.includes(WORKER_LINE)) {
          writeFileSync(p, text.replace(WORKER_LINE, "Cluepath's service worker, the next release (served as /sw.js"));
          changed++;
        }
      }
    }
  };
  walk(join(dir, "server"));
  if (changed === 0) throw new Error("the server build does not hold the worker's text");
  return dir;
}

beforeAll(async () => {
  let url: string;
  ({ relay, url } = await relayedDatabase());
  port = await freePort();
  env = { DATABASE_URL: url, PORT: String(port), DB_ACQUIRE_TIMEOUT_MS: "1500", LOG_LEVEL: "warn" };
  server = await startServer(env);
  nextBuild = copyWithNewWorker();
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
  await relay?.down();
  await closeDb();
  if (nextBuild) rmSync(nextBuild, { recursive: true, force: true });
});

/** The app versions this phone's caches hold (the worker names its cache after its version). */
const appCaches = (page: Page) => page.evaluate(async () => (await caches.keys()).filter((k) => k.startsWith("cluepath-app-")));

/** How many entries the phone's outbox holds. */
const waiting = (page: Page) =>
  page.evaluate(
    (name) =>
      new Promise<number>((resolve, reject) => {
        const open = indexedDB.open(name);
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const req = open.result.transaction("outbox").objectStore("outbox").count();
          req.onsuccess = () => {
            resolve(req.result);
            open.result.close();
          };
        };
      }),
    `cluepath-phone-${tech.userId}`,
  );

describe("a new version of the app on a phone with unsent steps (390×844)", () => {
  it("says a new version is ready; reloading into it keeps the waiting step, which is then stored once", async () => {
    const { runId } = await startRun(tech, { treeId: rotisserieTree });
    const url = `http://127.0.0.1:${port}`;
    const context = await browser.newContext({ viewport: PHONE, deviceScaleFactor: 2, hasTouch: true, isMobile: true });
    const page = await context.newPage();
    await signInAs(page, url, "tech@tinderbox.example");
    await page.waitForURL((u) => !u.pathname.startsWith("/login"));
    await page.goto(`${url}/runs/${runId}`);
    await page.getByRole("heading", { level: 1, name: "Disconnect and lock out power before opening the panel" }).waitFor();
    await page.waitForFunction(() => navigator.serviceWorker?.controller !== null, undefined, { timeout: 30_000 });
    const before = await appCaches(page);
    expect(before).toHaveLength(1);

    // The database goes away: the caution waits on the phone.
    await relay.down();
    await page.getByRole("button", { name: /^I have read this and made the work safe/ }).click();
    await page.getByRole("heading", { level: 1, name: "Discharge the fan-motor run capacitors with a rated tool" }).waitFor();
    await page
      .getByText("Cluepath's server can't save just now. 1 step saved on this phone — it will be sent when the server is back.")
      .waitFor({ timeout: 15_000 });
    await expect(waiting(page)).resolves.toBe(1);

    // The new release: same address, a service worker that differs.
    await server!.stop();
    server = await startServer({ ...env, BUILD_DIR: nextBuild });

    // Opening the run again (the server cannot read it; the phone's copy opens) finds the new version.
    await page.reload();
    await page.getByRole("heading", { level: 1, name: "Discharge the fan-motor run capacitors with a rated tool" }).waitFor();
    const ready = page.getByRole("status").filter({ hasText: "A new version of Cluepath is ready. What is on this phone stays." });
    await ready.waitFor({ timeout: 30_000 });
    await page
      .getByText("Cluepath's server can't save just now. 1 step saved on this phone — it will be sent when the server is back.")
      .waitFor();
    await page.screenshot({ path: screenshotPath("update-ready-phone") });

    // The page reloads itself once the new worker has taken over.
    const reloaded = page.waitForEvent("load", { timeout: 30_000 });
    await ready.getByRole("button", { name: "Reload" }).click();
    await reloaded;
    await expect.poll(() => appCaches(page), { timeout: 30_000 }).not.toEqual(before);
    await expect(appCaches(page)).resolves.toHaveLength(1);
    await page.getByRole("heading", { level: 1, name: "Discharge the fan-motor run capacitors with a rated tool" }).waitFor();
    await expect(ready.count()).resolves.toBe(0);
    await expect(waiting(page)).resolves.toBe(1);
    await page
      .getByText("Cluepath's server can't save just now. 1 step saved on this phone — it will be sent when the server is back.")
      .waitFor();
    await page.screenshot({ path: screenshotPath("update-reloaded-phone") });
    expect(await db().select().from(runSteps).where(eq(runSteps.runId, runId))).toEqual([]);

    // The database is back: the step is stored once, and nothing waits any more.
    await relay.up();
    await expect
      .poll(
        async () => (await db().select({ node: runSteps.nodeKey }).from(runSteps).where(eq(runSteps.runId, runId))).map((s) => s.node),
        {
          timeout: 60_000,
        },
      )
      // The phone tries again on its own, waiting longer after each failure (at most half a minute).
      .toEqual(["lockout"]);
    await expect.poll(() => waiting(page), { timeout: 15_000 }).toBe(0);
    await context.close();
  }, 180_000);
});
