// What a run looks like on the wire (GET /api/runs/:id) and how its step rows turn back into the
// engine's log. Pure: the phone and the server replay the same log with the same engine.
import type { LogEntry } from "../engine/traversal";
import type { EquipmentCategory, Meter, NodeKind, Quantity, Tree, VerdictKind } from "../engine/types";
import type { MdBlock } from "./md";
import type { PracticeView } from "./training";

export type StepType = LogEntry["type"];
export type RunStatus = "active" | "paused" | "escalated" | "abandoned" | "done";

export interface StepView {
  seq: number;
  key: string;
  type: StepType;
  node: string | null;
  kind: NodeKind | null;
  answer: string | null;
  typed: string | null;
  value: number | null;
  unit: string | null;
  si: number | null;
  siUnit: string | null;
  verdict: VerdictKind | null;
  /** On a practice reading: the trainee's own call (the branch the run followed). */
  call?: VerdictKind | null;
  message: string | null;
  limitsText: string | null;
  meterId: string | null;
  meter: Meter | null;
  /** The technician confirmed this implausible reading when the engine asked (decision 0103). */
  confirmed?: boolean;
  /** Where the step sent the run (null when it ended it, and for undo). */
  to: string | null;
  undone: boolean;
  undoesSeq: number | null;
  enteredBy: string;
  recordedAt: string;
  /** Client only: sent, not yet confirmed by the server. */
  pending?: boolean;
}

export interface NoteView {
  id: string;
  key: string;
  node: string;
  text: string;
  author: string;
  createdAt: string;
  pending?: boolean;
}

export interface PhotoView {
  id: string;
  key: string;
  node: string;
  url: string;
  bytes: number;
  createdAt: string;
  /** Client only: kept on the phone, not yet accepted by the server (url is the phone's copy). */
  pending?: boolean;
}

export interface PartView {
  partNumber: string;
  description: string;
  quantity: number;
}

export interface MeterView {
  id: string;
  name: string;
  quantity: Quantity;
  unit: string;
  rangeMax: number;
  resolution: number;
  percent: number;
  counts: number;
}

export interface RunView {
  run: {
    id: string;
    status: RunStatus;
    practice: boolean;
    stepCount: number;
    currentNode: string | null;
    endKind: string | null;
    rootCause: string | null;
    actionTaken: string | null;
    minutesOnJob: number | null;
    abandonReason: string | null;
    startedAt: string;
    pausedAt: string | null;
    completedAt: string | null;
    technician: { id: string; name: string };
    startedBy: { id: string; name: string };
  };
  call: { id: string; number: number; symptom: string; priority: string } | null;
  unit: {
    id: string;
    category: EquipmentCategory;
    make: string;
    model: string;
    serial: string;
    nameplate: Record<string, { value: number; unit: string }>;
    site: string;
    customer: string;
    contactName: string;
    contactEmail: string;
  } | null;
  version: { id: string; treeId: string; number: number | null; title: string };
  tree: Tree;
  /** Each node's body as safe blocks, by node id. */
  bodies: Record<string, MdBlock[]>;
  description: MdBlock[];
  steps: StepView[];
  notes: NoteView[];
  photos: PhotoView[];
  parts: PartView[];
  meters: MeterView[];
  /** A practice run's scenario, as the trainee may see it; null for a real run. */
  practice: PracticeView | null;
  escalation: { id: string; reason: string; raisedBy: string; raisedAt: string; takenBy: string | null; fromTree: boolean } | null;
  report: { id: string; number: number; sentTo: string | null; sentAt: string | null } | null;
  viewer: { id: string; holds: boolean; canTakeOver: boolean };
  /** The shop's time zone, for showing times. */
  timeZone: string;
}

/** Beside a reading the technician confirmed when the engine asked whether it was right (run log, report). */
export const CONFIRMED_NOTE = "(confirmed as read)";

/** A step as the phone sends it: the log entry (without a meter) and the shop meter chosen. */
export interface StepPayload {
  key: string;
  entry: LogEntry;
  meterId?: string | null;
  at?: string;
}

/**
 * How many steps a run has done: the entries it stands on, leaving out undos and the steps they
 * took back (a step taken back and done again counts once). The one count Cluepath shows — the
 * runner's "Step 7 · 6 done", the hand-over list's "after 6 steps" — equal to the length of the
 * engine's replayed path.
 */
export function stepsDone(steps: readonly Pick<StepView, "type" | "undone">[]): number {
  let n = 0;
  for (const s of steps) if (s.type !== "undo" && !s.undone) n++;
  return n;
}

/** The engine's log entry a stored step stands for (the meter is the accuracy kept with it). */
export function entryOf(s: Pick<StepView, "type" | "node" | "answer" | "typed" | "meter" | "call" | "confirmed">): LogEntry {
  const node = s.node ?? "";
  switch (s.type) {
    case "undo":
      return { type: "undo" };
    case "answer":
      return { type: "answer", node, answer: s.answer ?? "" };
    case "reading": {
      const e: Extract<LogEntry, { type: "reading" }> = s.meter
        ? { type: "reading", node, reading: s.typed ?? "", meter: s.meter }
        : { type: "reading", node, reading: s.typed ?? "" };
      // The confirmation goes with the reading it was given for (a practice log replays as new entries).
      if (s.confirmed) e.confirmed = true;
      // A practice reading carries the trainee's call (app/engine/training/practice.ts).
      return s.call ? Object.assign(e, { call: s.call }) : e;
    }
    case "nameplate":
      return { type: "nameplate", node, value: s.typed ?? "" };
    case "acknowledge":
      return { type: "acknowledge", node };
    case "continue":
      return { type: "continue", node };
  }
}

export function logOf(steps: readonly StepView[]): LogEntry[] {
  return [...steps].sort((a, b) => a.seq - b.seq).map(entryOf);
}

/**
 * The engine's Meter for a shop meter: its accuracy and the top of its range, so a reading the
 * meter can't show is refused and "OL" is judged against the range (decisions 0102, 0103).
 */
export function meterAccuracy(m: Pick<MeterView, "percent" | "counts" | "resolution" | "unit" | "rangeMax">): Meter {
  return { percent: m.percent, counts: m.counts, resolution: m.resolution, unit: m.unit, range: m.rangeMax };
}

/**
 * What identifies a step's content, for telling a retry from a different step under one key. A
 * reading's `confirmed: true` is part of it (`confirmed: false` reads as no confirmation).
 */
export function canonicalPayload(entry: LogEntry, meterId: string | null | undefined): string {
  const e = entry as Record<string, unknown>;
  const fields = Object.keys(e)
    .filter((k) => k !== "meter" && (k !== "confirmed" || e[k] === true))
    .sort()
    .map((k) => [k, typeof e[k] === "string" ? (e[k] as string).trim() : e[k]]);
  return JSON.stringify({ entry: Object.fromEntries(fields), meterId: meterId ?? null });
}

/** Where a run photo is served (only to the run's own shop). */
export function photoUrl(id: string): string {
  return `/api/photos/${id}`;
}
