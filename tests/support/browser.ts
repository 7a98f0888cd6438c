// Debian's Chromium driven by playwright-core (never a downloaded browser).
import { mkdirSync } from "node:fs";
import { chromium, type Browser, type Page } from "playwright-core";
import { DEMO_PASSWORD } from "../../db/demo";

export const PHONE = { width: 390, height: 844 };
export const LAPTOP = { width: 1366, height: 900 };

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--no-first-run",
      "--disable-quic",
    ],
  });
}

export async function signInAs(page: Page, baseUrl: string, email: string, password = DEMO_PASSWORD) {
  await page.goto(`${baseUrl}/login`);
  await page.getByLabel("Email").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

export function screenshotPath(name: string): string {
  mkdirSync("tests/screenshots", { recursive: true });
  return `tests/screenshots/${name}.png`;
}
