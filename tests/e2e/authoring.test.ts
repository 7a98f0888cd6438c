// A lead builds a tree from scratch in the editor (question → measurement → two outcomes), sees a
// validation error, fixes it and publishes; the other tests each get their own published tree
// (the same four nodes, tests/support/trees.ts) from tests/support/fixtures.ts.
// Screenshots of the editor and the outline at laptop and phone size go to tests/screenshots/.
import { readdirSync, readFileSync } from "node:fs";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { expectNoSeriousViolations } from "../support/a11y";
import { LAPTOP, launchBrowser, PHONE, screenshotPath, signInAs } from "../support/browser";
import { publishedTree, tag } from "../support/fixtures";
import { routeAt, serverBuild } from "../support/routes";

const baseUrl = inject("baseUrl");
const newTitle = () => `Fan hums but won't turn ${tag()}`;
let browser: Browser;

/** A published four-node tree of this test's own; with `draft`, an open draft too. */
async function ownTree(draft?: Parameters<typeof publishedTree>[1]) {
  const title = newTitle();
  const { path } = await publishedTree(title, draft);
  return { title, treeUrl: `${baseUrl}${path}` };
}

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

const HOME = {
  "lead@tinderbox.example": "/authoring",
  "owner@tinderbox.example": "/overview",
  "tech@tinderbox.example": "/calls",
} as const;

/** A fresh browser context signed in as a demo user, on their home page. */
async function signedIn(email: keyof typeof HOME, size: "laptop" | "phone" = "laptop") {
  const context = await browser.newContext(
    size === "laptop" ? { viewport: LAPTOP } : { viewport: PHONE, deviceScaleFactor: 2, hasTouch: true, isMobile: true },
  );
  const page = await context.newPage();
  const canvas = canvasRequests(page);
  await signInAs(page, baseUrl, email);
  await page.waitForURL(`${baseUrl}${HOME[email]}`);
  return { context, page, canvas };
}

/** Requests for the canvas chunk (reactflow lives only there). */
function canvasRequests(page: Page): string[] {
  const seen: string[] = [];
  page.on("request", (r) => {
    if (/\/assets\/Canvas-[\w-]+\.js$/.test(r.url())) seen.push(r.url());
  });
  return seen;
}

async function waitForChecks(page: Page, text: RegExp | string) {
  await page.getByRole("region", { name: "Checks" }).getByText(text).first().waitFor({ timeout: 15_000 });
}

describe("authoring a tree in the browser", () => {
  it("a lead builds a four-node tree, sees a validation error, fixes it and publishes", async () => {
    const { context, page, canvas } = await signedIn("lead@tinderbox.example");
    const title = newTitle();

    await page.getByRole("link", { name: "New tree" }).click();
    await page.getByLabel("Title").fill(title);
    await page.getByLabel("Equipment category").selectOption("rotisserie");
    await page.getByLabel("Symptom").fill("The convection fan hums but does not turn");
    await page.getByRole("button", { name: "Create and open the editor" }).click();
    await page.waitForURL(/\/trees\/[0-9a-f-]{36}\/edit$/);
    const treeUrl = page.url().replace(/\/edit$/, "");
    await waitForChecks(page, /no nodes yet/);

    // 1. A question, with an answer that makes a new measurement and one that makes a new outcome.
    // Adding from the palette puts focus in the new node's first field, and says so.
    await page.getByRole("button", { name: "Add question" }).first().click();
    await expect
      .poll(() => page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.labels?.[0]?.textContent))
      .toBe("Question to ask");
    await expect.poll(() => page.locator("#announce-polite").textContent()).toBe("Added a new question, ‘New question’. Its form is open.");
    await page.keyboard.type("Is the run capacitor bulging or leaking?");
    await page.getByLabel("Answer text").fill("no");
    await page.getByLabel("The new answer leads to").selectOption("new:measurement");
    await page.getByRole("button", { name: "Add answer" }).click();
    await page.getByLabel("Answer text").fill("yes");
    await page.getByLabel("The new answer leads to").selectOption("new:outcome");
    await page.getByRole("button", { name: "Add answer" }).click();

    // 2. The measurement, opened from the outline with the keyboard.
    await page.getByRole("button", { name: "Outline", pressed: false }).click();
    const outline = page.getByRole("tree", { name: "Outline of the draft" });
    await outline.getByRole("treeitem").first().focus();
    await page.keyboard.press("ArrowDown");
    await page.keyboard.press("Enter");
    await page.getByLabel("What to measure").fill("Run capacitor against its rating");
    await page.getByLabel("Quantity").selectOption("capacitance");
    await page.getByLabel("Limits").selectOption("nominal");
    await page.getByLabel("Rated value (number)").fill("1.5");
    await page.getByLabel("Above the rated value by").fill("6");
    await page.getByLabel("Below the rated value by").fill("6");
    await page.getByLabel("Sample reading").fill("1.40");
    await page.getByText("1.40 µF → low: below 1.41 µF").waitFor();
    // A "New …" option only asks; the node is made when confirmed.
    const nodesBefore = await outline.getByRole("treeitem").count();
    await page.getByLabel("On a within reading, go to").selectOption("new:outcome");
    await expect(outline.getByRole("treeitem").count()).resolves.toBe(nodesBefore);
    await page.getByRole("button", { name: "Make it and connect" }).click();
    await expect.poll(() => page.getByLabel("On a within reading, go to").evaluate((el) => el === document.activeElement)).toBe(true);
    await page.getByLabel("On a high reading, go to").selectOption("outcome");

    // 3. The low branch is still open: the checks say so in the editor's words, and Publish is held back with the reason.
    await waitForChecks(
      page,
      "Connect the Low branch of the measurement ‘Run capacitor against its rating’ to a node: a low reading has nowhere to go yet.",
    );
    const publish = page.getByRole("button", { name: "Publish…" });
    await expect(publish.isDisabled()).resolves.toBe(true);
    await page.getByText(/Fix the (error|\d+ errors) under Checks first/).waitFor(); // the placeholders of new nodes are errors too (issue 10 item 11)
    await page.screenshot({ path: screenshotPath("editor-outline-error-laptop") });

    // 4. Fix it from the finding's link, and name the two outcomes.
    await page.getByRole("button", { name: "Go to ‘Run capacitor against its rating’" }).click();
    await page.getByLabel("On a low reading, go to").selectOption("outcome");
    await outline
      .getByRole("treeitem", { name: /New root cause/ })
      .first()
      .click();
    await page.getByLabel("Root cause").fill("Failed run capacitor");
    await page.getByLabel("Remedy").fill("Replace it with one of the same µF and an equal or higher voltage rating.");
    await outline
      .getByRole("treeitem", { name: /New root cause/ })
      .first()
      .click();
    await page.getByLabel("Root cause").fill("Failed fan motor");
    await page.getByLabel("Remedy").fill("Replace the fan motor.");
    await waitForChecks(page, "No problems found.");
    await page.getByText("All changes saved").waitFor();
    await page.getByText("Ready to publish as version 1.").waitFor();
    await page.screenshot({ path: screenshotPath("editor-outline-laptop") });

    // The canvas shows the same draft, each new node placed in free space (no box on another).
    await page.getByRole("button", { name: "Canvas", pressed: false }).click();
    await page.locator(".react-flow__node").nth(3).waitFor();
    await expect(page.locator(".react-flow__node").count()).resolves.toBe(4);
    await expect(page.locator(".react-flow__edge").count()).resolves.toBe(5);
    const boxes = await page
      .locator(".react-flow__node")
      .evaluateAll((els) => els.map((e) => e.getBoundingClientRect().toJSON() as DOMRect));
    for (const [i, a] of boxes.entries())
      for (const b of boxes.slice(i + 1))
        expect(a.right <= b.left || b.right <= a.left || a.bottom <= b.top || b.bottom <= a.top, "two boxes overlap").toBe(true);
    await page.screenshot({ path: screenshotPath("editor-canvas-as-placed-laptop") });
    // By keyboard: a box takes focus visibly, Enter opens its form.
    const box = page.locator('.react-flow__node[data-id="measure"]');
    await box.focus();
    await page.keyboard.press("Enter");
    await page.getByLabel("What to measure").waitFor();
    await expect(page.getByLabel("What to measure").inputValue()).resolves.toBe("Run capacitor against its rating");
    await page.locator('.react-flow__node[data-id="question"]').focus();
    await page.keyboard.press("Tab");
    await page.keyboard.press("Shift+Tab");
    await expect(page.locator('.react-flow__node[data-id="question"]').evaluate((el) => getComputedStyle(el).outlineStyle)).resolves.toBe(
      "solid",
    );
    await page.keyboard.press(" ");
    await expect(page.getByLabel("Question to ask").inputValue()).resolves.toBe("Is the run capacitor bulging or leaking?");
    await page.screenshot({ path: screenshotPath("editor-canvas-keyboard-laptop") });
    await page.getByRole("button", { name: "Arrange automatically" }).click();
    await page.waitForTimeout(600);
    await expectNoSeriousViolations(page, "the editor's canvas (laptop)");
    await page.screenshot({ path: screenshotPath("editor-canvas-laptop") });
    expect(canvas.length).toBeGreaterThan(0);

    // 5. Publish with a change note.
    await page.getByText("All changes saved").waitFor();
    await publish.click();
    await page.getByLabel("What changed, and why").fill("First version: capacitor check before condemning the motor.");
    await page.getByRole("button", { name: "Publish version 1" }).click();
    await page.waitForURL(`${treeUrl}?published=1`);
    await page.getByText("Version 1 is published. New runs start on it.").waitFor();
    await page.screenshot({ path: screenshotPath("tree-page-laptop"), fullPage: true });
    await context.close();
  });

  it("a technician finds a published tree in the library and reads it; no page of theirs loads the canvas", async () => {
    const { title } = await ownTree();
    const { context, page, canvas } = await signedIn("tech@tinderbox.example", "phone");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Trees" }).click();
    await page.waitForURL(`${baseUrl}/trees`);
    await page.getByLabel("Search").fill(title);
    await page.getByRole("button", { name: "Show" }).click();
    await page.waitForURL(/\?q=/);
    const list = page.getByRole("list", { name: "Trees" });
    await list.getByRole("link", { name: title }).waitFor();
    await expect(list.getByRole("listitem").count()).resolves.toBe(1);
    await expect(page.getByRole("link", { name: "New tree" }).count()).resolves.toBe(0);
    await page.screenshot({ path: screenshotPath("library-technician-phone"), fullPage: true });
    await list.getByRole("link", { name: title }).click();
    await page.getByText(/New runs start on/).waitFor();
    await page.getByRole("link", { name: "Read version 1" }).click();
    await page.getByRole("heading", { name: /Run capacitor against its rating/ }).waitFor();
    await page.screenshot({ path: screenshotPath("tree-version-technician-phone"), fullPage: true });
    expect(canvas).toEqual([]);
    await context.close();
  });

  it("on a phone the outline is the editing surface (screenshots of the outline and a node form)", async () => {
    const { treeUrl } = await ownTree();
    const { context, page, canvas } = await signedIn("lead@tinderbox.example", "phone");
    await page.goto(treeUrl);
    await page.getByRole("button", { name: "Edit: start a draft from version 1" }).click();
    await page.waitForURL(`${treeUrl}/edit`);
    const outline = page.getByRole("tree", { name: "Outline of the draft" });
    await outline.getByRole("treeitem").nth(4).waitFor();
    await expectNoSeriousViolations(page, "the editor's outline (phone)");
    await page.screenshot({ path: screenshotPath("editor-outline-phone"), fullPage: true });
    // The canvas is not downloaded until the Canvas tab is opened.
    expect(canvas).toEqual([]);
    await outline.getByRole("treeitem", { name: /Run capacitor against its rating/ }).click();
    await page.getByLabel("What to measure").waitFor();
    await page.getByLabel("Sample reading").fill("1.62");
    await page.getByText("1.62 µF → high: above 1.59 µF").waitFor();
    await page.screenshot({ path: screenshotPath("editor-node-phone") });
    // Toggles and zoom buttons a finger can hit (WCAG 2.5.5: 44 × 44 px).
    await page.getByRole("tab", { name: "Outline" }).click();
    const toggles = await outline
      .locator("li > button")
      .evaluateAll((els) => els.map((e) => [e.getBoundingClientRect().width, e.getBoundingClientRect().height]));
    expect(toggles.length).toBeGreaterThan(0);
    for (const [w, h] of toggles) expect(Math.min(w!, h!)).toBeGreaterThanOrEqual(44);
    await page.getByRole("tab", { name: "Canvas" }).click();
    await page.locator(".react-flow__node").first().waitFor();
    const zoom = await page
      .locator(".react-flow__controls-button")
      .evaluateAll((els) => els.map((e) => [e.getBoundingClientRect().width, e.getBoundingClientRect().height]));
    expect(zoom.length).toBeGreaterThan(0);
    for (const [w, h] of zoom) expect(Math.min(w!, h!)).toBeGreaterThanOrEqual(44);
    await page.screenshot({ path: screenshotPath("editor-canvas-phone") });
    expect(canvas.length).toBeGreaterThan(0);
    await context.close();
  });
});

describe("two editors, images and the diff", () => {
  const png = Buffer.from("iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==", "base64");

  it("a stale save from a second editor gets the conflict message, keeps its changes, and can replace theirs on purpose", async () => {
    const { treeUrl } = await ownTree(true);
    const { page: a } = await signedIn("lead@tinderbox.example");
    const { page: b } = await signedIn("owner@tinderbox.example");
    await a.goto(`${treeUrl}/edit`);
    await b.goto(`${treeUrl}/edit`);
    const equipment = "Equipment covered (optional)";
    await b.getByLabel(equipment).fill("Two-fan rotisseries");
    await b.getByText("All changes saved").waitFor();
    await a.getByLabel(equipment).fill("Single-fan rotisseries");
    await a.getByRole("heading", { name: /Maren Holt saved this draft at .*, while you were editing/ }).waitFor({ timeout: 15_000 });
    await a.getByText("Not saved: someone else saved first").waitFor();
    await expect(a.getByLabel(equipment).inputValue()).resolves.toBe("Single-fan rotisseries");
    await a.getByText("What differs between their save and your screen").click();
    const differs = a.getByRole("alert").filter({ hasText: "What differs" });
    await differs.getByText("Two-fan rotisseries").waitFor();
    await differs.getByText("Single-fan rotisseries").waitFor();
    await a.screenshot({ path: screenshotPath("editor-conflict-laptop") });
    // The server still holds the first save.
    const theirs = (await (await a.request.get(`${treeUrl.replace("/trees/", "/api/trees/")}/versions/draft`)).json()) as {
      tree: { equipment?: string };
    };
    expect(theirs.tree.equipment).toBe("Two-fan rotisseries");
    await a.getByRole("button", { name: "Keep mine, replacing theirs" }).click();
    await a.getByText("All changes saved").waitFor();
    const now = (await (await a.request.get(`${treeUrl.replace("/trees/", "/api/trees/")}/versions/draft`)).json()) as {
      tree: { equipment?: string };
    };
    expect(now.tree.equipment).toBe("Single-fan rotisseries");
    await a.context().close();
    await b.context().close();
  });

  it("an image uploaded into a step body shows in the preview, served from the shop's storage", async () => {
    const { treeUrl } = await ownTree(true);
    const { context, page } = await signedIn("lead@tinderbox.example");
    await page.goto(`${treeUrl}/edit`);
    await page.getByRole("button", { name: "Outline", pressed: false }).click();
    await page
      .getByRole("tree", { name: "Outline of the draft" })
      .getByRole("treeitem", { name: /Run capacitor against its rating/ })
      .click();
    await page.getByLabel("Add an image").setInputFiles({ name: "capacitor terminals.png", mimeType: "image/png", buffer: png });
    await page.getByText("Added capacitor terminals.png.", { exact: false }).waitFor();
    await expect(page.getByLabel("Instructions and notes", { exact: true }).inputValue()).resolves.toMatch(
      /^!\[capacitor terminals\]\(\/trees\/[0-9a-f-]+\/images\/[0-9a-f-]+\)\n$/,
    );
    await page.getByRole("button", { name: "Preview" }).click();
    const img = page
      .getByRole("region", { name: "Instructions and notes as the technician sees it" })
      .getByRole("img", { name: "capacitor terminals" });
    await img.waitFor();
    // Loaded through the authorised image route: the 1×1 test image has a natural width of 1.
    await page.waitForFunction(
      (el) => (el as HTMLImageElement).complete && (el as HTMLImageElement).naturalWidth === 1,
      await img.elementHandle(),
      { timeout: 10_000 },
    );
    await page.getByText("All changes saved").waitFor();
    await context.close();
  });

  it("on the canvas a branch is connected by dragging from its handle to a node, and an answer gets its label", async () => {
    const { treeUrl } = await ownTree(true);
    const { context, page } = await signedIn("lead@tinderbox.example");
    await page.goto(`${treeUrl}/edit`);
    await page.locator(".react-flow__node").nth(3).waitFor();
    await page.getByRole("button", { name: "Add step" }).click();
    await page.getByLabel("What to do").fill("Check the fan blade for rubbing");
    await page.getByRole("button", { name: "Arrange automatically" }).click();
    await page.waitForTimeout(500);
    const drag = async (from: string, to: string) => {
      const a = await page.locator(from).boundingBox();
      const b = await page.locator(to).boundingBox();
      if (!a || !b) throw new Error("nothing to drag");
      await page.mouse.move(a.x + a.width / 2, a.y + a.height / 2);
      await page.mouse.down();
      await page.mouse.move(b.x + b.width / 2, b.y + b.height / 2, { steps: 12 });
      await page.mouse.up();
    };
    const target = (id: string) => `.react-flow__node[data-id="${id}"] .react-flow__handle.target`;
    // The fixture's ids (tests/support/trees.ts): question cap-look, outcomes cap-failed and motor-failed.
    await drag('.react-flow__node[data-id="step"] .react-flow__handle[data-handleid="next"]', target("motor-failed"));
    await page.locator('[data-testid="rf__edge-step|next"]').waitFor();
    await drag('.react-flow__node[data-id="cap-look"] .react-flow__handle[data-handleid="add-answer"]', target("step"));
    const form = page.getByRole("form", { name: "New answer" });
    await form.getByLabel("Answer text").fill("can't tell");
    await form.getByRole("button", { name: "Add answer" }).click();
    await page.locator('[data-testid="rf__edge-cap-look|answer:can\'t tell"]').waitFor();
    await page.getByText("All changes saved").waitFor();
    const saved = (await (await page.request.get(`${treeUrl.replace("/trees/", "/api/trees/")}/versions/draft`)).json()) as {
      tree: { nodes: { id: string; next?: { to: string }; answers?: { label: string; to: string }[] }[] };
    };
    expect(saved.tree.nodes.find((n) => n.id === "step")?.next).toEqual({ to: "motor-failed" });
    expect(saved.tree.nodes.find((n) => n.id === "cap-look")?.answers?.at(-1)).toEqual({ label: "can't tell", to: "step" });
    await page.screenshot({ path: screenshotPath("editor-canvas-connected-laptop") });
    await context.close();
  });

  it("the diff page compares the draft with version 1 and follows a change of versions", async () => {
    // The draft names the equipment and adds a note to the measurement.
    const { treeUrl } = await ownTree((v1) => ({
      ...v1,
      equipment: "Single-fan rotisseries",
      nodes: v1.nodes.map((n) => (n.id === "cap-measure" ? { ...n, body: "Read it with the capacitor out of circuit." } : n)),
    }));
    const { context, page } = await signedIn("lead@tinderbox.example");
    await page.goto(`${treeUrl}/diff?from=1&to=draft`);
    await page.getByRole("heading", { name: "What changed" }).waitFor();
    await page.getByText("Single-fan rotisseries").waitFor();
    await page.getByText(/Changed: Measurement ‘Run capacitor against its rating’/).waitFor();
    await page.screenshot({ path: screenshotPath("tree-diff-laptop"), fullPage: true });
    await page.getByLabel("To", { exact: true }).selectOption("1");
    await page.getByText("version 1 and version 1 have the same content.").waitFor();
    expect(page.url()).toContain("from=1&to=1");
    await context.close();
  });
});

describe("the build keeps reactflow in the editor's lazy chunk", () => {
  it("only one client chunk holds reactflow code, and no route loads it up front — the runner least of all", async () => {
    const dir = process.env.BUILD_DIR ?? "build";
    const assets = `${dir}/client/assets`;
    const js = readdirSync(assets).filter((f) => f.endsWith(".js"));
    const holders = js.filter((f) => readFileSync(`${assets}/${f}`, "utf8").includes("react-flow__"));
    expect(holders).toHaveLength(1);
    expect(holders[0]).toMatch(/^Canvas-/);
    // The routes by URL (app/routes.ts), their chunks from the build's manifest.
    const build = await serverBuild();
    const editor = build.assets.routes[(await routeAt("/trees/:treeId/edit")).id];
    const runner = build.assets.routes[(await routeAt("/runs/:runId")).id];
    expect(editor).toBeDefined();
    expect(runner).toBeDefined();
    // Which chunks import it: only the editor route's own chunk, and only with import().
    const importers = js.filter((f) => f !== holders[0] && readFileSync(`${assets}/${f}`, "utf8").includes(holders[0]!));
    expect(importers.map((f) => `/assets/${f}`)).toEqual([editor!.module]);
    expect(readFileSync(`${assets}/${importers[0]}`, "utf8")).toMatch(
      new RegExp(`import\\([\`"']\\./${holders[0]!.replace(/[.-]/g, "\\$&")}[\`"']\\)`),
    );
    for (const [id, r] of Object.entries(build.assets.routes))
      expect(
        [r.module, ...(r.imports ?? [])].some((f) => f.endsWith(holders[0]!)),
        id,
      ).toBe(false);
  });
});
