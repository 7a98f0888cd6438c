// Accounts in the browser (issue 16, and issue 17 item 18): the owner invites a new technician, who
// joins and is signed in; later they forget their password, ask for a link, find it in the local
// mail catcher, set a new password and are signed in — the old password no longer works. Their
// account page on a phone lists their sessions and ends another one; the owner changes their role
// and turns their access off on a laptop. Screenshots go to tests/screenshots/accounts-*.png.
// Sources: OWASP Forgot Password Cheat Sheet (same answer for every e-mail, single-use link);
// WCAG 2.2 SC 3.3.1 and 4.1.3 (errors identified and brought to the user's attention).
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { LAPTOP, launchBrowser, PHONE, screenshotPath, signInAs } from "../support/browser";

const baseUrl = inject("baseUrl");
let browser: Browser;
let owner: BrowserContext;
let phone: BrowserContext;
const email = `new-tech-${crypto.randomUUID().slice(0, 6)}@tinderbox.example`;
const firstPassword = "copper kettle meadow";
const newPassword = "lantern harbour gravel";

beforeAll(async () => {
  browser = await launchBrowser();
  owner = await browser.newContext({ viewport: LAPTOP });
  phone = await browser.newContext({ viewport: PHONE, deviceScaleFactor: 2, hasTouch: true, isMobile: true, userAgent: ANDROID_CHROME });
});
afterAll(() => browser?.close());

// The phone says what it is, as a real one would (Chrome's User-Agent on Android, its published form).
const ANDROID_CHROME =
  "Mozilla/5.0 (Linux; Android 14; Pixel 8) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/140.0.0.0 Mobile Safari/537.36";

const shoot = (page: Page, name: string, fullPage = true) => page.screenshot({ path: screenshotPath(`accounts-${name}`), fullPage });

/** The reset link the local mail catcher received for `to`, waiting for it to arrive. */
async function resetLinkFor(to: string): Promise<string> {
  const dir = process.env.MAIL_CAPTURE_DIR;
  if (!dir) throw new Error("the browser tests need MAIL_CAPTURE_DIR (the SMTP catcher's folder)");
  for (let i = 0; i < 100; i++) {
    const mails = readdirSync(dir)
      .filter((f) => f.endsWith(".json"))
      .map((f) => JSON.parse(readFileSync(join(dir, f), "utf8")) as { to: string[]; subject: string; text: string })
      .filter((m) => m.to.includes(to) && m.subject === "Set a new password for Cluepath");
    const link = mails[0]?.text.match(/https?:\/\/\S+\/reset-password\/[A-Za-z0-9_-]+/)?.[0];
    if (link) return link;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`no reset mail for ${to}`);
}

/** Which field has focus, by its label (what a screen reader announces first). */
const focusedLabel = (page: Page) =>
  page.evaluate(() => {
    const el = document.activeElement as HTMLInputElement | null;
    return el?.labels?.[0]?.textContent ?? el?.tagName ?? "";
  });

describe("a technician looks after their own access", () => {
  it("the owner invites them; they join on a phone and are signed in at once", async () => {
    const page = await owner.newPage();
    await signInAs(page, baseUrl, "owner@tinderbox.example");
    await page.waitForURL(`${baseUrl}/overview`);
    await page.goto(`${baseUrl}/people`);
    await page.getByLabel("Email").fill(email);
    await page.getByRole("button", { name: "Invite" }).click();
    const invitation = await page.getByLabel("Invitation link").inputValue();

    const tech = await phone.newPage();
    await tech.goto(invitation);
    // The invited address is shown, and a password manager sees it as the username.
    await expect(tech.getByLabel("Email").inputValue()).resolves.toBe(email);
    await expect(tech.getByLabel("Email").getAttribute("autocomplete")).resolves.toBe("username");
    // An empty form: both errors at once, and focus on the first, so it is announced.
    await tech.getByRole("button", { name: "Join the shop" }).click();
    await tech.getByText("Enter your name as customers should see it on reports.").waitFor();
    await expect(tech.getByText(/Use at least 8 characters/).isVisible()).resolves.toBe(true);
    await expect.poll(() => focusedLabel(tech)).toBe("Your name");
    await shoot(tech, "invite-errors-phone");
    await tech.getByLabel("Your name").fill("Wren Halloway");
    await tech.getByLabel("Choose a password").fill(firstPassword);
    await tech.getByRole("button", { name: "Join the shop" }).click();
    await tech.waitForURL(`${baseUrl}/calls`);
    await tech.getByRole("heading", { level: 1, name: "My calls" }).waitFor();

    // The same link again is not a dead end: it offers sign-in.
    await tech.goto(invitation);
    await tech.getByRole("heading", { name: "This invitation can't be used" }).waitFor();
    await expect(tech.getByRole("link", { name: "Sign in" }).isVisible()).resolves.toBe(true);
    await page.close();
    await tech.close();
  });

  it("they forget the password, get a link by mail, set a new one and are signed in; the old one stops working", async () => {
    const out = await browser.newContext({ viewport: PHONE, deviceScaleFactor: 2, hasTouch: true, isMobile: true });
    const page = await out.newPage();
    await page.goto(`${baseUrl}/login`);
    await shoot(page, "login-forgot-link-phone", false);
    await page.getByRole("link", { name: "Forgot your password?" }).click();
    await page.waitForURL(`${baseUrl}/forgot-password`);
    await page.getByLabel("Email").fill(email);
    await page.getByRole("button", { name: "Send me a link" }).click();
    await page.getByRole("status").getByText("Check your e-mail.").waitFor();
    await expect(page.getByRole("status").textContent()).resolves.toContain(`If ${email} belongs to a Cluepath account`);
    await shoot(page, "reset-requested-phone");

    const link = await resetLinkFor(email);
    expect(link.startsWith(baseUrl)).toBe(true);
    await page.goto(link);
    await page.getByRole("heading", { name: "Set a new password" }).waitFor();
    await page.getByLabel("New password").fill("password1");
    await page.getByRole("button", { name: "Save and sign in" }).click();
    await page.getByText("That password is on the list of commonly used passwords. Choose another.").waitFor();
    await expect.poll(() => focusedLabel(page)).toBe("New password");
    await shoot(page, "reset-form-error-phone");
    await page.getByLabel("New password").fill(newPassword);
    await page.getByRole("button", { name: "Save and sign in" }).click();
    await page.waitForURL(`${baseUrl}/calls`);
    await page.getByRole("heading", { level: 1, name: "My calls" }).waitFor();

    // The link worked once.
    await page.goto(link);
    await page.getByRole("heading", { name: "This link can't be used" }).waitFor();
    await page.goto(`${baseUrl}/calls`);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL(/\/login\?signedOut=1/);

    // The phone that joined earlier was signed out by the reset.
    const earlier = await phone.newPage();
    await earlier.goto(`${baseUrl}/calls`);
    await earlier.waitForURL(/\/login/);
    // The old password no longer works; the new one does.
    await signInAs(earlier, baseUrl, email, firstPassword);
    await earlier
      .getByRole("alert")
      .getByText(/don't match an account/)
      .waitFor();
    await signInAs(earlier, baseUrl, email, newPassword);
    await earlier.waitForURL(`${baseUrl}/calls`);
    await earlier.close();
    await out.close();
  });

  it("on a phone, the account page lists their sessions and signs another one out", async () => {
    const laptop = await browser.newContext({ viewport: LAPTOP });
    const other = await laptop.newPage();
    await signInAs(other, baseUrl, email, newPassword);
    await other.waitForURL(`${baseUrl}/calls`);

    const page = await phone.newPage();
    await page.goto(`${baseUrl}/calls`);
    // On a phone the account is an occasional page: it sits under the bar's "More".
    const nav = page.getByRole("navigation", { name: "Main" });
    await nav.locator("summary").click();
    await nav.getByRole("link", { name: "Account" }).click();
    await page.waitForURL(`${baseUrl}/account`);
    await page.getByRole("heading", { level: 1, name: "Your account" }).waitFor();
    const sessions = page.getByRole("region", { name: "Where you are signed in" }).getByRole("listitem");
    await expect(sessions.count()).resolves.toBe(2);
    await expect(sessions.first().textContent()).resolves.toContain("This device");
    await expect(sessions.first().textContent()).resolves.toContain("Chrome on Android phone");
    await expect(sessions.nth(1).textContent()).resolves.toContain("Chrome on Linux");
    await expect(sessions.nth(1).textContent()).resolves.toMatch(/Last seen .+ · from 127\.0\.0\.1/);
    // Nothing on the page is wider than the phone.
    await expect(page.evaluate(() => document.documentElement.scrollWidth)).resolves.toBeLessThanOrEqual(PHONE.width);
    await shoot(page, "account-phone");

    await sessions
      .nth(1)
      .getByRole("button", { name: /^Sign out of this one/ })
      .click();
    await page.getByRole("status").getByText("That session is signed out.").waitFor();
    // The notice shows with the action's answer; the list follows when the page's data is reloaded.
    await expect.poll(() => sessions.count()).toBe(1);
    await shoot(page, "account-after-sign-out-phone");
    await other.goto(`${baseUrl}/calls`);
    await other.waitForURL(/\/login/);
    await page.close();
    await laptop.close();
  });

  it("on a laptop, the owner changes their role, then turns their access off and back on", async () => {
    const page = await owner.newPage();
    await page.goto(`${baseUrl}/people`);
    const card = page.getByRole("listitem").filter({ hasText: email });
    await card.getByLabel("Role of Wren Halloway").selectOption("lead");
    await card.getByRole("button", { name: "Change role" }).click();
    await page.getByRole("status").getByText("Wren Halloway is now Lead tech.").waitFor();

    await card.getByRole("button", { name: "Turn off access…" }).click();
    // Focus moves to the answer as the question opens (a render later).
    await expect.poll(() => page.evaluate(() => document.activeElement?.textContent)).toBe("Turn off access");
    await shoot(page, "people-confirm-laptop");
    await card.getByRole("button", { name: "Turn off access", exact: true }).click();
    await page
      .getByRole("status")
      .getByText("Wren Halloway's access is off and was signed out (1 session). Their runs and reports stay.")
      .waitFor();
    await card.getByText("Access off").waitFor();
    await shoot(page, "people-owner-laptop");

    // Signed out at once, and sign-in says why.
    const tech = await phone.newPage();
    await tech.goto(`${baseUrl}/calls`);
    await tech.waitForURL(/\/login/);
    await signInAs(tech, baseUrl, email, newPassword);
    await tech
      .getByRole("alert")
      .getByText(/turned off your access/)
      .waitFor();
    await shoot(tech, "login-access-off-phone", false);

    // The last owner cannot step down: the page says why.
    const me = page.getByRole("listitem").filter({ hasText: "owner@tinderbox.example" });
    await me.getByRole("combobox").selectOption("lead");
    await me.getByRole("button", { name: "Change role" }).click();
    await page
      .getByRole("alert")
      .getByText(/only owner/)
      .waitFor();

    await card.getByRole("button", { name: "Turn access back on" }).click();
    await page
      .getByRole("status")
      .getByText(/Wren Halloway's access is back on/)
      .waitFor();
    await signInAs(tech, baseUrl, email, newPassword);
    await tech.waitForURL(`${baseUrl}/authoring`);
    await tech.close();
    await page.close();
  });
});
