// Training, shared by the server and the browser (pure): how a scenario's world travels in a form,
// what the phone is told about a practice run, and how durations read.
import { nodeBranches } from "../engine/graph";
import type { World } from "../engine/training/script";
import type { Tree, TreeNode } from "../engine/types";

/** The word a review or a scenario's walk puts above a step of each kind (an outcome has none). */
export const STEP_KIND_WORD: Partial<Record<TreeNode["kind"], string>> = {
  question: "Question",
  measurement: "Reading",
  nameplate: "Rating",
  caution: "Caution",
  step: "Instruction",
};

/** Each part of a scripted step, and the kind of step it belongs to. */
export const WORLD_PARTS = { observation: "question", answer: "question", shows: "measurement", label: "nameplate" } as const;
export type WorldPart = keyof typeof WORLD_PARTS;

/** The form field for one part of a scripted step: "world.fans.observation". */
export const worldField = (node: string, part: WorldPart) => `world.${node}.${part}`;

/** The scripted world from a form's fields. A step left blank is not scripted. */
export function worldFromForm(values: Record<string, string>): World {
  const parts: Record<string, Partial<Record<WorldPart, string>>> = {};
  for (const [k, v] of Object.entries(values)) {
    const m = /^world\.([^.]+)\.(observation|answer|shows|label)$/.exec(k);
    if (!m) continue;
    (parts[m[1]!] ??= {})[m[2] as WorldPart] = v.trim();
  }
  const world: World = {};
  for (const [node, p] of Object.entries(parts)) {
    if (p.observation || p.answer) world[node] = { kind: "question", observation: p.observation ?? "", answer: p.answer ?? "" };
    else if (p.shows) world[node] = { kind: "measurement", shows: p.shows };
    else if (p.label) world[node] = { kind: "nameplate", label: p.label };
  }
  return world;
}

/** The form's fields for a scripted world (to fill the form when editing). */
export function worldToForm(world: World): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [node, s] of Object.entries(world)) {
    if (s.kind === "question") {
      out[worldField(node, "observation")] = s.observation;
      out[worldField(node, "answer")] = s.answer;
    } else if (s.kind === "measurement") out[worldField(node, "shows")] = s.shows;
    else out[worldField(node, "label")] = s.label;
  }
  return out;
}

/** What the phone is told about a practice run: never the answer an observation means, and the hidden fault only once the run is finished. */
export interface PracticeView {
  scenario: { id: string; name: string; complaint: string; unitText: string };
  /** What the trainee meets at each scripted step. */
  world: Record<string, { observation?: string; shows?: string; label?: string }>;
  fault: { node: string; title: string } | null;
}

/** The world as the trainee may see it: observations, meter values and labels, no answers. */
export function worldForTrainee(world: World): PracticeView["world"] {
  const out: PracticeView["world"] = {};
  for (const [node, s] of Object.entries(world))
    out[node] = s.kind === "question" ? { observation: s.observation } : s.kind === "measurement" ? { shows: s.shows } : { label: s.label };
  return out;
}

/** "45 s", "3 min 05 s", "1 h 02 min"; "—" when not known. */
export function duration(ms: number | null | undefined): string {
  if (ms === null || ms === undefined || !Number.isFinite(ms)) return "—";
  const s = Math.round(ms / 1000);
  if (s < 60) return `${s} s`;
  const m = Math.floor(s / 60);
  if (m < 60) return `${m} min ${String(s % 60).padStart(2, "0")} s`;
  return `${Math.floor(m / 60)} h ${String(m % 60).padStart(2, "0")} min`;
}

export type AssignmentState = "to do" | "in progress" | "abandoned" | "finished" | "reviewed" | "withdrawn";

/** Where an assignment stands, from its run and review. */
export function assignmentState(a: {
  withdrawnAt: Date | string | null;
  runStatus: string | null;
  reviewedAt: Date | string | null;
}): AssignmentState {
  if (a.withdrawnAt) return "withdrawn";
  if (a.reviewedAt) return "reviewed";
  if (!a.runStatus) return "to do";
  if (a.runStatus === "done") return "finished";
  if (a.runStatus === "abandoned") return "abandoned";
  return "in progress";
}

/** The steps a script speaks for (questions, measurements, nameplates), in the order a walk from the start meets them. */
export function scriptableSteps(tree: Tree): TreeNode[] {
  const byId = new Map(tree.nodes.map((n) => [n.id, n]));
  const seen = new Set<string>();
  const order: TreeNode[] = [];
  const queue = [tree.start];
  while (queue.length) {
    const n = byId.get(queue.shift()!);
    if (!n || seen.has(n.id)) continue;
    seen.add(n.id);
    order.push(n);
    for (const { branch } of nodeBranches(n)) queue.push(branch.to, ...(branch.recheck?.onExceed ? [branch.recheck.onExceed] : []));
  }
  for (const n of tree.nodes) if (!seen.has(n.id)) order.push(n);
  return order.filter((n) => n.kind === "question" || n.kind === "measurement" || n.kind === "nameplate");
}
