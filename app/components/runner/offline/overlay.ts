// Pure: what the runner shows is the run as the server last sent it with what is still only on
// the phone laid over it, judged by the same engine, in order (fold.ts has the rest, engine-free).
import { practiceTryEntry, type PracticeEntry } from "~/engine/training/practice";
import { tryEntry, type LogEntry } from "~/engine/traversal";
import type { Tree } from "~/engine/types";
import { logOf, meterAccuracy, type MeterView, type NoteView, type PhotoView, type RunView, type StepView } from "~/lib/run-log";
import type { OutboxItem } from "./db";
import { takeBack } from "./fold";

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
  p: { key: string; meterId: string | null; at: string; enteredBy: string; practice: boolean },
): { ok: true; step: StepView } | { ok: false; message: string } {
  // A practice run follows the trainee's call on each reading (app/engine/training/practice.ts).
  const tried = p.practice
    ? practiceTryEntry(tree, logOf(steps) as PracticeEntry[], entry as PracticeEntry)
    : tryEntry(tree, logOf(steps), entry);
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
      call: entry.type === "reading" ? ((entry as PracticeEntry & { type: "reading" }).call ?? null) : null,
      message: verdict?.message ?? (s?.nameplate ? `${s.nameplate.display} ${s.nameplate.unit}` : null),
      limitsText: verdict?.limits.text ?? null,
      meterId: entry.type === "reading" ? p.meterId : null,
      meter: entry.type === "reading" ? (entry.meter ?? null) : null,
      // As the server stores it: only a reading the engine asked about is kept as confirmed.
      confirmed: s?.confirmed === true,
      to: s?.to ?? null,
      undone: false,
      undoesSeq: undone ?? null,
      enteredBy: p.enteredBy,
      recordedAt: p.at,
      pending: true,
    },
  };
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
      const r = stepFor(server.tree, steps, i.entry, {
        key: i.key,
        meterId: i.meterId,
        at: i.at,
        enteredBy: server.viewer.id,
        practice: server.run.practice,
      });
      if (r.ok) steps = [...takeBack(steps, r.step.undoesSeq), r.step];
    } else if (i.kind === "note") {
      notes.push({ id: i.key, key: i.key, node: i.node, text: i.text, author: "", createdAt: i.at, pending: true });
    } else if (i.kind === "photo") {
      photos.push({ id: i.key, key: i.key, node: i.node, url: photoUrl(i), bytes: i.photo.size, createdAt: i.at, pending: true });
    }
  }
  return { ...server, steps, notes, photos };
}
