// The phone's side of field work for one user: the runs kept here, the outbox of what was done here
// and not yet accepted by the server, and the sender that empties it. Every step, note and photo
// goes into the outbox first (IndexedDB), then out in order with its idempotency key and the
// phone's clock — with signal at once, without it when signal returns (the `online` event, a
// return to the page, a timer with back-off). One sender per user across tabs (Web Locks); other
// tabs hear of changes (BroadcastChannel). A refusal from the server stops that run's queue and
// keeps what was refused, with what was typed, until the technician decides.
import { ApiError, getJson, postForm, postJson } from "../api";
import type { LogEntry } from "~/engine/traversal";
import type { FieldKit, KitCall, KitVersion } from "~/lib/field-kit";
import type { NoteView, PhotoView, RunView } from "~/lib/run-log";
import { openPhoneDb, type KitMeta, type OutboxItem, type PhoneDb, type StoredRun } from "./db";
import { localRunView, withAcceptedNote, withAcceptedPhoto, withAcceptedStep, type StepResponse } from "./fold";
import { setPhoneUser } from "./who";

export type PhoneSnapshot = {
  /** The stored data has been read. */
  ready: boolean;
  items: OutboxItem[];
  runs: Record<string, StoredRun>;
  calls: KitCall[];
  kit: KitMeta | null;
  /** The browser says it is online and the last try reached the server. */
  online: boolean;
  sending: boolean;
  /** The server answered 401: the session has ended; sending waits for a new sign-in. */
  needsSignIn: boolean;
  /** The server answered but could not store (a 503: its database is away); sending tries again. */
  serverAway: boolean;
  /** IndexedDB could not be opened: nothing is kept on this phone. */
  storageError: string | null;
};

/** Runs kept only because they were opened are let go this long after their last opening. */
const KEEP_OPENED_MS = 14 * 86_400_000;
const MAX_BACKOFF_MS = 30_000;

type NewItem = OutboxItem extends infer I ? (I extends OutboxItem ? Omit<I, "n" | "state" | "refusal"> : never) : never;

function stripMeter(entry: LogEntry): LogEntry {
  if (entry.type !== "reading") return entry;
  const { meter: _meter, ...rest } = entry;
  return rest;
}

const online = () => typeof navigator === "undefined" || navigator.onLine !== false;

export class Phone {
  private snap: PhoneSnapshot = {
    ready: false,
    items: [],
    runs: {},
    calls: [],
    kit: null,
    online: online(),
    sending: false,
    needsSignIn: false,
    serverAway: false,
    storageError: null,
  };
  private listeners = new Set<() => void>();
  private db: Promise<PhoneDb | null>;
  private lastN = 0;
  private current: Promise<void> | null = null;
  private again = false;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private failures = 0;
  private writes = new Set<Promise<unknown>>();
  /** Items enqueued in this tab whose write to disk has not finished. */
  private unwritten = new Set<number>();
  private urls = new Map<string, string>();
  private channel: BroadcastChannel | null = null;

  constructor(readonly userId: string) {
    this.db = openPhoneDb(userId).catch((e: unknown) => {
      this.set({ storageError: e instanceof Error ? e.message : String(e), ready: true });
      return null;
    });
    void this.load();
    if (typeof window !== "undefined") {
      window.addEventListener("online", () => {
        this.reach(true);
        this.kick();
      });
      window.addEventListener("offline", () => this.reach(this.reachable));
      document.addEventListener("visibilitychange", () => {
        if (document.visibilityState === "visible") this.kick();
      });
      if (typeof BroadcastChannel !== "undefined") {
        this.channel = new BroadcastChannel(`cluepath-phone-${userId}`);
        this.channel.onmessage = () => void this.load();
      }
    }
  }

  // --- the store React reads (useSyncExternalStore) ---------------------------------------------

  subscribe = (fn: () => void) => {
    this.listeners.add(fn);
    return () => this.listeners.delete(fn);
  };
  getSnapshot = () => this.snap;

  /** Whether the last request reached the server (the browser may say online with no real signal). */
  private reachable = true;
  private reach(v: boolean) {
    this.reachable = v;
    const now = online() && v;
    if (now !== this.snap.online) this.set({ online: now });
  }

  private set(patch: Partial<PhoneSnapshot>) {
    this.snap = { ...this.snap, ...patch };
    for (const fn of this.listeners) fn();
  }

  private changed() {
    this.channel?.postMessage("changed");
  }

  /** Reads everything stored for the user (a few runs and calls) into memory. */
  private async load() {
    const db = await this.db;
    if (!db) return;
    const [items, runs, calls, kit] = await Promise.all([
      db.getAll("outbox"),
      db.getAll("runs"),
      db.getAll("calls"),
      db.get("meta", "kit"),
    ]);
    this.lastN = Math.max(this.lastN, ...items.map((i) => i.n));
    const byId: Record<string, StoredRun> = {};
    for (const r of runs) byId[r.id] = r;
    // What this tab keeps in memory and has not written yet stays.
    for (const [id, r] of Object.entries(this.snap.runs)) if (!byId[id] || byId[id].savedAt < r.savedAt) byId[id] = r;
    const mine = this.snap.items.filter((i) => this.unwritten.has(i.n) && !items.some((x) => x.n === i.n));
    this.set({
      ready: true,
      items: [...items, ...mine].sort((a, b) => a.n - b.n),
      runs: byId,
      calls: calls.sort((a, b) => a.number - b.number),
      kit: kit ?? null,
    });
    this.kick();
  }

  /** Resolves when every write started so far is on disk (before a reload, an update). */
  async settled(): Promise<void> {
    while (this.writes.size) await Promise.allSettled([...this.writes]);
  }

  private write<T>(p: Promise<T>): Promise<T> {
    this.writes.add(p);
    void p.finally(() => this.writes.delete(p)).catch(() => undefined);
    return p;
  }

  // --- runs ---------------------------------------------------------------------------------------

  /**
   * The run as the server sent it now. Kept on the phone when `keep` (the technician holds it, or
   * something of theirs for it is still here); otherwise only shown. A view with fewer steps than
   * the one kept is a late answer and is ignored.
   */
  putRun(view: RunView, opts: { keep: boolean; opened?: boolean }) {
    const old = this.snap.runs[view.run.id];
    if (old && !old.local && old.view.steps.length > view.steps.length) return;
    const now = new Date().toISOString();
    const stored: StoredRun = { id: view.run.id, view, local: false, openedAt: opts.opened ? now : (old?.openedAt ?? null), savedAt: now };
    this.set({ runs: { ...this.snap.runs, [view.run.id]: stored } });
    if (opts.opened && view.viewer.holds)
      setPhoneUser({
        id: this.userId,
        name: view.run.technician.id === this.userId ? view.run.technician.name : (this.snap.kit?.user.name ?? ""),
      });
    const keep = opts.keep || this.snap.items.some((i) => i.runId === view.run.id);
    if (keep) void this.write(this.db.then((db) => db?.put("runs", stored))).then(() => this.changed());
  }

  /** The technician opened a run the phone already holds (the page came from the phone, not the server). */
  opened(runId: string) {
    const old = this.snap.runs[runId];
    if (!old) return;
    const stored = { ...old, openedAt: new Date().toISOString() };
    this.set({ runs: { ...this.snap.runs, [runId]: stored } });
    void this.write(this.db.then((db) => db?.put("runs", stored)));
  }

  /** Asks the server for the run again (not while the phone still has things to send for it). */
  async refreshRun(runId: string): Promise<void> {
    if (!online() || this.snap.items.some((i) => i.runId === runId && i.state === "queued")) return;
    if (this.snap.runs[runId]?.local) return;
    try {
      const view = await getJson<RunView>(`/api/runs/${runId}`);
      this.reach(true);
      this.putRun(view, { keep: view.viewer.holds && Boolean(this.snap.runs[runId]) });
    } catch (e) {
      if (e instanceof ApiError && e.status === 0) this.reach(false);
    }
  }

  /** A stored run, read from the phone (for a page opened from the service worker's shell). */
  async storedRun(runId: string): Promise<StoredRun | undefined> {
    if (this.snap.runs[runId]) return this.snap.runs[runId];
    const db = await this.db;
    return (await db?.get("runs", runId)) ?? undefined;
  }

  // --- the outbox ---------------------------------------------------------------------------------

  /** Keeps one thing done on the phone and sends it when it can. Shown at once; on disk before it is sent. */
  enqueue(item: NewItem): void {
    this.lastN = Math.max(this.lastN + 1, Date.now());
    const full = { ...item, n: this.lastN, state: "queued" } as OutboxItem;
    this.set({ items: [...this.snap.items, full] });
    this.unwritten.add(full.n);
    void this.write(this.add(full)).then(() => {
      this.unwritten.delete(full.n);
      this.changed();
      this.kick();
    });
  }

  private async add(item: OutboxItem) {
    const db = await this.db;
    if (!db) return;
    const tx = db.transaction(["outbox", "runs"], "readwrite");
    await tx.objectStore("outbox").add(item);
    // The run goes with it, so the phone can show it again with no signal.
    const run = this.snap.runs[item.runId];
    if (run) await tx.objectStore("runs").put(run);
    await tx.done;
  }

  /** Starts a run on one of today's calls with the procedure kept on the phone; it is created on the server when the phone syncs. */
  async startHere(call: KitCall, versionId: string): Promise<string> {
    const db = await this.db;
    const version = (await db?.get("versions", versionId)) as KitVersion | undefined;
    const kit = this.snap.kit;
    if (!db || !version || !kit) throw new Error("This procedure is not kept on this phone.");
    const runId = crypto.randomUUID();
    const at = new Date().toISOString();
    const stored: StoredRun = { id: runId, view: localRunView({ runId, at, call, version, kit }), local: true, openedAt: at, savedAt: at };
    this.set({ runs: { ...this.snap.runs, [runId]: stored } });
    this.enqueue({ kind: "start", runId, key: runId, at, treeId: version.treeId, versionId: version.id, callId: call.id });
    await this.settled();
    return runId;
  }

  /** The phone's own copy of a photo still on it, for showing (revoked when the photo is gone). */
  photoUrl = (item: OutboxItem & { kind: "photo" }): string => {
    let url = this.urls.get(item.key);
    if (!url) {
      url = URL.createObjectURL(item.photo);
      this.urls.set(item.key, url);
    }
    return url;
  };

  private dropUrls() {
    for (const [key, url] of this.urls) {
      if (!this.snap.items.some((i) => i.key === key)) {
        URL.revokeObjectURL(url);
        this.urls.delete(key);
      }
    }
  }

  /** Sends the refused and held things of a run again (after the technician decided to). */
  async retry(runId: string): Promise<void> {
    const db = await this.db;
    const again = this.snap.items.map((i) =>
      i.runId === runId && i.state !== "queued" ? { ...i, state: "queued" as const, refusal: undefined } : i,
    );
    this.set({ items: again });
    if (db) {
      const tx = db.transaction("outbox", "readwrite");
      for (const i of again.filter((x) => x.runId === runId)) await tx.store.put(i);
      await tx.done;
    }
    this.changed();
    this.kick();
  }

  /** Removes what the server refused for a run (and what waited behind it), after the technician saw it. */
  async discard(runId: string): Promise<void> {
    const db = await this.db;
    const gone = this.snap.items.filter((i) => i.runId === runId && i.state !== "queued");
    this.set({ items: this.snap.items.filter((i) => !gone.includes(i)) });
    if (db) {
      const tx = db.transaction(["outbox", "runs"], "readwrite");
      for (const i of gone) await tx.objectStore("outbox").delete(i.n);
      const run = this.snap.runs[runId];
      // A run the server never created leaves with them.
      if (run?.local && gone.some((i) => i.kind === "start")) await tx.objectStore("runs").delete(runId);
      await tx.done;
    }
    this.dropUrls();
    this.changed();
    void this.refreshRun(runId);
  }

  /** Starts sending now (or as soon as the sender in another tab or this one is free). */
  kick = () => {
    if (this.timer) {
      clearTimeout(this.timer);
      this.timer = null;
    }
    void this.drain();
  };

  /** Resolves once nothing of this run is waiting to be sent (or the phone cannot send now). */
  async sent(runId: string): Promise<boolean> {
    await this.settled();
    await this.drain();
    return !this.snap.items.some((i) => i.runId === runId && i.state === "queued");
  }

  private drain(): Promise<void> {
    if (this.current) {
      this.again = true;
      return this.current;
    }
    if (!this.snap.items.some((i) => i.state === "queued") || !online() || this.snap.needsSignIn) return Promise.resolve();
    this.set({ sending: true });
    this.current = (async () => {
      try {
        const locks = typeof navigator !== "undefined" ? navigator.locks : undefined;
        if (locks) await locks.request(`cluepath-send-${this.userId}`, () => this.sendAll());
        else await this.sendAll();
      } finally {
        this.current = null;
        this.set({ sending: false });
      }
      if (this.again) {
        this.again = false;
        await this.drain();
      }
    })();
    return this.current;
  }

  private async sendAll(): Promise<void> {
    // Another tab may have sent some meanwhile: start from what is on disk.
    const db = await this.db;
    if (db) {
      const onDisk = new Set((await db.getAllKeys("outbox")) as number[]);
      this.set({ items: this.snap.items.filter((i) => onDisk.has(i.n) || this.unwritten.has(i.n)) });
    }
    const touched = new Set<string>();
    for (;;) {
      const blocked = new Set(this.snap.items.filter((i) => i.state !== "queued").map((i) => i.runId));
      const next = this.snap.items.find((i) => i.state === "queued" && !blocked.has(i.runId));
      if (!next) break;
      await this.settled();
      let answer: unknown;
      try {
        answer = await this.send(next);
      } catch (e) {
        const err = e instanceof ApiError ? e : new ApiError("The server could not be reached.", 0, true);
        if (err.status === 401) {
          this.set({ needsSignIn: true });
          return;
        }
        if (err.retryable) {
          this.failures++;
          if (err.status === 0) this.reach(false);
          else if (!this.snap.serverAway) this.set({ serverAway: true });
          const delay = Math.min(1000 * 2 ** Math.min(this.failures, 5), MAX_BACKOFF_MS);
          this.timer = setTimeout(this.kick, delay);
          return;
        }
        await this.refuse(next, err);
        touched.add(next.runId);
        continue;
      }
      this.failures = 0;
      this.reach(true);
      if (this.snap.serverAway) this.set({ serverAway: false });
      await this.accept(next, answer);
      touched.add(next.runId);
    }
    for (const runId of touched) void this.refreshRun(runId);
  }

  private send(i: OutboxItem): Promise<unknown> {
    const base = `/api/runs/${i.runId}`;
    switch (i.kind) {
      case "start":
        return postJson("/api/runs", { id: i.runId, treeId: i.treeId, versionId: i.versionId, callId: i.callId, at: i.at });
      case "step":
        return postJson<StepResponse>(`${base}/steps`, { key: i.key, entry: stripMeter(i.entry), meterId: i.meterId, at: i.at });
      case "note":
        return postJson<{ note: NoteView }>(`${base}/notes`, { key: i.key, node: i.node, text: i.text, at: i.at });
      case "photo": {
        const form = new FormData();
        form.set("key", i.key);
        form.set("node", i.node);
        form.set("at", i.at);
        form.set("photo", i.photo, i.fileName);
        return postForm<{ photo: PhotoView }>(`${base}/photos`, form);
      }
    }
  }

  /** The server took it: fold its answer into the stored run and take the item off the outbox, together. */
  private async accept(i: OutboxItem, answer: unknown) {
    const run = this.snap.runs[i.runId];
    let next: StoredRun | undefined = run;
    if (run) {
      let view = run.view;
      if (i.kind === "step") view = withAcceptedStep(view, answer as StepResponse);
      else if (i.kind === "note") view = withAcceptedNote(view, (answer as { note: NoteView }).note);
      else if (i.kind === "photo") view = withAcceptedPhoto(view, (answer as { photo: PhotoView }).photo);
      next = { ...run, view, local: i.kind === "start" ? false : run.local, savedAt: new Date().toISOString() };
    }
    this.set({ items: this.snap.items.filter((x) => x.n !== i.n), runs: next ? { ...this.snap.runs, [i.runId]: next } : this.snap.runs });
    const db = await this.db;
    if (db) {
      const tx = db.transaction(["outbox", "runs"], "readwrite");
      await tx.objectStore("outbox").delete(i.n);
      if (next) await tx.objectStore("runs").put(next);
      await tx.done;
    }
    this.dropUrls();
    this.changed();
  }

  /** The server said no: keep it, with its reason, and hold everything after it for that run. */
  private async refuse(i: OutboxItem, err: ApiError) {
    const refusal = { status: err.status, message: err.message, ...(err.code ? { code: err.code } : {}), at: new Date().toISOString() };
    const items = this.snap.items.map((x) =>
      x.n === i.n
        ? { ...x, state: "refused" as const, refusal }
        : x.runId === i.runId && x.state === "queued"
          ? { ...x, state: "held" as const }
          : x,
    );
    this.set({ items });
    const db = await this.db;
    if (db) {
      const tx = db.transaction("outbox", "readwrite");
      for (const x of items.filter((y) => y.runId === i.runId)) await tx.store.put(x);
      await tx.done;
    }
    this.changed();
  }

  /** After a new sign-in: try again. */
  signedIn() {
    if (this.snap.needsSignIn) this.set({ needsSignIn: false });
    this.kick();
  }

  // --- the field kit --------------------------------------------------------------------------------

  /** Fetches today's calls, their runs and procedures, and keeps them (versions already here are not sent again). */
  async refreshKit(): Promise<void> {
    const db = await this.db;
    if (!db || !online()) return;
    const have = (await db.getAllKeys("versions")) as string[];
    let kit: FieldKit;
    try {
      kit = await getJson<FieldKit>(`/api/field-kit?have=${encodeURIComponent(have.join(","))}`);
    } catch (e) {
      if (e instanceof ApiError && e.status === 0) this.reach(false);
      return;
    }
    setPhoneUser(kit.user);
    const meta: KitMeta = { user: kit.user, timeZone: kit.timeZone, meters: kit.meters, savedAt: new Date().toISOString() };
    const needed = new Set(kit.calls.flatMap((c) => c.procedures.map((p) => p.versionId)));
    const keepRuns = new Set(kit.runs.map((r) => r.run.id));
    const tx = db.transaction(["calls", "versions", "runs", "meta"], "readwrite");
    await tx.objectStore("calls").clear();
    for (const c of kit.calls) await tx.objectStore("calls").put(c);
    for (const v of Object.values(kit.versions)) await tx.objectStore("versions").put(v);
    for (const key of (await tx.objectStore("versions").getAllKeys()) as string[])
      if (!needed.has(key)) await tx.objectStore("versions").delete(key);
    await tx.objectStore("meta").put(meta, "kit");
    const now = Date.now();
    const runs = { ...this.snap.runs };
    for (const view of kit.runs) {
      const old = runs[view.run.id];
      if (old && old.view.steps.length > view.steps.length) continue;
      runs[view.run.id] = { id: view.run.id, view, local: false, openedAt: old?.openedAt ?? null, savedAt: meta.savedAt };
      await tx.objectStore("runs").put(runs[view.run.id]!);
    }
    // Let go of runs nothing holds here any more: closed, or neither on today's list nor opened lately.
    for (const r of Object.values(runs)) {
      if (r.local || keepRuns.has(r.id) || this.snap.items.some((i) => i.runId === r.id)) continue;
      const open = r.view.run.status === "active" || r.view.run.status === "paused";
      const recent = r.openedAt !== null && now - Date.parse(r.openedAt) < KEEP_OPENED_MS;
      if (!open || !recent) {
        delete runs[r.id];
        await tx.objectStore("runs").delete(r.id);
      }
    }
    await tx.done;
    this.set({ calls: kit.calls.sort((a, b) => a.number - b.number), kit: meta, runs });
    this.reach(true);
    this.changed();
  }
}

const phones = new Map<string, Phone>();

/** The one Phone for this user in this tab. */
export function phoneFor(userId: string): Phone {
  let p = phones.get(userId);
  if (!p) phones.set(userId, (p = new Phone(userId)));
  return p;
}

/** Resolves when every phone's writes in this tab are on disk. */
export async function settleAll(): Promise<void> {
  await Promise.all([...phones.values()].map((p) => p.settled()));
}
