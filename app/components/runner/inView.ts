// Keeping what the technician works on in sight: between the sticky header and whichever comes
// first of the fixed bottom bar and the phone's keyboard (the visual viewport ends above it).
import { useEffect, type RefObject } from "react";

export const TOOLBAR_ID = "run-tools";
const GAP = 8;

/** The band of the window that nothing covers, in client coordinates. */
function clearBand(): { top: number; bottom: number } {
  const header = document.querySelector<HTMLElement>("header.sticky");
  const bar = document.getElementById(TOOLBAR_ID);
  const vv = window.visualViewport;
  const top = header ? Math.max(0, header.getBoundingClientRect().bottom) : 0;
  let bottom = vv ? vv.offsetTop + vv.height : window.innerHeight;
  if (bar) bottom = Math.min(bottom, bar.getBoundingClientRect().top);
  return { top, bottom };
}

/** Scrolls the window the least that brings `el` into the clear band (its top first when it is taller). */
export function bringIntoClear(el: Element) {
  const { top, bottom } = clearBand();
  const r = el.getBoundingClientRect();
  let by = 0;
  if (r.bottom > bottom - GAP) by = r.bottom - (bottom - GAP);
  if (r.top - by < top + GAP) by = r.top - (top + GAP);
  if (Math.abs(by) >= 1) window.scrollBy({ top: by });
}

/** A focused control is never left under the bottom bar (Tab, or focus moved by the screen). */
export function useFocusClearOfBar() {
  useEffect(() => {
    const onFocus = (e: FocusEvent) => {
      const t = e.target as Element | null;
      if (!t || !(t instanceof HTMLElement) || t === document.body) return;
      if (t.closest(`#${TOOLBAR_ID}, [data-overlay]`)) return;
      // Only focus from the keyboard (or moved by the screen): scrolling while a finger or the
      // mouse is down on a button would move the button from under it and lose the tap.
      if (!t.matches(":focus-visible")) return;
      bringIntoClear(t.closest("label") ?? t);
    };
    document.addEventListener("focusin", onFocus);
    return () => document.removeEventListener("focusin", onFocus);
  }, []);
}

/**
 * While a control inside `ref` has focus, keeps the whole group (the field and the verdict under
 * it) in the clear band: when focus arrives, when the keyboard opens or closes (the visual
 * viewport resizes) and when the group grows (a verdict appears as the reading is typed).
 */
export function useKeepInView(ref: RefObject<HTMLElement | null>) {
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const fit = () => {
      if (el.contains(document.activeElement)) bringIntoClear(el);
    };
    let timer: ReturnType<typeof setTimeout> | undefined;
    const later = () => {
      clearTimeout(timer);
      timer = setTimeout(fit, 120);
    };
    el.addEventListener("focusin", later);
    window.visualViewport?.addEventListener("resize", later);
    window.addEventListener("resize", later);
    const ro = typeof ResizeObserver === "undefined" ? null : new ResizeObserver(later);
    ro?.observe(el);
    return () => {
      clearTimeout(timer);
      el.removeEventListener("focusin", later);
      window.visualViewport?.removeEventListener("resize", later);
      window.removeEventListener("resize", later);
      ro?.disconnect();
    };
  }, [ref]);
}
