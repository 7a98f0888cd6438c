// The owner's overview in Chromium at laptop and phone size, on the demo shop's invented history:
// root causes as a chart with its table, the period and the category changed (the URL follows and
// the back button goes back), and the CSV downloaded with exactly the rows shown. A lead reads the
// same page. The build keeps the chart library in the overview's own chunk, out of the runner's.
// Screenshots: tests/screenshots/overview-*.png.
import { readdirSync, readFileSync } from "node:fs";
import { pathToFileURL } from "node:url";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { LAPTOP, launchBrowser, PHONE, screenshotPath, signInAs } from "../support/browser";

const baseUrl = inject("baseUrl");
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

async function owner(size: "laptop" | "phone") {
  const context = await browser.newContext(
    size === "laptop"
      ? { viewport: LAPTOP, acceptDownloads: true }
      : { viewport: PHONE, deviceScaleFactor: 2, hasTouch: true, isMobile: true, acceptDownloads: true },
  );
  const page = await context.newPage();
  await signInAs(page, baseUrl, "owner@tinderbox.example");
  await page.waitForURL(`${baseUrl}/overview`);
  return { context, page };
}

const rootCauses = (page: Page) => page.getByRole("region", { name: "Most common root causes", exact: true });

/** The root-cause table's rows as the page shows them: [cause, runs, share]. */
async function causeRows(page: Page): Promise<string[][]> {
  const table = rootCauses(page).getByRole("table");
  await table.waitFor();
  return table
    .locator("tbody tr")
    .evaluateAll((trs) => trs.map((tr) => [...tr.querySelectorAll("th, td")].map((c) => c.textContent?.trim() ?? "")));
}

describe("the owner's overview", () => {
  for (const size of ["laptop", "phone"] as const) {
    it(`at ${size} size: root causes as a chart and a table; period and category change; the CSV has the rows shown`, async () => {
      const { context, page } = await owner(size);
      const section = rootCauses(page);
      await section.getByRole("heading", { name: "Most common root causes" }).waitFor();
      // The chart is an image with a label that points to its table; the table carries the figures.
      await section.getByRole("img", { name: /Bar chart of runs per root cause/ }).waitFor();
      const first = await causeRows(page);
      expect(first.length).toBeGreaterThan(2);
      expect(first[0]![1]).toMatch(/^\d+$/);
      expect(first[0]![2]).toMatch(/^\d+\.\d %$/);
      await page.getByText("How it is counted.").waitFor();
      await page.screenshot({ path: screenshotPath(`overview-${size}`), fullPage: false });
      await section.screenshot({ path: screenshotPath(`overview-${size}-root-causes`) });

      // The period: a year instead of 90 days (applied on change; the URL says so).
      await page.getByText("Last 365 days").click();
      await page.waitForURL(/period=365/);
      const year = await causeRows(page);
      const total = (rows: string[][]) => rows.reduce((s, r) => s + Number(r[1]), 0);
      expect(total(year)).toBeGreaterThanOrEqual(total(first));

      // The category: rotisseries only. A griddle's root cause leaves the table.
      expect(year.map((r) => r[0])).toContain("Section thermostat not closing");
      await page.getByLabel("Equipment category").selectOption("rotisserie");
      await page.waitForURL(/category=rotisserie/);
      await page.waitForFunction(() => !document.body.textContent?.includes("Section thermostat not closing"));
      const rotisserie = await causeRows(page);
      expect(rotisserie.length).toBeGreaterThan(0);
      expect(rotisserie.map((r) => r[0])).not.toContain("Section thermostat not closing");
      await page.screenshot({ path: screenshotPath(`overview-${size}-rotisserie`), fullPage: size === "laptop" });

      // The CSV: exactly the rows of the table, same filters.
      const [download] = await Promise.all([
        page.waitForEvent("download"),
        section.getByRole("link", { name: "Download CSV: Most common root causes" }).click(),
      ]);
      expect(download.suggestedFilename()).toMatch(/^root-causes_\d{4}-\d{2}-\d{2}_\d{4}-\d{2}-\d{2}\.csv$/);
      const csv = readFileSync((await download.path())!, "utf8").replace(/^\uFEFF/, "");
      const lines = csv.trimEnd().split("\r\n");
      expect(lines[0]).toBe("Root cause,Runs,Share");
      expect(lines.slice(1)).toEqual(rotisserie.map((r) => r.map((c) => (/[",]/.test(c) ? `"${c.replace(/"/g, '""')}"` : c)).join(",")));

      // Back goes to the year without the category.
      await page.goBack();
      await page.waitForURL((u) => u.search.includes("period=365") && !u.search.includes("category"));
      await page.waitForFunction(() => document.body.textContent?.includes("Section thermostat not closing"));
      await context.close();
    });
  }

  it("a lead finds the overview in the navigation and reads it", async () => {
    const context = await browser.newContext({ viewport: LAPTOP });
    const page = await context.newPage();
    await signInAs(page, baseUrl, "lead@tinderbox.example");
    await page.waitForURL(`${baseUrl}/authoring`);
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Overview" }).click();
    await page.waitForURL(`${baseUrl}/overview`);
    await rootCauses(page).getByRole("table").waitFor();
    await context.close();
  });

  it("a technician is refused the overview and its CSV", async () => {
    const context = await browser.newContext({ viewport: PHONE });
    const page = await context.newPage();
    await signInAs(page, baseUrl, "tech@tinderbox.example");
    await page.waitForURL(`${baseUrl}/calls`);
    expect((await page.goto(`${baseUrl}/overview`))?.status()).toBe(403);
    expect((await page.goto(`${baseUrl}/api/insights/csv/root-causes`))?.status()).toBe(403);
    await context.close();
  });
});

describe("the build keeps the chart library on the overview", () => {
  it("only the overview route's chunk holds visx, and the runner loads none of it", async () => {
    const dir = process.env.BUILD_DIR ?? "build";
    const assets = `${dir}/client/assets`;
    const js = readdirSync(assets).filter((f) => f.endsWith(".js"));
    // visx marks what it draws with these class names.
    const holders = js.filter((f) => /visx-(bar|axis)/.test(readFileSync(`${assets}/${f}`, "utf8")));
    expect(holders.length).toBeGreaterThan(0);
    const build = (await import(pathToFileURL(`${dir}/server/index.js`).href)) as {
      assets: { routes: Record<string, { module: string; imports?: string[] }> };
    };
    const routes = Object.entries(build.assets.routes);
    const loads = (id: string) => {
      const r = build.assets.routes[id]!;
      return [r.module, ...(r.imports ?? [])];
    };
    for (const h of holders) {
      const users = routes.filter(([, r]) => [r.module, ...(r.imports ?? [])].some((f) => f.endsWith(h))).map(([id]) => id);
      expect(users, h).toEqual(["routes/overview"]);
    }
    expect(loads("routes/runs.$runId").some((f) => holders.some((h) => f.endsWith(h)))).toBe(false);
  });
});
