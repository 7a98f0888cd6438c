// What the user typed, kept in this browser's local storage until the server has it, so a screen
// that fails (a route error boundary), a reload or an outage loses nothing: the editor's changes
// not yet saved. (The runner's steps, notes and photos wait in the phone's outbox in IndexedDB,
// app/components/runner/offline/phone.ts, one way for all of them.) Browser only; every call is safe
// where storage is missing or full (it then keeps nothing and says so by returning null/false).

const PREFIX = "cluepath:";

function storage(): Storage | null {
  try {
    return typeof window === "undefined" ? null : window.localStorage;
  } catch {
    return null;
  }
}

/** The kept value under `key`, or null. */
export function readKept<T>(key: string): T | null {
  try {
    const raw = storage()?.getItem(PREFIX + key);
    return raw ? (JSON.parse(raw) as T) : null;
  } catch {
    return null;
  }
}

/** Keeps `value` under `key`; false when the browser would not store it. */
export function writeKept(key: string, value: unknown): boolean {
  try {
    const s = storage();
    if (!s) return false;
    s.setItem(PREFIX + key, JSON.stringify(value));
    return true;
  } catch {
    return false;
  }
}

export function forgetKept(key: string): void {
  try {
    storage()?.removeItem(PREFIX + key);
  } catch {
    /* nothing kept, nothing to forget */
  }
}

// --- the editor ------------------------------------------------------------------------------------

/** The editor's draft as it was on screen, with the revision it was based on. */
export type UnsavedDraft<T = unknown, L = unknown> = { versionId: string; revision: number; tree: T; layout: L; at: string };

export const unsavedKey = (treeId: string) => `draft:${treeId}:unsaved`;
