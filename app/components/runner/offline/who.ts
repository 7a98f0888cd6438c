// Who the phone's stored work belongs to. Everything kept for working without signal lives in one
// IndexedDB database per user (named here); the browser's localStorage remembers whose it is, so a
// page opened with no signal (the service worker's empty shell) knows which database to read.
// Sign-out deletes that user's database. No IndexedDB code here: the shell's sign-out imports this.

const KEY = "cluepath.phone.user";

// Set once sign-out has begun on this page: an answer still on its way (the field kit, a run view)
// must not write the user back after it was forgotten.
let leaving = false;

export type PhoneUser = { id: string; name: string };

export const phoneDbName = (userId: string) => `cluepath-phone-${userId}`;

/** The user whose work this phone holds (the last one signed in here), or null. */
export function phoneUser(): PhoneUser | null {
  try {
    const raw = localStorage.getItem(KEY);
    const v = raw ? (JSON.parse(raw) as PhoneUser) : null;
    return v && typeof v.id === "string" ? v : null;
  } catch {
    return null;
  }
}

/** Marks the signed-in user as the phone's (a page that knows them from the server calls it). */
export function setPhoneUser(user: PhoneUser): void {
  if (leaving) return;
  try {
    const now = phoneUser();
    if (now?.id !== user.id || now.name !== user.name) localStorage.setItem(KEY, JSON.stringify(user));
  } catch {
    /* storage refused: the phone keeps nothing for offline use */
  }
}

/** Forgets the user and deletes everything stored for them on this phone. */
export async function forgetPhoneUser(userId: string): Promise<void> {
  leaving = true;
  if (phoneUser()?.id === userId) localStorage.removeItem(KEY);
  await new Promise<void>((resolve) => {
    const req = indexedDB.deleteDatabase(phoneDbName(userId));
    req.onsuccess = req.onerror = req.onblocked = () => resolve();
  });
}
