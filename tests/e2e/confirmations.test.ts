// The runner on a phone (390×844) when the engine asks about a reading: 208 typed on the mV button
// of the 191–218 V supply step is 0.208 V, so the question shows beside the field with the
// suggested 208 V as a button that fills the field and "Yes, 208 mV is right"; a reading above the
// chosen meter's 600 V range is refused; "found here before" shows under a step when the shop's
// history has it. Screenshots: tests/screenshots/confirm-*.png.
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { foundHereLine } from "../../app/components/runner/FoundHere";
import { expectNoSeriousViolations, smallTargets } from "../support/a11y";
import { launchBrowser, PHONE, screenshotPath, signInAs } from "../support/browser";
import { startedRun, storedRun } from "../support/fixtures";

const baseUrl = inject("baseUrl");
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

const snap = (page: Page, name: string) => page.screenshot({ path: screenshotPath(`confirm-${name}`) });

async function acknowledgeAll(page: Page, n: number) {
  for (let i = 0; i < n; i++) {
    const ack = page.getByRole("button", { name: /^I have read this and made the work safe/ });
    await ack.waitFor();
    // A screen ignores taps for a moment after it appears (a double tap meant for the last one).
    await expect.poll(() => ack.isEnabled()).toBe(true);
    await ack.click();
  }
}

describe("confirming a reading on the phone", () => {
  it("asks about 208 mV on a 208 V supply, fills 208 V when tapped, saves 208 mV when confirmed, and keeps the confirmation", async () => {
    const { runId, path } = await startedRun();
    const context = await browser.newContext({ viewport: PHONE, deviceScaleFactor: 2, hasTouch: true, isMobile: true });
    const page = await context.newPage();
    await signInAs(page, baseUrl, "tech@tinderbox.example");
    await page.waitForURL(`${baseUrl}/calls`);
    await page.goto(`${baseUrl}${path}`);
    await acknowledgeAll(page, 3);
    await page.getByRole("heading", { level: 1, name: "Supply voltage across L1–L2" }).waitFor();

    // "Found here before": the demo shop's invented history has completed runs of this tree, so
    // the step's line shows under its title, as the API words it.
    const { found } = await storedRun(runId);
    const line = foundHereLine(found, { id: "supply-voltage", kind: "measurement" });
    expect(line).toMatch(/^\d+ earlier runs at this step: /);
    await expect(page.getByLabel("Found here before").textContent()).resolves.toContain(line);
    await snap(page, "step");

    // The van's voltmeter (600 V range), the mV button, 208.
    const field = page.getByLabel("Reading", { exact: true });
    await page.getByRole("radio", { name: /^Van 1 multimeter — AC volts, 600 V range/ }).check();
    await expect(
      page
        .getByText(/range up to 600 V/)
        .first()
        .isVisible(),
    ).resolves.toBe(true);
    await field.fill("700");
    await page.getByText("above the top of this meter's 600 V range").waitFor();
    await snap(page, "over-range");

    await page.getByRole("radio", { name: "mV" }).check();
    await field.fill("208");
    const box = page.getByRole("group", { name: "Check this reading" });
    await box.waitFor();
    await expect(box.getByText("That is 0.208 V — did you mean 208 V?").isVisible()).resolves.toBe(true);
    await expect(box.getByText(/it counts as: 208 mV = 0\.208 V — low: below 191 V/).isVisible()).resolves.toBe(true);
    await expect(smallTargets(page)).resolves.toEqual([]);
    await expectNoSeriousViolations(page, "the supply reading with the engine's question");
    await box.scrollIntoViewIfNeeded();
    await snap(page, "asked");

    // Save without answering: nothing is sent, the question is said aloud again.
    await page.getByRole("button", { name: "Save reading" }).click();
    await expect.poll(() => page.locator("#announce-assertive").textContent()).toMatch(/did you mean 208 V\?/);
    await expect(page.getByRole("heading", { level: 1, name: "Supply voltage across L1–L2" }).isVisible()).resolves.toBe(true);

    // The suggestion fills the field and the V button: within 191–218 V.
    await box.getByRole("button", { name: "Use 208 V" }).click();
    await expect(field.inputValue()).resolves.toBe("208");
    await expect(page.getByRole("radio", { name: "V", exact: true }).isChecked()).resolves.toBe(true);
    await page.getByText("Within limits", { exact: true }).waitFor();
    await snap(page, "suggestion-taken");

    // Back to mV, and this time the technician says the reading is right.
    await page.getByRole("radio", { name: "mV" }).check();
    await box.waitFor();
    await box.getByRole("button", { name: "Yes, 208 mV is right" }).click();
    // 0.208 V is low: the run goes to the low-supply hand-over, and the saved reading says it was confirmed.
    const last = page.getByLabel("Last reading");
    await last.getByText("(confirmed as read)").waitFor();
    await expect(last.textContent()).resolves.toMatch(/0\.208 V — low: below 191/);
    await snap(page, "confirmed");

    // The server stored it as confirmed (run_steps.confirmed), judged as the phone showed.
    await expect.poll(async () => (await storedRun(runId)).view.steps.find((s) => s.node === "supply-voltage")?.confirmed).toBe(true);
    const { view } = await storedRun(runId);
    expect(view.steps.find((s) => s.node === "supply-voltage")).toMatchObject({
      typed: "208 mV",
      verdict: "low",
      confirmed: true,
      meter: { range: 600 },
    });

    // Handed to a lead (the tree's low-supply end), the run's steps list it as confirmed, after a reload too.
    await page.getByRole("button", { name: "Send to a lead…" }).click();
    await page.getByRole("button", { name: "Send to a lead", exact: true }).click();
    await page.getByRole("heading", { level: 1, name: /Waiting for a lead/ }).waitFor();
    await page.reload();
    await page.getByRole("heading", { level: 1, name: /Waiting for a lead/ }).waitFor();
    await snap(page, "handed-over");
    await expect(
      page.getByRole("region", { name: "Steps so far" }).getByRole("listitem").filter({ hasText: "Supply voltage" }).textContent(),
    ).resolves.toMatch(/0\.208 V — low.*\(confirmed as read\)/);
    await snap(page, "history");
    await context.close();
  });
});
