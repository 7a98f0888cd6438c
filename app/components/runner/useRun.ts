// The runner's data: the run (first render from the loader, or from the phone when there is no
// signal), the engine's replay of its log, and the writes. Steps, notes and photos go through the
// phone's outbox (offline/phone.ts): applied at once, kept in IndexedDB, sent one after another with
// their idempotency keys when there is signal. Status changes, the outcome and the report need the
// server and are sent after what the phone still holds for the run.
import { useMutation } from "@tanstack/react-query";
import { useEffect, useMemo, useState } from "react";
import { practiceReplay, type PracticeEntry } from "~/engine/training/practice";
import { replay, type LogEntry } from "~/engine/traversal";
import type { TreeNode } from "~/engine/types";
import { logOf, type RunView } from "~/lib/run-log";
import { ApiError, postJson } from "./api";
import { overlay, stepFor, withMeter } from "./offline/overlay";
import { usePhone } from "./offline/usePhone";

const uuid = () => crypto.randomUUID();
/** How long a run on screen is taken as fresh before a return to the page asks the server again. */
const FRESH_MS = 15_000;

export function useRun(initial: RunView, fromPhone = false) {
  const id = initial.run.id;
  const { phone, snap } = usePhone(initial.viewer.id);
  const [error, setError] = useState<string | null>(null);

  // The run as the server last sent it: what the phone holds once it has read it, else the first render's.
  const stored = snap.runs[id];
  const server = stored?.view ?? initial;
  const items = useMemo(() => snap.items.filter((i) => i.runId === id), [snap.items, id]);
  const view = useMemo(() => (phone ? overlay(server, items, phone.photoUrl) : server), [phone, server, items]);

  // Opened: kept on the phone (the holder's), and asked for again when the page comes back.
  useEffect(() => {
    if (!phone) return;
    if (fromPhone) phone.opened(id);
    else phone.putRun(initial, { keep: initial.viewer.holds, opened: true });
    let last = Date.now();
    const again = () => {
      if (document.visibilityState !== "visible" || Date.now() - last < FRESH_MS) return;
      last = Date.now();
      void phone.refreshRun(id);
    };
    document.addEventListener("visibilitychange", again);
    window.addEventListener("online", again);
    return () => {
      document.removeEventListener("visibilitychange", again);
      window.removeEventListener("online", again);
    };
  }, [phone, initial, id, fromPhone]);

  // A practice run follows the trainee's call on each reading (app/engine/training/practice.ts).
  const practice = view.run.practice;
  const state = useMemo(
    () => (practice ? practiceReplay(view.tree, logOf(view.steps) as PracticeEntry[]) : replay(view.tree, logOf(view.steps))),
    [practice, view.tree, view.steps],
  );
  const current: TreeNode | undefined = useMemo(() => view.tree.nodes.find((n) => n.id === state.current), [view.tree, state.current]);
  const byId = useMemo(() => new Map(view.tree.nodes.map((n) => [n.id, n])), [view.tree]);

  /** Apply an entry now and keep it for sending. Returns the engine's refusal message, or null. */
  function submit(entry: LogEntry | PracticeEntry, meterId: string | null = null): string | null {
    const full = withMeter(view.tree, view.meters, entry as LogEntry, meterId);
    const key = uuid();
    const at = new Date().toISOString();
    const tried = stepFor(view.tree, view.steps, full, { key, meterId, at, enteredBy: view.viewer.id, practice });
    if (!tried.ok) return tried.message;
    if (!phone) return "Cluepath is still starting; try again in a moment.";
    setError(null);
    phone.enqueue({ kind: "step", runId: id, key, at, entry: full, meterId: full.type === "reading" ? meterId : null });
    return null;
  }

  /** Server-only writes wait until the phone has sent what it holds for the run, so they land after it. */
  async function afterQueue<T>(send: () => Promise<T>): Promise<T> {
    if (phone && !(await phone.sent(id)))
      throw new ApiError("There is no signal. Steps are kept on this phone; do this when there is signal.", 0, false);
    return send();
  }
  const refresh = () => phone?.refreshRun(id);

  const status = useMutation({
    mutationKey: ["run-status", id],
    mutationFn: (p: { action: "pause" | "resume" | "abandon" | "escalate" | "take-over"; reason?: string }) =>
      afterQueue(() => postJson<{ status: RunView["run"]["status"] }>(`/api/runs/${id}/status`, p)),
    onSuccess: refresh,
    onError: (e) => setError(e instanceof ApiError ? e.message : "That did not go through."),
  });

  const outcome = useMutation({
    mutationKey: ["run-outcome", id],
    mutationFn: (p: { action: string; minutes: number; parts: { partNumber: string; description: string; quantity: number }[] }) =>
      afterQueue(() => postJson<{ reportId: string; number: number }>(`/api/runs/${id}/outcome`, p)),
    onSuccess: refresh,
    onError: (e) => setError(e instanceof ApiError ? e.message : "The outcome was not saved."),
  });

  // A practice run's finish (app/routes/api.runs.$runId.finish.ts), after its steps.
  const finish = useMutation({
    mutationKey: ["run-finish", id],
    mutationFn: () => afterQueue(() => postJson<{ status: "done" }>(`/api/runs/${id}/finish`, {})),
    onSuccess: refresh,
    onError: (e) => setError(e instanceof ApiError ? e.message : "The practice was not finished."),
  });

  const sendReport = useMutation({
    mutationKey: ["report-send", id],
    mutationFn: (reportId: string) => postJson<{ to: string }>(`/api/reports/${reportId}/send`, {}),
    onSuccess: refresh,
    onError: (e) => setError(e instanceof ApiError ? e.message : "The report was not sent."),
  });

  const queued = items.filter((i) => i.state === "queued");
  const offline = !snap.online;
  // Kept on the phone, not on its way: no signal, or a server that cannot store just now.
  const held = offline || snap.serverAway;
  return {
    view,
    state,
    current,
    byId,
    submit,
    addNote: (node: string, text: string) =>
      phone?.enqueue({ kind: "note", runId: id, key: uuid(), at: new Date().toISOString(), node, text }),
    addPhoto: (node: string, file: File) =>
      phone?.enqueue({
        kind: "photo",
        runId: id,
        key: uuid(),
        at: new Date().toISOString(),
        node,
        photo: file,
        fileName: file.name || "photo.jpg",
      }),
    /** Photos show from the phone's copy at once; nothing to wait for on screen. */
    photoUploading: false,
    setStatus: status.mutateAsync,
    statusPending: status.isPending,
    recordOutcome: outcome.mutateAsync,
    outcomePending: outcome.isPending,
    finish,
    sendReport,
    /** Entries on their way to the server (with signal). */
    saving: held ? 0 : queued.length,
    /** Entries kept on the phone until there is signal, or until the server can store them. */
    waiting: held ? queued.length : 0,
    /** What is only on this phone for this run, and what the server refused; see offline/PhoneStatus. */
    phone: {
      items,
      queued,
      offline,
      serverAway: snap.serverAway,
      sending: snap.sending,
      needsSignIn: snap.needsSignIn,
      retry: () => phone?.retry(id),
      discard: () => phone?.discard(id),
    },
    error,
    setError,
  };
}

export type RunHandle = ReturnType<typeof useRun>;
