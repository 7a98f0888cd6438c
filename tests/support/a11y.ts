// Accessibility checks shared by the browser tests: axe-core (Deque's rules engine, from the npm
// registry, injected into the page by @axe-core/playwright), and the size of touch targets (WCAG
// 2.2 SC 2.5.5, enhanced: 44 × 44 CSS px).
import { AxeBuilder } from "@axe-core/playwright";
import type { Page } from "playwright-core";
import { expect } from "vitest";

export type AxeViolation = { id: string; impact: string | null; help: string; nodes: { target: string[] }[] };

/**
 * Runs axe-core on the page as it stands and returns its violations. AxeBuilder injects the script
 * through the DevTools protocol, which the page's Content-Security-Policy does not govern, so the
 * app's CSP stays as strict as in production.
 */
export async function axeViolations(page: Page): Promise<AxeViolation[]> {
  const result = await new AxeBuilder({ page }).analyze();
  return result.violations.map((v) => ({
    id: v.id,
    impact: v.impact ?? null,
    help: v.help,
    nodes: v.nodes.map((n) => ({ target: n.target.map(String) })),
  }));
}

/** Fails the test on any serious or critical axe violation on the page, naming each with where it is. */
export async function expectNoSeriousViolations(page: Page, where: string): Promise<void> {
  const serious = (await axeViolations(page)).filter((v) => v.impact === "serious" || v.impact === "critical");
  const described = serious.map((v) => `${v.impact} ${v.id} (${v.help}): ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`);
  expect(described, `axe on ${where}`).toEqual([]);
}

/**
 * Controls smaller than 44×44 CSS px. A link inside a sentence is exempt (the SC's "inline"
 * exception: its block has words of its own besides links); a control drawn by its label (radio
 * cards, the camera input) is measured by the label; visually hidden controls are skipped.
 */
export async function smallTargets(page: Page): Promise<string[]> {
  // No named functions inside: the page gets this function's source as written.
  return page.evaluate(() => {
    const out: string[] = [];
    for (const el of document.querySelectorAll<HTMLElement>("a[href], button, input, select, textarea, summary")) {
      const box = el.closest("label") ?? el;
      const r = box.getBoundingClientRect();
      const style = getComputedStyle(box);
      if (
        r.width === 0 ||
        r.height === 0 ||
        style.visibility === "hidden" ||
        style.clip === "rect(0px, 0px, 0px, 0px)" ||
        style.clipPath === "inset(50%)"
      )
        continue;
      if (el.tagName === "A" && getComputedStyle(el).display === "inline") {
        // Inside a sentence: the nearest block around the link has words besides links and buttons.
        let block: HTMLElement = el.parentElement ?? el;
        while (block.parentElement && getComputedStyle(block).display.startsWith("inline")) block = block.parentElement;
        const copy = block.cloneNode(true) as HTMLElement;
        copy.querySelectorAll("a, button, .sr-only").forEach((x) => x.remove());
        if (/[\p{L}\p{N}]{2}/u.test(copy.textContent ?? "")) continue;
      }
      if (r.width < 44 || r.height < 44)
        out.push(
          `${el.tagName.toLowerCase()} “${(el.textContent || el.getAttribute("aria-label") || "").trim().slice(0, 40)}” ${Math.round(r.width)}×${Math.round(r.height)}`,
        );
    }
    return out;
  });
}
