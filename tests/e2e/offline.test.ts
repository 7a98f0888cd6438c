// Offline field mode on a phone-sized Chromium with no signal (playwright's context.setOffline,
// which also cuts the service worker's own fetches here): a run opened online keeps working through
// a reload and a closed tab, and reaches the server once, in order, with the phone's times; a run
// started with no signal on an assigned call is created at sync; a lead's take-over while the phone
// was offline shows the technician what was not accepted and what they typed; sign-out deletes what
// the phone kept for the user. (An update of the app while steps wait: tests/e2e/update.test.ts.)
// Screenshots: tests/screenshots/offline-*.png (390×844).
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { stableId } from "../../db/seed";
import { launchBrowser, PHONE, screenshotPath, signInAs } from "../support/browser";
import { TINY_PNG } from "../support/photo";

const baseUrl = inject("baseUrl");
// The test reads the browser tests' database directly (the app servers run on it).
process.env.DATABASE_URL = process.env.E2E_DATABASE_URL;
const { db, closeDb } = await import("../../app/lib/db.server");
const { createCall } = await import("../../app/models/calls.server");
const schema = await import("../../db/schema");
const { asc, eq } = await import("drizzle-orm");

const shopId = stableId("shop:tinderbox");
const lead = { shopId, userId: stableId("user:lead@tinderbox.example"), role: "lead" as const };
const techId = stableId("user:tech@tinderbox.example");

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

let shot = 0;
async function snap(page: Page, name: string) {
  shot++;
  await page.screenshot({ path: screenshotPath(`offline-${String(shot).padStart(2, "0")}-${name}`) });
}

/** A new call on a demo unit, assigned to the demo technician (so it is on their phone). */
async function newCall(unitKey: string, symptom: string) {
  return createCall(lead, { unitId: stableId(unitKey), symptom, priority: "urgent", assignedTo: techId, notes: null });
}

async function phone(): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport: PHONE, deviceScaleFactor: 2, hasTouch: true, isMobile: true });
  const page = await context.newPage();
  await signInAs(page, baseUrl, "tech@tinderbox.example");
  await page.waitForURL(`${baseUrl}/calls`);
  return { context, page };
}

/** The service worker has installed and controls the page (the app and its shells are on the phone). */
async function controlled(page: Page) {
  await page.waitForFunction(() => navigator.serviceWorker?.controller !== null, undefined, { timeout: 30_000 });
}

/** Starts the rotisserie procedure from the call's page, with signal (the usual way). */
async function startOnCall(page: Page, callId: string) {
  await page.goto(`${baseUrl}/calls/${callId}`);
  await page.getByRole("button", { name: "Start this procedure: Two-fan convection rotisserie heats unevenly" }).click();
  await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/);
}

async function atStep(page: Page, title: string) {
  await page.getByRole("heading", { level: 1, name: title }).waitFor({ timeout: 15_000 });
}

async function acknowledge(page: Page, title: string) {
  await atStep(page, title);
  await page.getByRole("button", { name: /^I have read this and made the work safe/ }).click();
}

async function saved(page: Page) {
  await page.getByRole("status").filter({ hasText: "✓ Saved" }).waitFor({ timeout: 20_000 });
}

/** What the phone keeps to send, read from its IndexedDB (kind, idempotency key, phone clock). */
async function outbox(page: Page): Promise<{ kind: string; key: string; at: string; state: string }[]> {
  return page.evaluate(
    (name) =>
      new Promise((resolve, reject) => {
        const open = indexedDB.open(name);
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const req = open.result.transaction("outbox").objectStore("outbox").getAll();
          req.onsuccess = () => {
            resolve(
              (req.result as { kind: string; key: string; at: string; state: string }[]).map(({ kind, key, at, state }) => ({
                kind,
                key,
                at,
                state,
              })),
            );
            open.result.close();
          };
        };
      }),
    `cluepath-phone-${techId}`,
  );
}

const stepsOf = (runId: string) =>
  db().select().from(schema.runSteps).where(eq(schema.runSteps.runId, runId)).orderBy(asc(schema.runSteps.seq));
const photosOf = (runId: string) => db().select().from(schema.runPhotos).where(eq(schema.runPhotos.runId, runId));
const runRow = async (runId: string) => (await db().select().from(schema.runs).where(eq(schema.runs.id, runId)))[0];

describe("offline field mode (390×844, Chromium offline)", () => {
  it("a run opened online works through a reload and a closed tab with no signal, then reaches the server once, in order, with the phone's times", async () => {
    const call = await newCall("unit:larkspur-rotisserie", "left spits pale (offline check)");
    const { context, page } = await phone();
    await startOnCall(page, call.id);
    const runUrl = page.url();
    const runId = runUrl.split("/").pop()!;
    await atStep(page, "Disconnect and lock out power before opening the panel");
    await controlled(page);

    // No signal, and the page reloaded: the runner opens from the phone.
    await context.setOffline(true);
    await page.reload();
    await atStep(page, "Disconnect and lock out power before opening the panel");
    // Nothing waits yet, but the runner says there is no signal and where what follows is kept.
    await page.getByText("No signal. This run is on this phone: what you enter is kept here and sent when there is signal.").waitFor();
    await expect(
      page
        .getByRole("status")
        .filter({ hasText: /^No signal$/ })
        .count(),
    ).resolves.toBe(1);
    await snap(page, "reloaded-no-signal");
    await acknowledge(page, "Disconnect and lock out power before opening the panel");
    await page.getByText("1 step saved on this phone — it will be sent when there is signal.").waitFor();
    await acknowledge(page, "Discharge the fan-motor run capacitors with a rated tool");
    await acknowledge(page, "The next reading is taken live");

    // A reading with the van's meter, and a photo of it.
    await atStep(page, "Supply voltage across L1–L2");
    await page.getByRole("radio", { name: /^Van 1 multimeter — AC volts, 600 V range/ }).check();
    await page.getByLabel("Reading", { exact: true }).fill("208");
    await page.getByText("Within limits", { exact: true }).waitFor();
    await page
      .getByLabel("Add a photo to this step")
      .setInputFiles({ name: "supply.png", mimeType: "image/png", buffer: Buffer.from(TINY_PNG) });
    await page.getByRole("img", { name: "Photo on this step" }).waitFor();
    await expect(page.getByText("on this phone", { exact: true }).isVisible()).resolves.toBe(true);
    await snap(page, "reading-and-photo-on-phone");
    await page.getByRole("button", { name: "Save reading" }).click();

    // An answer.
    await atStep(page, "With the elements heating, do both convection fans run at full speed?");
    await page.getByRole("button", { name: "One slow", exact: true }).click();
    await atStep(page, "Power down again and discharge the capacitor");
    const waiting = "5 steps and 1 photo saved on this phone — they will be sent when there is signal.";
    await page.getByText(waiting).waitFor();
    await expect(page.getByRole("status").filter({ hasText: "On this phone · 6" }).count()).resolves.toBe(1);
    await snap(page, "five-steps-one-photo-waiting");
    const kept = await outbox(page);
    expect(kept.map((i) => i.kind)).toEqual(["step", "step", "step", "photo", "step", "step"]);

    // The tab closes; a new one opens the run with no signal: everything is still there.
    await page.close();
    const again = await context.newPage();
    await again.goto(runUrl);
    await atStep(again, "Power down again and discharge the capacitor");
    await again.getByText(waiting).waitFor();
    await expect(again.getByRole("button", { name: "Step 6 · 5 done" }).isVisible()).resolves.toBe(true);
    await again.getByRole("button", { name: "Step 6 · 5 done" }).click();
    await expect(
      again
        .getByRole("region", { name: "Steps so far" })
        .getByText(/208 V — within 191–218 V/)
        .isVisible(),
    ).resolves.toBe(true);
    await snap(again, "reopened-no-signal-history");
    await expect(outbox(again)).resolves.toEqual(kept);
    // Nothing reached the server meanwhile.
    await expect(stepsOf(runId)).resolves.toHaveLength(0);

    // Signal returns: each entry is sent once, in order, with its key and the phone's clock.
    await context.setOffline(false);
    await saved(again);
    await expect.poll(async () => (await outbox(again)).length, { timeout: 20_000 }).toBe(0);
    const steps = await stepsOf(runId);
    const sentSteps = kept.filter((i) => i.kind === "step");
    expect(steps.map((s) => s.idempotencyKey)).toEqual(sentSteps.map((i) => i.key));
    expect(steps.map((s) => s.seq)).toEqual([0, 1, 2, 3, 4]);
    expect(steps.map((s) => s.type)).toEqual(["acknowledge", "acknowledge", "acknowledge", "reading", "answer"]);
    expect(steps.map((s) => s.clientAt?.toISOString())).toEqual(sentSteps.map((i) => i.at));
    expect(steps[3]).toMatchObject({ typed: "208 V", verdict: "within" });
    const photos = await photosOf(runId);
    const photo = kept.find((i) => i.kind === "photo")!;
    expect(photos).toHaveLength(1);
    expect(photos[0]).toMatchObject({ idempotencyKey: photo.key, bytes: TINY_PNG.byteLength, nodeKey: steps[3]!.nodeKey });
    expect(photos[0]!.clientAt?.toISOString()).toBe(photo.at);
    // A reload with signal shows the server's run, nothing doubled.
    await again.reload();
    await atStep(again, "Power down again and discharge the capacitor");
    await expect(again.getByRole("button", { name: "Step 6 · 5 done" }).isVisible()).resolves.toBe(true);
    await expect(stepsOf(runId)).resolves.toHaveLength(5);
    await snap(again, "synced");
    await context.close();
  });

  it("a run started with no signal on an assigned call is created on the server when the phone syncs", async () => {
    const call = await newCall("unit:gilded-griddle", "middle section cold (offline start)");
    const { context, page } = await phone();
    // My calls keeps today's calls and their procedures on the phone.
    await page.getByText(/^Ready for no signal: \d+ calls/).waitFor({ timeout: 20_000 });
    await controlled(page);
    await snap(page, "my-calls-ready");

    await context.setOffline(true);
    await page.goto(`${baseUrl}/calls`);
    await page.waitForURL(`${baseUrl}/phone`);
    await page.getByRole("status").filter({ hasText: "No signal" }).waitFor();
    const card = page.getByRole("listitem").filter({ hasText: `Call ${call.number}` });
    await card.getByRole("button", { name: "Start: Electric griddle section does not heat" }).waitFor();
    await snap(page, "phone-page-no-signal");
    const startedAt = Date.now();
    await card.getByRole("button", { name: "Start: Electric griddle section does not heat" }).click();
    await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/);
    const runId = page.url().split("/").pop()!;
    await acknowledge(page, "Hot plate and live terminals");
    await atStep(page, "Turn the cold section's thermostat to maximum. Does its heat light come on?");
    await page.getByRole("button", { name: "Yes", exact: true }).click();
    await atStep(page, "With the heat light on, does the section's contactor pull in (a clear click, armature down)?");
    await page.getByText("The run's start and 2 steps saved on this phone — they will be sent when there is signal.").waitFor();
    await snap(page, "started-offline");
    await expect(runRow(runId)).resolves.toBeUndefined();

    await context.setOffline(false);
    await saved(page);
    await expect.poll(async () => (await stepsOf(runId)).length, { timeout: 20_000 }).toBe(2);
    const run = (await runRow(runId))!;
    expect(run).toMatchObject({ callId: call.id, technicianId: techId, startedBy: techId, status: "active", stepCount: 2 });
    expect(run.versionId).toBe(stableId("tree-version:griddle-section-no-heat.md:1"));
    // The run began when the phone says (to the millisecond), not when the server heard of it.
    expect(Math.abs(run.startedAt.getTime() - startedAt)).toBeLessThan(5_000);
    const [callRow] = await db().select().from(schema.serviceCalls).where(eq(schema.serviceCalls.id, call.id));
    expect(callRow!.status).toBe("in_progress");
    await context.close();
  });

  it("a lead takes the run over while the phone has no signal: on reconnect the technician sees what was not accepted and what they typed, kept until they decide", async () => {
    const call = await newCall("unit:larkspur-rotisserie", "right spits pale (offline conflict)");
    const { context, page } = await phone();
    await startOnCall(page, call.id);
    const runId = page.url().split("/").pop()!;
    await acknowledge(page, "Disconnect and lock out power before opening the panel");
    await atStep(page, "Discharge the fan-motor run capacitors with a rated tool");
    await saved(page);
    await controlled(page);

    await context.setOffline(true);
    await acknowledge(page, "Discharge the fan-motor run capacitors with a rated tool");
    await acknowledge(page, "The next reading is taken live");
    await atStep(page, "Supply voltage across L1–L2");
    await page.getByLabel("Reading", { exact: true }).fill("207");
    await page.getByRole("button", { name: "Save reading" }).click();
    await page.getByText("3 steps saved on this phone — they will be sent when there is signal.").waitFor();

    // Meanwhile the lead takes the run over from the office.
    const office = await browser.newContext();
    const lp = await office.newPage();
    await signInAs(lp, baseUrl, "lead@tinderbox.example");
    await lp.waitForURL(`${baseUrl}/authoring`);
    const took = await lp.evaluate(
      (id) =>
        fetch(`/api/runs/${id}/status`, {
          method: "POST",
          headers: { "content-type": "application/json" },
          body: JSON.stringify({ action: "take-over" }),
        }).then((r) => r.status),
      runId,
    );
    expect(took).toBe(200);
    await office.close();

    await context.setOffline(false);
    const refused = page.getByRole("alert").filter({ hasText: "Not accepted by the server" });
    await refused.waitFor({ timeout: 20_000 });
    await expect(refused.textContent()).resolves.toContain(
      "Only the technician holding this run can add steps. A lead can take it over first.",
    );
    // Who holds the run now comes first; the server's words follow; sending again would only be refused.
    await refused.getByText(/^\S+ \S+ took this run over while this phone had no signal, so these were not added to it\.$/).waitFor();
    await expect(refused.getByRole("button", { name: "Send again" }).count()).resolves.toBe(0);
    const rows = refused.getByRole("listitem");
    await expect(rows.count()).resolves.toBe(3);
    await expect(rows.nth(0).textContent()).resolves.toMatch(
      /Caution acknowledged.*Discharge the fan-motor run capacitors with a rated tool/,
    );
    await expect(rows.nth(2).textContent()).resolves.toMatch(
      /Reading 207 V — not sent, it came after the one refused.*Supply voltage across L1–L2/,
    );
    await expect(page.getByRole("status").filter({ hasText: "Not accepted" }).count()).resolves.toBe(1);
    await refused.scrollIntoViewIfNeeded();
    await snap(page, "not-accepted-after-take-over");
    await expect(stepsOf(runId)).resolves.toHaveLength(1);

    // Kept until the technician decides: a reload still shows them.
    await page.reload();
    await refused.waitFor();
    await expect(rows.count()).resolves.toBe(3);
    await refused.getByRole("button", { name: "Remove from this phone…" }).click();
    await refused.getByText("Remove these 3 entries from this phone? They are not on the server and will be lost.").waitFor();
    await snap(page, "remove-asks");
    await refused.getByRole("button", { name: "Remove them" }).click();
    await expect.poll(() => refused.count()).toBe(0);
    await expect(outbox(page)).resolves.toEqual([]);

    // Sign-out deletes what this phone kept for the technician.
    await page.goto(`${baseUrl}/calls`);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL(/\/login/);
    const left = await page.evaluate(async () => ({
      dbs: (await indexedDB.databases()).map((d) => d.name),
      user: localStorage.getItem("cluepath.phone.user"),
    }));
    expect(left.dbs).not.toContain(`cluepath-phone-${techId}`);
    expect(left.user).toBeNull();
    await context.close();
  });
});
