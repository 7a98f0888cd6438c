// Pure: what the runner shows is the run as the server last sent it with what is still only on
// the phone laid over it, judged by the same engine, in order. Also how an accepted answer from
// the server is folded into the stored run, how a run started offline looks before the server has
// it, and how to say in words what is waiting.
import { tryEntry, type LogEntry } from "~/engine/traversal";
import type { Tree } from "~/engine/types";
import type { KitCall, KitVersion } from "~/lib/field-kit";
import { logOf, meterAccuracy, type MeterView, type NoteView, type PhotoView, type RunView, type StepView } from "~/lib/run-log";
import type { KitMeta, OutboxItem } from "./db";

/** The server's answer to a step. */
export type StepResponse = { step: StepView; replayed: boolean; run: { status: RunView["run"]["status"]; currentNode: string | null; endKind: string | null; stepCount: number } };

/** A reading judged with the chosen shop meter's accuracy, else the procedure's own meter. */
export function withMeter(tree: Tree, meters: MeterView[], entry: LogEntry, meterId: string | null): LogEntry {
  if (entry.type !== "reading") return entry;
  const m = meterId ? meters.find((x) => x.id === meterId) : undefined;
  if (m) return { ...entry, meter: meterAccuracy(m) };
  const node = tree.nodes.find((n) => n.id === entry.node);
  return node?.kind === "measurement" && node.meter ? { ...entry, meter: node.meter } : entry;
}

/** The step the engine makes of `entry` after `steps`, as the runner shows it; or its refusal. */
export function stepFor(
  tree: Tree,
  steps: StepView[],
  entry: LogEntry,
  p: { key: string; meterId: string | null; at: string; enteredBy: string },
): { ok: true; step: StepView } | { ok: false; message: string } {
  const tried = tryEntry(tree, logOf(steps), entry);
  if (!tried.ok) return { ok: false, message: tried.rejection.message };
  const s = tried.step;
  const verdict = s?.verdict;
  const undone = entry.type === "undo" ? tried.state.undone[tried.state.undone.length - 1] : undefined;
  return {
    ok: true,
    step: {
      seq: steps.length,
      key: p.key,
      type: entry.type,
      node: entry.type === "undo" ? null : entry.node,
      kind: s?.kind ?? null,
      answer: s?.answer ?? null,
      typed: entry.type === "reading" ? entry.reading : entry.type === "nameplate" ? entry.value : null,
      value: verdict?.reading.value ?? s?.nameplate?.value ?? null,
      unit: verdict?.reading.unit ?? s?.nameplate?.unit ?? null,
      si: verdict?.reading.si ?? s?.nameplate?.si ?? null,
      siUnit: verdict?.reading.siUnit ?? s?.nameplate?.siUnit ?? null,
      verdict: verdict?.verdict ?? null,
      message: verdict?.message ?? (s?.nameplate ? `${s.nameplate.display} ${s.nameplate.unit}` : null),
      limitsText: verdict?.limits.text ?? null,
      meterId: entry.type === "reading" ? p.meterId : null,
      meter: entry.type === "reading" ? (entry.meter ?? null) : null,
      to: s?.to ?? null,
      undone: false,
      undoesSeq: undone ?? null,
      enteredBy: p.enteredBy,
      recordedAt: p.at,
      pending: true,
    },
  };
}

/** Marks the step an undo took back. */
function takeBack(steps: StepView[], undoesSeq: number | null): StepView[] {
  return undoesSeq === null ? steps : steps.map((x) => (x.seq === undoesSeq ? { ...x, undone: true } : x));
}

/**
 * The run as the runner shows it: the server's run with the phone's queued steps, notes and photos
 * after it, in order. A queued step the engine no longer takes (the run moved on elsewhere) is left
 * out here; the server will refuse it and the technician sees it among the refused.
 */
export function overlay(server: RunView, items: OutboxItem[], photoUrl: (item: OutboxItem & { kind: "photo" }) => string): RunView {
  const queued = items.filter((i) => i.runId === server.run.id && i.state === "queued");
  if (!queued.length) return server;
  let steps = server.steps;
  const notes: NoteView[] = [...server.notes];
  const photos: PhotoView[] = [...server.photos];
  for (const i of queued) {
    if (i.kind === "step") {
      const r = stepFor(server.tree, steps, i.entry, { key: i.key, meterId: i.meterId, at: i.at, enteredBy: server.viewer.id });
      if (r.ok) steps = [...takeBack(steps, r.step.undoesSeq), r.step];
    } else if (i.kind === "note") {
      notes.push({ id: i.key, key: i.key, node: i.node, text: i.text, author: "", createdAt: i.at, pending: true });
    } else if (i.kind === "photo") {
      photos.push({ id: i.key, key: i.key, node: i.node, url: photoUrl(i), bytes: i.photo.size, createdAt: i.at, pending: true });
    }
  }
  return { ...server, steps, notes, photos };
}

/** The stored run after the server accepted a step. */
export function withAcceptedStep(view: RunView, res: StepResponse): RunView {
  const has = view.steps.some((s) => s.key === res.step.key);
  const steps = takeBack(has ? view.steps.map((s) => (s.key === res.step.key ? res.step : s)) : [...view.steps, res.step], res.step.undoesSeq);
  return { ...view, steps, run: { ...view.run, ...res.run } };
}

export function withAcceptedNote(view: RunView, note: NoteView): RunView {
  return { ...view, notes: [...view.notes.filter((n) => n.key !== note.key), note] };
}

export function withAcceptedPhoto(view: RunView, photo: PhotoView): RunView {
  return { ...view, photos: [...view.photos.filter((p) => p.key !== photo.key), photo] };
}

/** A run started on the phone, as the runner shows it until the server has it. */
export function localRunView(p: { runId: string; at: string; call: KitCall; version: KitVersion; kit: KitMeta }): RunView {
  const me = p.kit.user;
  return {
    run: {
      id: p.runId,
      status: "active",
      practice: false,
      stepCount: 0,
      currentNode: p.version.tree.start,
      endKind: null,
      rootCause: null,
      actionTaken: null,
      minutesOnJob: null,
      abandonReason: null,
      startedAt: p.at,
      pausedAt: null,
      completedAt: null,
      technician: me,
      startedBy: me,
    },
    call: { id: p.call.id, number: p.call.number, symptom: p.call.symptom, priority: p.call.priority },
    unit: p.call.unit,
    version: { id: p.version.id, treeId: p.version.treeId, number: p.version.number, title: p.version.title },
    tree: p.version.tree,
    bodies: p.version.bodies,
    description: p.version.description,
    steps: [],
    notes: [],
    photos: [],
    parts: [],
    meters: p.kit.meters,
    escalation: null,
    report: null,
    viewer: { id: me.id, holds: true, canTakeOver: false },
    timeZone: p.kit.timeZone,
  };
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** "3 steps and 1 photo" — what the items are, in words (a start counts as the run itself). */
export function describeItems(items: readonly OutboxItem[]): string {
  const count = (k: OutboxItem["kind"]) => items.filter((i) => i.kind === k).length;
  const parts = [
    count("start") ? "the run's start" : "",
    count("step") ? plural(count("step"), "step") : "",
    count("note") ? plural(count("note"), "note") : "",
    count("photo") ? plural(count("photo"), "photo") : "",
  ].filter(Boolean);
  if (parts.length <= 1) return parts[0] ?? "nothing";
  return `${parts.slice(0, -1).join(", ")} and ${parts[parts.length - 1]}`;
}
