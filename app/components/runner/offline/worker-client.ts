// The page's side of the service worker (server/worker.js): registration on the runner and the
// technician's pages, and "a new version is ready". A new worker installs in the background and
// waits; the page offers a reload, waits until everything the phone holds is on disk, then lets
// the new worker take over and reloads. The outbox lives in IndexedDB, not in the worker, so an
// update never touches it.
import { useSyncExternalStore } from "react";
import { settleAll } from "./phone";

let registration: Promise<ServiceWorkerRegistration | null> | null = null;
let ready = false;
const listeners = new Set<() => void>();

function setReady(v: boolean) {
  if (ready === v) return;
  ready = v;
  for (const fn of listeners) fn();
}

/** Registers the worker once per page load (production builds only; the dev server has none). */
export function registerWorker(): void {
  if (registration || typeof navigator === "undefined" || !("serviceWorker" in navigator) || import.meta.env.DEV) return;
  registration = navigator.serviceWorker
    .register("/sw.js", { scope: "/" })
    .then((reg) => {
      const check = () => setReady(Boolean(reg.waiting && navigator.serviceWorker.controller));
      const watch = (w: ServiceWorker | null) => w?.addEventListener("statechange", check);
      check();
      // The browser checks for a new worker when a page is opened, often before this page asks: an
      // update already installing is watched as well as those found later.
      watch(reg.installing);
      reg.addEventListener("updatefound", () => watch(reg.installing));
      // A phone left on the runner all day still learns of a new version when it comes back to it.
      document.addEventListener("visibilitychange", () => {
        if (document.visibilityState === "visible") void reg.update().catch(() => undefined);
      });
      return reg;
    })
    .catch(() => null);
}

/** Whether a new version has installed and waits for a reload. */
export function useUpdateReady(): boolean {
  return useSyncExternalStore(
    (fn) => {
      listeners.add(fn);
      return () => listeners.delete(fn);
    },
    () => ready,
    () => false,
  );
}

/** Switches to the waiting version: after the phone's writes are on disk, the new worker takes over and the page reloads. */
export async function applyUpdate(): Promise<void> {
  const reg = await registration;
  await settleAll();
  if (!reg?.waiting) return window.location.reload();
  navigator.serviceWorker.addEventListener("controllerchange", () => window.location.reload(), { once: true });
  reg.waiting.postMessage({ type: "skip-waiting" });
}
