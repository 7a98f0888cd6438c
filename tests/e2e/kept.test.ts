// What the user typed survives a failing screen (issue 9, "keep it so": route error boundaries for
// the runner and the editor). A server of its own reaches MariaDB through a relay the test cuts: the
// technician's steps (in the phone's outbox) and the lead's edits (in local storage) made while the
// database is away are kept in the browser, listed by the route's error page when the page is
// reloaded during the outage, and sent (steps, by themselves) or offered back (edits) once it is back. Phone size for the runner, laptop size for the editor.
import { eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runSteps } from "../../db/schema";
import { stableId } from "../../db/seed";
import type { Ctx } from "../../app/lib/context";
import { closeDb, db } from "../../app/lib/db.server";
import { startRun } from "../../app/models/runs/start.server";
import { createDraftTree } from "../../app/models/trees/drafts.server";
import { loadTreeVersion } from "../../app/models/trees/versions.server";
import { launchBrowser, LAPTOP, PHONE, screenshotPath, signInAs } from "../support/browser";
import { relayedDatabase, startServer, type DatabaseRelay, type Started } from "../support/server";
import { smallTree } from "../support/trees";

// The models below talk to the browser tests' database, as the server does (the configuration is
// read at the first query, after this line).
process.env.DATABASE_URL = process.env.E2E_DATABASE_URL;

const shopId = stableId("shop:tinderbox");
const tech: Ctx = { shopId, userId: stableId("user:tech@tinderbox.example"), role: "technician" };
const lead: Ctx = { shopId, userId: stableId("user:lead@tinderbox.example"), role: "lead" };
const rotisserieTree = stableId("tree:rotisserie-uneven-heat.md");

let relay: DatabaseRelay;
let server: Started;
let browser: Browser;

beforeAll(async () => {
  let url: string;
  ({ relay, url } = await relayedDatabase());
  server = await startServer({ DATABASE_URL: url, DB_ACQUIRE_TIMEOUT_MS: "1500", LOG_LEVEL: "warn" });
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
  await relay?.down();
  await closeDb();
});

async function signedIn(email: string, viewport: { width: number; height: number }): Promise<Page> {
  // Without the service worker: with it, a reload during the outage opens the runner from the
  // phone's storage instead (tests/e2e/offline.test.ts); here the route's error page is the subject.
  const context = await browser.newContext({ viewport, serviceWorkers: "block" });
  const page = await context.newPage();
  // The editor asks before leaving with unsaved changes; the test means to leave.
  page.on("dialog", (d) => void d.accept());
  await signInAs(page, server.url, email);
  await page.waitForURL((u) => !u.pathname.startsWith("/login"));
  return page;
}

describe("the runner keeps unsent steps through an outage and its error page", () => {
  it("lists them on the error page while the database is away, and sends them once it is back", async () => {
    const { runId } = await startRun(tech, { treeId: rotisserieTree });
    const page = await signedIn("tech@tinderbox.example", PHONE);
    await page.goto(`${server.url}/runs/${runId}`);
    await page.getByRole("heading", { level: 1, name: "Disconnect and lock out power before opening the panel" }).waitFor();

    await relay.down();
    const ack = page.getByRole("button", { name: /^I have read this and made the work safe/ });
    await ack.click();
    await page.getByRole("heading", { level: 1, name: "Discharge the fan-motor run capacitors with a rated tool" }).waitFor();
    await ack.click();
    await page.getByRole("heading", { level: 1, name: "The next reading is taken live" }).waitFor();

    // The page again, while the database is away: the runner's own error page, with what is kept.
    const res = await page.reload();
    expect(res?.status()).toBe(503);
    await page.getByRole("heading", { level: 1, name: "Can't reach the database" }).waitFor();
    const kept = page.getByRole("region", { name: "Kept on this phone, not sent yet" });
    await kept.waitFor();
    await expect(kept.getByRole("listitem").allTextContents()).resolves.toEqual([
      "Caution acknowledged — Disconnect and lock out power before opening the panel",
      "Caution acknowledged — Discharge the fan-motor run capacitors with a rated tool",
    ]);
    await page.screenshot({ path: screenshotPath("kept-runner-error-phone"), fullPage: true });
    expect(await db().select().from(runSteps).where(eq(runSteps.runId, runId))).toEqual([]);

    // Back: the run opens and the phone's outbox sends the two steps by itself, in order, once each.
    await relay.up();
    await page.getByRole("button", { name: "Open the run again" }).click();
    await page.getByRole("heading", { level: 1, name: "The next reading is taken live" }).waitFor({ timeout: 15_000 });
    await page.screenshot({ path: screenshotPath("kept-runner-reopened-phone"), fullPage: true });
    await expect
      .poll(
        async () =>
          (await db().select({ seq: runSteps.seq, node: runSteps.nodeKey }).from(runSteps).where(eq(runSteps.runId, runId))).sort(
            (a, z) => a.seq - z.seq,
          ),
        { timeout: 15_000 },
      )
      .toEqual([
        { seq: 0, node: "lockout" },
        { seq: 1, node: "discharge-caps" },
      ]);
    // Nothing waits on the phone any more, and a reload doubles nothing.
    await expect.poll(() => page.getByText(/saved on this phone/).count(), { timeout: 15_000 }).toBe(0);
    await page.reload();
    await page.getByRole("heading", { level: 1, name: "The next reading is taken live" }).waitFor();
    await expect(db().select().from(runSteps).where(eq(runSteps.runId, runId))).resolves.toHaveLength(2);
    await page.context().close();
  });
});

describe("the editor keeps unsaved changes through an outage and its error page", () => {
  it("says they are kept (and offers them as a file) while the database is away, and restores them once it is back", async () => {
    const title = `Kept edits ${crypto.randomUUID().slice(0, 6)}`;
    const { treeId } = await createDraftTree(lead, smallTree(title));
    const page = await signedIn("lead@tinderbox.example", LAPTOP);
    await page.goto(`${server.url}/trees/${treeId}/edit`);
    const titleField = page.getByLabel("Title", { exact: true });
    await titleField.waitFor();

    await relay.down();
    await titleField.fill(`${title} (changed offline)`);
    await titleField.blur();
    await page
      .getByText(/Not saved yet|Unsaved changes/)
      .first()
      .waitFor({ timeout: 10_000 });

    const res = await page.reload();
    expect(res?.status()).toBe(503);
    await page.getByRole("heading", { level: 1, name: "Can't reach the database" }).waitFor();
    const kept = page.getByRole("region", { name: "Your unsaved changes are kept in this browser" });
    await kept.waitFor();
    await expect(kept.textContent()).resolves.toContain(`“${title} (changed offline)”`);
    const download = page.waitForEvent("download");
    await kept.getByRole("button", { name: "Download my changes (.md)" }).click();
    const file = await download;
    expect(file.suggestedFilename()).toMatch(/-unsaved\.md$/);
    await page.screenshot({ path: screenshotPath("kept-editor-error-laptop"), fullPage: true });
    expect((await loadTreeVersion(lead, treeId, "draft")).tree.title).toBe(title);

    await relay.up();
    await page.getByRole("button", { name: "Open the editor again" }).click();
    const offer = page.getByRole("alert").filter({ hasText: "were not saved" });
    await offer.waitFor({ timeout: 15_000 });
    await page.screenshot({ path: screenshotPath("kept-editor-offer-laptop"), fullPage: true });
    await offer.getByRole("button", { name: "Restore my changes" }).click();
    await page.getByText("All changes saved").first().waitFor({ timeout: 15_000 });
    expect((await loadTreeVersion(lead, treeId, "draft")).tree.title).toBe(`${title} (changed offline)`);
    await page.reload();
    await page.getByLabel("Title", { exact: true }).waitFor();
    await expect(page.getByText("were not saved").count()).resolves.toBe(0);
    await page.context().close();
  });
});
