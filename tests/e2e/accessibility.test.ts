// Accessibility of the pages every role starts from (issue 17, items 3 and 13): axe-core finds no
// serious or critical violation at phone and laptop size. Touch targets, the phone's bottom bar and
// the skip link: tests/e2e/phone-reach.test.ts. Screenshots go to tests/screenshots/a11y-*.png.
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, inject, it } from "vitest";
import { stableId } from "../../db/seed";
import type { Role } from "../../app/lib/roles";
import { expectNoSeriousViolations } from "../support/a11y";
import { launchBrowser, screenshotPath } from "../support/browser";
import { openAs, visit } from "../support/role-pages";

const baseUrl = inject("baseUrl");
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

const SIZES = ["phone", "laptop"] as const;

describe("axe-core: no serious or critical violations", () => {
  const PAGES: { name: string; role: Role | null; path: string; heading: RegExp | string }[] = [
    { name: "sign-in", role: null, path: "/login", heading: /Sign in/ },
    { name: "my-calls", role: "technician", path: "/calls", heading: "My calls" },
    { name: "a-call", role: "technician", path: `/calls/${stableId("call:larkspur-uneven")}`, heading: /^Call 1041/ },
    { name: "tree-library", role: "technician", path: "/trees", heading: "Trees" },
    { name: "owner-home", role: "owner", path: "/overview", heading: /Overview/ },
    { name: "trainer-home", role: "trainer", path: "/training", heading: /Training/ },
  ];
  for (const size of SIZES)
    for (const p of PAGES)
      it(`${p.name} (${size})`, async () => {
        const { context, page } = await openAs(browser, baseUrl, p.role, size);
        await visit(page, baseUrl, p.path, p.heading);
        await expectNoSeriousViolations(page, `${p.path} at ${size} size`);
        await page.screenshot({ path: screenshotPath(`a11y-${p.name}-${size}`), fullPage: true });
        await context.close();
      });
});
