// Signed-in pages of the demo shop for the accessibility and phone-reach browser tests: a context
// per role at phone or laptop size, and a visit that waits until the page has hydrated.
import type { Browser, BrowserContext, Page } from "playwright-core";
import { HOME_PATH, type Role } from "../../app/lib/roles";
import { LAPTOP, PHONE, signInAs } from "./browser";

const EMAIL: Record<Role, string> = {
  technician: "tech@tinderbox.example",
  lead: "lead@tinderbox.example",
  trainer: "trainer@tinderbox.example",
  owner: "owner@tinderbox.example",
};

/** A new context at that size, signed in as the demo shop's user of that role (none: signed out). */
export async function openAs(
  browser: Browser,
  baseUrl: string,
  role: Role | null,
  size: "phone" | "laptop",
): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext(
    size === "phone" ? { viewport: PHONE, deviceScaleFactor: 2, hasTouch: true, isMobile: true } : { viewport: LAPTOP },
  );
  const page = await context.newPage();
  if (role) {
    await signInAs(page, baseUrl, EMAIL[role]);
    await page.waitForURL(`${baseUrl}${HOME_PATH[role]}`);
  }
  return { context, page };
}

/** Opens the page and waits for its heading and for its scripts to have run (what a user meets, not the first HTML). */
export async function visit(page: Page, baseUrl: string, path: string, heading: RegExp | string) {
  await page.goto(`${baseUrl}${path}`);
  await page.getByRole("heading", { level: 1, name: heading }).first().waitFor();
  await page.waitForLoadState("networkidle");
}
