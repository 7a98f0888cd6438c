// "Found here before": the shape the runner receives and the sentences it shows. Pure, so the
// runner can format what it loaded with the run (and keep it offline later).

/** Below this many completed real runs nothing is shown: a handful of runs says little about the next one. */
export const FOUND_HERE_MIN_RUNS = 10;

export type FoundHereBranch = { branch: string; label: string; runs: number };
export type FoundHereStep = { node: string; runs: number; branches: FoundHereBranch[] };
export type FoundHereCause = { node: string; runs: number };

export type FoundHere = {
  threshold: number;
  /** Completed real runs of this tree (every version) in the shop. */
  treeRuns: number;
  /** False below the threshold: then `steps` is empty. */
  shown: boolean;
  steps: FoundHereStep[];
  /** Present when the run has a unit: completed runs of this tree on the same make and model. */
  causes: { make: string; model: string; runs: number; shown: boolean; outcomes: FoundHereCause[] } | null;
};

const VERDICT_WORDS: Record<string, string> = { low: "low", within: "within limits", high: "high", marginal: "marginal" };

/** How a stored branch key reads: the answer's label, or the verdict in words. */
export function branchLabel(branch: string): string {
  return branch.startsWith("answer:") ? branch.slice(7) : (VERDICT_WORDS[branch] ?? branch);
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** "41 earlier runs at this step: 27 one slow · 9 both stopped · 5 both at full speed" */
export function stepSentence(step: FoundHereStep): string {
  return `${plural(step.runs, "earlier run")} at this step: ${step.branches.map((b) => `${b.runs} ${b.label}`).join(" · ")}`;
}

/** "Found in 14 of 31 completed runs of this tree on Vantor RCF-2208" (null below the threshold or never found). */
export function causeSentence(found: FoundHere, node: string): string | null {
  const c = found.causes;
  if (!c?.shown) return null;
  const n = c.outcomes.find((o) => o.node === node)?.runs ?? 0;
  return `Found in ${n} of ${plural(c.runs, "completed run")} of this tree on ${`${c.make} ${c.model}`.trim()}`;
}
