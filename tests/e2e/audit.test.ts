// The owner's audit trail page in Chromium, at phone and laptop size: the owner's nav leads there,
// the entries read in plain words, a filter narrows them, and other roles are told it isn't theirs.
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { LAPTOP, launchBrowser, PHONE, screenshotPath, signInAs } from "../support/browser";

const baseUrl = inject("baseUrl");
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

describe("/audit", () => {
  for (const [size, viewport] of [
    ["phone", PHONE],
    ["laptop", LAPTOP],
  ] as const) {
    it(`the owner reaches it from the navigation and filters it (${size})`, async () => {
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      await signInAs(page, baseUrl, "owner@tinderbox.example");
      await page.waitForURL(/\/overview$/);
      const nav = page.getByRole("navigation", { name: "Main" });
      // On a phone the bar keeps four places; the audit trail sits under its "More".
      if (size === "phone") await nav.locator("summary").click();
      await nav.getByRole("link", { name: "Audit" }).click();
      await page.getByRole("heading", { level: 1, name: "Audit trail" }).waitFor();
      // This sign-in is there with its address (other browser tests sign in to the demo shop meanwhile).
      const mine = page
        .getByRole("list", { name: "Entries, newest first" })
        .getByRole("listitem")
        .filter({ hasText: "owner@tinderbox.example signed in" })
        .first();
      await expect(mine.textContent()).resolves.toMatch(
        /owner@tinderbox\.example signed in.*Signed in · Maren Holt · from (127\.0\.0\.1|::1|::ffff:127\.0\.0\.1)/,
      );
      await page.screenshot({ path: screenshotPath(`audit-${size}`), fullPage: true });
      await page.getByLabel("What").selectOption("sign-in.refused");
      await page.getByRole("button", { name: "Show" }).click();
      await page.waitForURL(/action=sign-in\.refused/);
      const items = await page
        .getByRole("list", { name: "Entries, newest first" })
        .getByRole("listitem")
        .allTextContents()
        .catch(() => []);
      for (const text of items) expect(text).toContain("Sign-in refused");

      // A range that ends before it starts: said beside "To", both days kept, every day shown.
      await page.getByLabel("What").selectOption("");
      await page.getByLabel("From").fill("2026-12-10");
      await page.getByLabel("To").fill("2026-12-01");
      await page.getByRole("button", { name: "Show" }).click();
      await page.waitForURL(/to=2026-12-01/);
      await page.getByText("The last day comes before the first day; showing every day.").waitFor();
      await expect(page.getByLabel("From").inputValue()).resolves.toBe("2026-12-10");
      await expect(page.getByLabel("To").inputValue()).resolves.toBe("2026-12-01");
      await expect(page.getByRole("list", { name: "Entries, newest first" }).getByRole("listitem").count()).resolves.toBeGreaterThan(0);
      await page.screenshot({ path: screenshotPath(`audit-reversed-range-${size}`), fullPage: true });
      await context.close();
    });
  }

  it("a lead is told it is the owner's", async () => {
    const context = await browser.newContext({ viewport: PHONE });
    const page = await context.newPage();
    await signInAs(page, baseUrl, "lead@tinderbox.example");
    await page.waitForURL((u) => !u.pathname.startsWith("/login"));
    const res = await page.goto(`${baseUrl}/audit`);
    expect(res?.status()).toBe(403);
    await page.getByText("The audit trail is for the shop's owner.").waitFor();
    await context.close();
  });
});
