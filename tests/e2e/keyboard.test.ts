// The keyboard alone (issue 17, "Done when"): a lead builds and publishes a small tree, and a
// technician walks a run on it to the report, with Tab, Shift+Tab, arrow keys, Home, Enter and
// typing only — every page counts pointer, mouse and touch events and must see none. Then the
// run a lead takes over: the technician's list says so, and the hand-over list counts the steps
// as the runner does (a step taken back is not counted). Screenshots: tests/screenshots/keyboard-*.png.
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { DEMO_PASSWORD } from "../../db/demo";
import { stableId } from "../../db/seed";
import { expectNoSeriousViolations } from "../support/a11y";
import { LAPTOP, launchBrowser, screenshotPath, signInAs } from "../support/browser";
import { arrowTo, choose, countPointerEvents, pointerEvents, signInByKeyboard, tabTo } from "../support/keyboard";

const baseUrl = inject("baseUrl");
const title = `Display case heat lamp stays dark ${Date.now().toString(36)}`;
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

/** A laptop-sized context whose pages count pointer events. */
async function keyboardContext(): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport: LAPTOP });
  await countPointerEvents(context);
  return { context, page: await context.newPage() };
}

const shot = (page: Page, name: string) => page.screenshot({ path: screenshotPath(`keyboard-${name}`) });

describe("the keyboard alone", () => {
  it("a lead builds a caution → question → two outcomes tree and publishes it", async () => {
    const { context, page } = await keyboardContext();
    await signInByKeyboard(page, baseUrl, "lead@tinderbox.example", DEMO_PASSWORD);
    await tabTo(page, /^New tree$/);
    await page.keyboard.press("Enter");
    await page.waitForURL(`${baseUrl}/trees/new`);
    await tabTo(page, /^Title/);
    await page.keyboard.type(title);
    await tabTo(page, /^Equipment category/);
    await choose(page, /^Hot holding$/);
    await tabTo(page, /^Symptom/);
    await page.keyboard.type("The heat lamp over the display shelf stays dark");
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/trees\/[0-9a-f-]{36}\/edit$/);
    await page
      .getByText(/no nodes yet/)
      .first()
      .waitFor({ timeout: 15_000 });

    // A caution: added from the palette, focus lands in its title with the default selected.
    await tabTo(page, /^.?Add Caution/);
    await page.keyboard.press("Enter");
    await expect.poll(() => page.evaluate(() => (document.activeElement as HTMLInputElement).labels?.[0]?.textContent)).toBe("The caution");
    await page.keyboard.type("Unplug the case before opening the lamp housing");
    await tabTo(page, /^Hazard/);
    await choose(page, /^electrical$/);
    // Its next node: a new question, made only when confirmed.
    await tabTo(page, /^Next, go to/);
    await choose(page, /^New question$/);
    await tabTo(page, /^Make it and connect/);
    await page.keyboard.press("Enter");
    await expect
      .poll(() => page.evaluate(() => (document.activeElement as HTMLSelectElement).labels?.[0]?.textContent))
      .toBe("Next, go to");

    // The question, opened from the outline (one Tab stop; arrows move; Enter opens).
    await tabTo(page, /^Outline$/, { back: true });
    await page.keyboard.press("Enter");
    await tabTo(page, /./, { role: "treeitem" });
    await arrowTo(page, /Question: New question/);
    await page.keyboard.press("Enter");
    await tabTo(page, /^Question to ask/);
    await page.keyboard.press("Control+A");
    await page.keyboard.type("With the case switched on, does the heat lamp light?");
    for (const answer of ["No", "Yes"]) {
      await tabTo(page, /^Answer text/);
      await page.keyboard.type(answer);
      await tabTo(page, /^The new answer leads to/);
      await choose(page, /^New outcome$/);
      await tabTo(page, /^Add answer/);
      await page.keyboard.press("Enter");
    }
    await shot(page, "editor-question");

    // The two outcomes, each opened from the outline.
    for (const [cause, remedy] of [
      ["Failed heat lamp", "Replace the lamp with one of the same wattage and a shatter-resistant coating."],
      ["Failed lamp thermostat", "Replace the thermostat and check the case holds its setting."],
    ] as const) {
      await tabTo(page, /./, { back: true, role: "treeitem" });
      await page.keyboard.press("Home");
      await arrowTo(page, /Outcome: New root cause/);
      await page.keyboard.press("Enter");
      await tabTo(page, /^Root cause/);
      await page.keyboard.press("Control+A");
      await page.keyboard.type(cause);
      await tabTo(page, /^Remedy/);
      await page.keyboard.type(remedy);
    }
    await page.getByRole("region", { name: "Checks" }).getByText("No problems found.").waitFor({ timeout: 15_000 });
    await page.getByText("All changes saved").waitFor({ timeout: 15_000 });
    await shot(page, "editor-ready");

    // Publish, with a change note.
    await tabTo(page, /^Publish…/, { back: true });
    await page.keyboard.press("Enter");
    await expect
      .poll(() => page.evaluate(() => (document.activeElement as HTMLTextAreaElement).labels?.[0]?.textContent))
      .toMatch(/^What changed, and why/);
    await page.keyboard.type("First version: the lamp before the thermostat.");
    await tabTo(page, /^Publish version 1/);
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/trees\/[0-9a-f-]{36}\?published=1$/);
    await page.getByText("Version 1 is published. New runs start on it.").waitFor();
    await shot(page, "published");
    expect(await pointerEvents(page)).toBe(0);
    await context.close();
  });

  let lampCall = "";
  let handOverCall = "";

  it("a technician walks a run on it, from My calls to the report", async () => {
    // The lead opens two calls on the hot-holding case for the technician (setup, by any means).
    const lead = await browser.newContext({ viewport: LAPTOP });
    const lp = await lead.newPage();
    await signInAs(lp, baseUrl, "lead@tinderbox.example");
    await lp.waitForURL(`${baseUrl}/authoring`);
    const newCall = async (symptom: string) => {
      await lp.goto(`${baseUrl}/calls/new`);
      await lp.getByLabel("Unit").selectOption(stableId("unit:larkspur-hotcase"));
      await lp.getByLabel("Reported symptom").fill(symptom);
      await lp.getByLabel("Assigned technician").selectOption(stableId("user:tech@tinderbox.example"));
      await lp.getByRole("button", { name: "Open the call" }).click();
      const heading = lp.getByRole("heading", { level: 1, name: /^Call \d+$/ });
      await heading.waitFor();
      return (await heading.textContent())!.replace("Call ", "");
    };
    lampCall = await newCall("heat lamp stays dark");
    handOverCall = await newCall("heat lamp flickers");
    await lead.close();

    const { context, page } = await keyboardContext();
    await signInByKeyboard(page, baseUrl, "tech@tinderbox.example", DEMO_PASSWORD);
    await tabTo(page, new RegExp(`^Call ${lampCall}(?!\\d)`));
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/calls\/[0-9a-f-]{36}$/);
    await page.getByRole("heading", { level: 1, name: `Call ${lampCall}` }).waitFor();
    // The tree just published is the best match for this hot-holding call.
    await page.getByText("Best match for “heat lamp stays dark”").waitFor();
    await tabTo(page, new RegExp(`^Start this procedure: ${title}`));
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/);

    await page.getByRole("heading", { level: 1, name: "Unplug the case before opening the lamp housing" }).waitFor();
    const ack = page.getByRole("button", { name: /^I have read this and made the work safe/ });
    await expect.poll(() => ack.isEnabled()).toBe(true);
    await tabTo(page, /^I have read this/);
    await page.keyboard.press("Enter");
    await page.getByRole("heading", { level: 1, name: "With the case switched on, does the heat lamp light?" }).waitFor();
    await expect(page.getByRole("button", { name: "Step 2 · 1 done" }).isVisible()).resolves.toBe(true);
    await tabTo(page, /^No$/);
    await shot(page, "run-question");
    await page.keyboard.press("Enter");

    await page.getByRole("heading", { level: 1, name: /^Root cause found/ }).waitFor();
    await tabTo(page, /^Start from the usual remedy/);
    await page.keyboard.press("Enter");
    await tabTo(page, /^Time on the job/);
    await page.keyboard.type("20");
    await tabTo(page, /^Finish and make the report/);
    await page.keyboard.press("Enter");
    await page.getByRole("heading", { level: 1, name: /^Job finished/ }).waitFor();
    await expect(page.getByText("Failed heat lamp").first().isVisible()).resolves.toBe(true);
    await shot(page, "run-finished");
    expect(await pointerEvents(page)).toBe(0);
    await context.close();
  });

  it("a run a lead has taken over says so on the technician's list; the hand-over list counts steps as the runner does", async () => {
    const { context, page } = await keyboardContext();
    await signInByKeyboard(page, baseUrl, "tech@tinderbox.example", DEMO_PASSWORD);
    await tabTo(page, new RegExp(`^Call ${handOverCall}(?!\\d)`));
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/calls\/[0-9a-f-]{36}$/);
    await page.getByRole("heading", { level: 1, name: `Call ${handOverCall}` }).waitFor();
    await tabTo(page, new RegExp(`^Start this procedure: ${title}`));
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/);
    const runUrl = page.url();
    // Acknowledge, take it back, acknowledge again: three rows, one step done.
    for (const again of [false, true]) {
      const ack = page.getByRole("button", { name: /^I have read this and made the work safe/ });
      await ack.waitFor();
      await expect.poll(() => ack.isEnabled()).toBe(true);
      await tabTo(page, /^I have read this/);
      await page.keyboard.press("Enter");
      await page.getByRole("heading", { level: 1, name: "With the case switched on, does the heat lamp light?" }).waitFor();
      if (!again) {
        await tabTo(page, /^↶ Undo$/);
        await page.keyboard.press("Enter");
      }
    }
    await page.getByRole("button", { name: "Step 2 · 1 done" }).waitFor();
    await page.getByRole("status").filter({ hasText: "✓ Saved" }).waitFor({ timeout: 10_000 });
    await tabTo(page, /^More$/);
    await page.keyboard.press("Enter");
    await tabTo(page, /^Ask a lead to take over/);
    await page.keyboard.press("Enter");
    await tabTo(page, /^What should the lead look at\?/, { back: false });
    await page.keyboard.type("The lamp flickers with a new bulb: socket or wiring?");
    await tabTo(page, /^Send to a lead$/);
    await page.keyboard.press("Enter");
    await page.getByText("Waiting for a lead").waitFor();
    expect(await pointerEvents(page)).toBe(0);

    // The lead: the hand-over list counts one step, as the runner did.
    const lead = await browser.newContext({ viewport: LAPTOP });
    const lp = await lead.newPage();
    await signInAs(lp, baseUrl, "lead@tinderbox.example");
    await lp.waitForURL(`${baseUrl}/authoring`);
    await lp.goto(`${baseUrl}/escalations`);
    const item = lp.getByRole("listitem").filter({ hasText: "The lamp flickers with a new bulb" });
    await expect(
      item.getByText(/stopped at “With the case switched on, does the heat lamp light\?” after 1 step$/).isVisible(),
    ).resolves.toBe(true);
    await item.getByRole("button", { name: "Take it over" }).click();
    await lp.waitForURL(runUrl);
    await lead.close();

    // The technician's list and the call say who has it now.
    await page.goto(`${baseUrl}/calls`);
    const card = page.getByRole("link", { name: new RegExp(`^Call ${handOverCall}(?!\\d)`) });
    await expect(card.textContent()).resolves.toContain("Teodor Vance has taken over the run — read it →");
    await expect(card.textContent()).resolves.not.toContain("Carry on");
    await expectNoSeriousViolations(page, "My calls with a run taken over");
    await page.screenshot({ path: screenshotPath("keyboard-taken-over-my-calls"), fullPage: true });
    await card.focus();
    await page.keyboard.press("Enter");
    await page.waitForURL(runUrl);
    await context.close();
  });
});
