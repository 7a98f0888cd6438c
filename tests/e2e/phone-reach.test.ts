// A gloved finger and a keyboard on the phone (issue 17, items 3, 9 and 13): every control on the
// technician's pages is at least 44 × 44 CSS px, the bottom bar fits 390 px for every role with
// the rest of the pages behind "More", and a skip link leads past the navigation. Screenshots go
// to tests/screenshots/a11y-*.png.
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { stableId } from "../../db/seed";
import { navFor } from "../../app/lib/roles";
import { smallTargets } from "../support/a11y";
import { launchBrowser, PHONE, screenshotPath } from "../support/browser";
import { openAs, visit } from "../support/role-pages";

const baseUrl = inject("baseUrl");
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

describe("touch targets on the technician's pages (390 × 844)", () => {
  it("every link and button on the calls list, a call, its unit and site and the tree library is at least 44 × 44 px", async () => {
    const { context, page } = await openAs(browser, baseUrl, "technician", "phone");
    const pages: [string, RegExp | string][] = [
      ["/calls", "My calls"],
      [`/calls/${stableId("call:larkspur-uneven")}`, /^Call 1041/],
      [`/equipment/${stableId("unit:larkspur-rotisserie")}`, /Vantor RCF-2208/],
      [`/sites/${stableId("site:larkspur-deli")}`, /Deli counter/],
      ["/trees", "Trees"],
    ];
    for (const [path, heading] of pages) {
      await visit(page, baseUrl, path, heading);
      expect(await smallTargets(page), path).toEqual([]);
    }
    // The unit's nameplate reads as the tree names it, not by its internal key.
    await visit(page, baseUrl, `/equipment/${stableId("unit:larkspur-rotisserie")}`, /Vantor RCF-2208/);
    const plate = page.getByRole("region", { name: "Nameplate" });
    await plate.getByText("Rated capacitance of the slow fan's run capacitor").waitFor();
    await expect(plate.textContent()).resolves.not.toMatch(/rated_uf|fanCapacitor/);
    await page.screenshot({ path: screenshotPath("a11y-unit-phone"), fullPage: true });
    await context.close();
  });
});

describe("the phone's bottom bar", () => {
  for (const role of ["owner", "lead", "technician", "trainer"] as const)
    it(`fits 390 px for the ${role}, with every page reachable`, async () => {
      const { context, page } = await openAs(browser, baseUrl, role, "phone");
      const nav = page.getByRole("navigation", { name: "Main" });
      await nav.waitFor();
      await page.waitForLoadState("networkidle");
      const widths = await page.evaluate(() => ({
        page: document.documentElement.scrollWidth,
        bar: document.querySelector('nav[aria-label="Main"] ul')!.scrollWidth,
        window: window.innerWidth,
      }));
      expect(widths.page).toBeLessThanOrEqual(widths.window);
      expect(widths.bar).toBeLessThanOrEqual(widths.window);
      // Every visible tab lies wholly on screen.
      for (const box of await nav
        .locator("li")
        .evaluateAll((els) =>
          els.filter((e) => e.getBoundingClientRect().width > 0).map((e) => e.getBoundingClientRect().toJSON() as DOMRect),
        )) {
        expect(box.left).toBeGreaterThanOrEqual(0);
        expect(box.right).toBeLessThanOrEqual(PHONE.width);
      }
      const entries = navFor(role);
      const more = nav.getByText("More", { exact: false });
      if (entries.length > 4) {
        await nav.locator("summary").click();
        await page.screenshot({ path: screenshotPath(`a11y-nav-${role}-more-phone`) });
        const last = entries.at(-1)!;
        await nav.getByRole("link", { name: last.label }).click();
        await page.waitForURL(`${baseUrl}${last.to}`);
        // The menu closes on the new page, and its tab now names where the user is.
        await expect(nav.locator("details").evaluate((d) => (d as HTMLDetailsElement).open)).resolves.toBe(false);
        await expect(nav.locator("summary").textContent()).resolves.toContain(last.label);
        await page.screenshot({ path: screenshotPath(`a11y-nav-${role}-in-more-phone`) });
      } else {
        await expect(more.count()).resolves.toBe(0);
        for (const e of entries) await expect(nav.getByRole("link", { name: e.label }).isVisible()).resolves.toBe(true);
      }
      expect(await smallTargets(page)).toEqual([]);
      await context.close();
    });

  it("a keyboard user skips the navigation with the first Tab, and Escape closes the More menu", async () => {
    const { context, page } = await openAs(browser, baseUrl, "owner", "phone");
    await page.getByRole("navigation", { name: "Main" }).waitFor();
    await page.waitForLoadState("networkidle");
    await page.keyboard.press("Tab");
    const skip = page.getByRole("link", { name: "Skip to the page's content" });
    await expect(skip.evaluate((el) => el === document.activeElement)).resolves.toBe(true);
    const box = (await skip.boundingBox())!;
    expect(Math.min(box.width, box.height)).toBeGreaterThanOrEqual(44);
    await page.screenshot({ path: screenshotPath("a11y-skip-link-phone") });
    await page.keyboard.press("Enter");
    await expect(page.evaluate(() => document.activeElement?.id)).resolves.toBe("main");
    const summary = page.getByRole("navigation", { name: "Main" }).locator("summary");
    await summary.focus();
    await page.keyboard.press("Enter");
    await expect(page.locator("nav details").evaluate((d) => (d as HTMLDetailsElement).open)).resolves.toBe(true);
    await page.keyboard.press("Escape");
    await expect(page.locator("nav details").evaluate((d) => (d as HTMLDetailsElement).open)).resolves.toBe(false);
    await expect(summary.evaluate((el) => el === document.activeElement)).resolves.toBe(true);
    await context.close();
  });
});
