// Pure, and without the engine (so My calls and /phone load no engine code): how the server's
// answers are folded into the stored run, how a run started offline looks before the server has
// it, and how to say in words what is waiting.
import type { KitCall, KitVersion } from "~/lib/field-kit";
import type { NoteView, PhotoView, RunView, StepView } from "~/lib/run-log";
import type { KitMeta, OutboxItem } from "./db";

/** The server's answer to a step. */
export type StepResponse = {
  step: StepView;
  replayed: boolean;
  run: { status: RunView["run"]["status"]; currentNode: string | null; endKind: string | null; stepCount: number };
};

/** Marks the step an undo took back. */
export function takeBack(steps: StepView[], undoesSeq: number | null): StepView[] {
  return undoesSeq === null ? steps : steps.map((x) => (x.seq === undoesSeq ? { ...x, undone: true } : x));
}

/** The stored run after the server accepted a step. */
export function withAcceptedStep(view: RunView, res: StepResponse): RunView {
  const has = view.steps.some((s) => s.key === res.step.key);
  const steps = takeBack(
    has ? view.steps.map((s) => (s.key === res.step.key ? res.step : s)) : [...view.steps, res.step],
    res.step.undoesSeq,
  );
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
    practice: null,
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
