import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { DEMO_USERS } from "../../db/demo";
import { HOME_PATH } from "../../app/lib/roles";
import { LAPTOP, launchBrowser, PHONE, screenshotPath, signInAs } from "../support/browser";

const baseUrl = inject("baseUrl");
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

const HEADINGS = { technician: "My calls", lead: "Authoring", trainer: "Training", owner: "Overview" } as const;

describe("each demo role lands on its own home (phone 390×844)", () => {
  for (const user of DEMO_USERS.filter((u) => u.shop === "demo")) {
    it(`${user.role} signs in and sees the ${HEADINGS[user.role]} home`, async () => {
      const context = await browser.newContext({ viewport: PHONE, deviceScaleFactor: 2, hasTouch: true, isMobile: true });
      const page = await context.newPage();
      await signInAs(page, baseUrl, user.email);
      await page.waitForURL(`${baseUrl}${HOME_PATH[user.role]}`);
      // The URL can change before the new page has rendered: wait for its heading.
      await page.getByRole("heading", { level: 1, name: HEADINGS[user.role], exact: true }).waitFor();
      const nav = page.getByRole("navigation", { name: "Main" });
      await expect(nav.getByRole("link", { name: HEADINGS[user.role] }).isVisible()).resolves.toBe(true);
      await page.screenshot({ path: screenshotPath(`home-${user.role}-phone`), fullPage: true });
      await context.close();
    });
  }

  it("the owner's overview at laptop size shows real counts from the database", async () => {
    const context = await browser.newContext({ viewport: LAPTOP });
    const page = await context.newPage();
    await signInAs(page, baseUrl, "owner@tinderbox.example");
    await page.waitForURL(`${baseUrl}/overview`);
    // The demo seed's invented history: completed runs counted from the summary rows.
    const done = page.locator("dt", { hasText: "Runs with a root cause" }).locator("xpath=following-sibling::dd").first();
    await expect(done.textContent()).resolves.toMatch(/^[1-9]\d*$/);
    await page.screenshot({ path: screenshotPath("home-owner-laptop"), fullPage: true });
    await context.close();
  });
});

describe("sign-in page", () => {
  it("a wrong password shows one message and keeps the e-mail typed", async () => {
    const context = await browser.newContext({ viewport: PHONE });
    const page = await context.newPage();
    await signInAs(page, baseUrl, "tech@tinderbox.example", "definitely wrong");
    await page.getByRole("alert").waitFor();
    await expect(page.getByRole("alert").textContent()).resolves.toMatch(/don't match an account/);
    await expect(page.getByLabel("Email").inputValue()).resolves.toBe("tech@tinderbox.example");
    await page.screenshot({ path: screenshotPath("login-error-phone") });
    await context.close();
  });

  it("an empty form gets an error beside each field", async () => {
    const context = await browser.newContext({ viewport: PHONE });
    const page = await context.newPage();
    await page.goto(`${baseUrl}/login`);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByText("Enter your e-mail address.").waitFor();
    await expect(page.getByText("Enter your password.").isVisible()).resolves.toBe(true);
    await context.close();
  });
});
