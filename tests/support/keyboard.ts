// Driving pages with the keyboard alone (no mouse or touch events): Tab to a control by its name,
// choose in a select with the arrow keys, and count any pointer event the page saw.
import type { BrowserContext, Page } from "playwright-core";

/** The focused element's name as a screen reader would start it: aria-label, its label, or its text. */
function focusedName(page: Page): Promise<string> {
  return page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    if (!el || el === document.body) return "";
    const labelled = el.getAttribute("aria-labelledby");
    const byId = labelled
      ?.split(/\s+/)
      .map((id) => document.getElementById(id)?.textContent ?? "")
      .join(" ");
    const label = (el as HTMLInputElement).labels?.[0]?.textContent;
    return (el.getAttribute("aria-label") ?? byId ?? label ?? el.textContent ?? "").replace(/\s+/g, " ").trim();
  });
}

/**
 * Presses Tab (Shift+Tab with `back`) until the focused control's name matches (and its role, when
 * given: a tree view is one Tab stop, whichever item it is on); throws with what it passed.
 */
export async function tabTo(
  page: Page,
  name: RegExp,
  { back = false, max = 150, role }: { back?: boolean; max?: number; role?: string } = {},
): Promise<void> {
  const passed: string[] = [];
  for (let i = 0; i < max; i++) {
    await page.keyboard.press(back ? "Shift+Tab" : "Tab");
    const now = await focusedName(page);
    if (name.test(now) && (!role || (await page.evaluate(() => document.activeElement?.getAttribute("role"))) === role)) return;
    passed.push(now);
  }
  throw new Error(`Tab never reached ${name}; passed: ${passed.slice(-40).join(" | ")}`);
}

/** In the focused <select>, moves with Home and ArrowDown to the option whose text matches. */
export async function choose(page: Page, option: RegExp): Promise<void> {
  const selected = () => page.evaluate(() => (document.activeElement as HTMLSelectElement).selectedOptions[0]?.textContent ?? "");
  await page.keyboard.press("Home");
  for (let i = 0; i < 60; i++) {
    if (option.test(await selected())) return;
    await page.keyboard.press("ArrowDown");
  }
  throw new Error(`no option ${option} in the focused select`);
}

/** Counts every pointer, mouse and touch event the pages of `context` see (kept across page loads). */
export async function countPointerEvents(context: BrowserContext): Promise<void> {
  // A string, so the page runs it exactly as written (no transpiler helpers).
  await context.addInitScript(`
    for (const type of ["pointerdown", "mousedown", "touchstart", "click"]) {
      window.addEventListener(type, (e) => {
        if (type === "click" && e.detail === 0) return; // a click made by Enter or Space on a control
        try {
          sessionStorage.setItem("pointer-events", String(Number(sessionStorage.getItem("pointer-events") || 0) + 1));
        } catch {}
      }, { capture: true });
    }
  `);
}

export function pointerEvents(page: Page): Promise<number> {
  return page.evaluate(() => Number(sessionStorage.getItem("pointer-events") ?? 0));
}

/** Signs in from the sign-in page by keyboard: type into the focused fields, Enter to send. */
export async function signInByKeyboard(page: Page, baseUrl: string, email: string, password: string): Promise<void> {
  await page.goto(`${baseUrl}/login`);
  await tabTo(page, /^Email/);
  await page.keyboard.type(email);
  await tabTo(page, /^Password/);
  await page.keyboard.type(password);
  await page.keyboard.press("Enter");
  await page.waitForURL((u) => !u.pathname.startsWith("/login"));
}

/** Presses an arrow key (ArrowDown by default) until the focused item's name matches, as in a tree view. */
export async function arrowTo(page: Page, name: RegExp, key = "ArrowDown", max = 40): Promise<void> {
  for (let i = 0; i < max; i++) {
    if (name.test(await focusedName(page))) return;
    await page.keyboard.press(key);
  }
  throw new Error(`${key} never reached ${name}; at ${await focusedName(page)}`);
}
