// The runner's data: the run from GET /api/runs/:id (first render from the loader), the engine's
// replay of its log, and the mutations that write steps, notes, photos and status changes. Steps
// are applied at once (optimistic) and sent one after another with their idempotency keys.
import { useIsMutating, useMutation, useMutationState, useQuery, useQueryClient } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import { practiceReplay, practiceTryEntry, type PracticeEntry } from "~/engine/training/practice";
import { replay, tryEntry, type LogEntry } from "~/engine/traversal";
import type { TreeNode } from "~/engine/types";
import { logOf, meterAccuracy, type NoteView, type PhotoView, type RunView, type StepView } from "~/lib/run-log";
import { ApiError, backoff, getJson, postForm, postJson, retryable } from "./api";

type StepResponse = { step: StepView; replayed: boolean; run: { status: RunView["run"]["status"]; currentNode: string | null; endKind: string | null; stepCount: number } };

const uuid = () => crypto.randomUUID();

export function useRun(initial: RunView) {
  const id = initial.run.id;
  const qc = useQueryClient();
  const queryKey = ["run", id];
  const { data: view } = useQuery({
    queryKey,
    queryFn: async () => {
      // Keep steps still on their way to the server on top of what it knows.
      const fresh = await getJson<RunView>(`/api/runs/${id}`);
      const local = qc.getQueryData<RunView>(["run", id]);
      const pending = local?.steps.filter((s) => s.pending && !fresh.steps.some((f) => f.key === s.key)) ?? [];
      return pending.length ? { ...fresh, steps: [...fresh.steps, ...pending.map((s, i) => ({ ...s, seq: fresh.steps.length + i }))] } : fresh;
    },
    initialData: initial,
    staleTime: 15_000,
  });
  const [error, setError] = useState<string | null>(null);
  const set = (f: (v: RunView) => RunView) => qc.setQueryData<RunView>(queryKey, (v) => (v ? f(v) : v));

  // A practice run follows the trainee's call on each reading (app/engine/training/practice.ts).
  const practice = view.run.practice;
  const state = useMemo(() => (practice ? practiceReplay(view.tree, logOf(view.steps) as PracticeEntry[]) : replay(view.tree, logOf(view.steps))), [practice, view.tree, view.steps]);
  const current: TreeNode | undefined = useMemo(() => view.tree.nodes.find((n) => n.id === state.current), [view.tree, state.current]);
  const byId = useMemo(() => new Map(view.tree.nodes.map((n) => [n.id, n])), [view.tree]);

  const scope = { id: `run-${id}` };
  const writes = { mutationKey: ["run-write", id], scope, retry: retryable, retryDelay: backoff } as const;

  const step = useMutation({
    ...writes,
    mutationFn: (p: { key: string; entry: LogEntry; meterId: string | null; at: string }) =>
      postJson<StepResponse>(`/api/runs/${id}/steps`, { key: p.key, entry: stripMeter(p.entry), meterId: p.meterId, at: p.at }),
    // The server's row replaces the optimistic one, but keeps a "taken back" the phone already
    // applied: an undo sent while this step was on its way reaches the server after it.
    onSuccess: (res, p) => set((v) => ({ ...v, steps: v.steps.map((s) => (s.key === p.key ? { ...res.step, undone: res.step.undone || s.undone } : s)), run: { ...v.run, ...res.run } })),
    onError: (e, p) => {
      // Drop this step and anything queued after it; the server's version is the truth.
      set((v) => {
        const at = v.steps.findIndex((s) => s.key === p.key);
        return at < 0 ? v : { ...v, steps: v.steps.slice(0, at) };
      });
      setError(e instanceof ApiError ? e.message : "The step was not saved.");
      void qc.invalidateQueries({ queryKey });
    },
  });

  /** Apply an entry now and send it. Returns the engine's refusal message, or null. */
  function submit(entry: LogEntry | PracticeEntry, meterId: string | null = null): string | null {
    const v = qc.getQueryData<RunView>(queryKey) ?? view;
    let full = entry as LogEntry;
    if (entry.type === "reading") {
      const node = byId.get(entry.node);
      const m = meterId ? v.meters.find((x) => x.id === meterId) : undefined;
      if (m) full = { ...entry, meter: meterAccuracy(m) };
      else if (node?.kind === "measurement" && node.meter) full = { ...entry, meter: node.meter };
    }
    const tried = practice ? practiceTryEntry(v.tree, logOf(v.steps) as PracticeEntry[], full as PracticeEntry) : tryEntry(v.tree, logOf(v.steps), full);
    if (!tried.ok) return tried.rejection.message;
    setError(null);
    const key = uuid();
    const s = tried.step;
    const verdict = s?.verdict;
    const undone = full.type === "undo" ? tried.state.undone[tried.state.undone.length - 1] : undefined;
    const pending: StepView = {
      seq: v.steps.length,
      key,
      type: full.type,
      node: full.type === "undo" ? null : full.node,
      kind: s?.kind ?? null,
      answer: s?.answer ?? null,
      typed: full.type === "reading" ? full.reading : full.type === "nameplate" ? full.value : null,
      value: verdict?.reading.value ?? s?.nameplate?.value ?? null,
      unit: verdict?.reading.unit ?? s?.nameplate?.unit ?? null,
      si: verdict?.reading.si ?? s?.nameplate?.si ?? null,
      siUnit: verdict?.reading.siUnit ?? s?.nameplate?.siUnit ?? null,
      verdict: verdict?.verdict ?? null,
      call: full.type === "reading" ? ((full as PracticeEntry & { type: "reading" }).call ?? null) : null,
      message: verdict?.message ?? (s?.nameplate ? `${s.nameplate.display} ${s.nameplate.unit}` : null),
      limitsText: verdict?.limits.text ?? null,
      meterId: full.type === "reading" ? meterId : null,
      meter: full.type === "reading" ? (full.meter ?? null) : null,
      confirmed: full.type === "reading" && full.confirmed === true,
      to: s?.to ?? null,
      undone: false,
      undoesSeq: undone ?? null,
      enteredBy: v.viewer.id,
      recordedAt: new Date().toISOString(),
      pending: true,
    };
    set((old) => ({
      ...old,
      steps: [...old.steps.map((x) => (undone !== undefined && x.seq === undone ? { ...x, undone: true } : x)), pending],
    }));
    step.mutate({ key, entry: full, meterId: full.type === "reading" ? meterId : null, at: pending.recordedAt });
    return null;
  }

  const note = useMutation({
    ...writes,
    mutationFn: (p: { key: string; node: string; text: string }) => postJson<{ note: NoteView }>(`/api/runs/${id}/notes`, p),
    onMutate: (p) => set((v) => ({ ...v, notes: [...v.notes, { id: p.key, key: p.key, node: p.node, text: p.text, author: "", createdAt: new Date().toISOString(), pending: true }] })),
    onSuccess: (res, p) => set((v) => ({ ...v, notes: v.notes.map((n) => (n.key === p.key ? res.note : n)) })),
    onError: (e, p) => {
      set((v) => ({ ...v, notes: v.notes.filter((n) => n.key !== p.key) }));
      setError(e instanceof ApiError ? e.message : "The note was not saved.");
    },
  });

  const photo = useMutation({
    ...writes,
    mutationFn: (p: { key: string; node: string; file: File }) => {
      const form = new FormData();
      form.set("key", p.key);
      form.set("node", p.node);
      form.set("photo", p.file);
      return postForm<{ photo: PhotoView }>(`/api/runs/${id}/photos`, form);
    },
    onSuccess: (res) => set((v) => ({ ...v, photos: [...v.photos.filter((x) => x.key !== res.photo.key), res.photo] })),
    onError: (e) => setError(e instanceof ApiError ? e.message : "The photo was not saved."),
  });

  const status = useMutation({
    ...writes,
    retry: false,
    mutationFn: (p: { action: "pause" | "resume" | "abandon" | "escalate" | "take-over"; reason?: string }) => postJson<{ status: RunView["run"]["status"] }>(`/api/runs/${id}/status`, p),
    onSuccess: () => qc.invalidateQueries({ queryKey }),
    onError: (e) => setError(e instanceof ApiError ? e.message : "That did not go through."),
  });

  const outcome = useMutation({
    ...writes,
    mutationFn: (p: { action: string; minutes: number; parts: { partNumber: string; description: string; quantity: number }[] }) =>
      postJson<{ reportId: string; number: number }>(`/api/runs/${id}/outcome`, p),
    onSuccess: () => qc.invalidateQueries({ queryKey }),
    onError: (e) => setError(e instanceof ApiError ? e.message : "The outcome was not saved."),
  });

  const sendReport = useMutation({
    mutationKey: ["report-send", id],
    mutationFn: (reportId: string) => postJson<{ to: string }>(`/api/reports/${reportId}/send`, {}),
    onSuccess: () => qc.invalidateQueries({ queryKey }),
    onError: (e) => setError(e instanceof ApiError ? e.message : "The report was not sent."),
  });

  const saving = useIsMutating({ mutationKey: ["run-write", id] });
  const waiting = useMutationState({ filters: { mutationKey: ["run-write", id], status: "pending" }, select: (m) => m.state.isPaused }).filter(Boolean).length;

  return {
    view,
    state,
    current,
    byId,
    submit,
    addNote: (node: string, text: string) => note.mutate({ key: uuid(), node, text }),
    addPhoto: (node: string, file: File) => photo.mutate({ key: uuid(), node, file }),
    photoUploading: photo.isPending,
    setStatus: status.mutateAsync,
    statusPending: status.isPending,
    recordOutcome: outcome.mutateAsync,
    outcomePending: outcome.isPending,
    sendReport,
    saving,
    waiting,
    error,
    setError,
  };
}

export type RunHandle = ReturnType<typeof useRun>;

function stripMeter(entry: LogEntry): LogEntry {
  if (entry.type !== "reading") return entry;
  const { meter: _meter, ...rest } = entry;
  return rest;
}
