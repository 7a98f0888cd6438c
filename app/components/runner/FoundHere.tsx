// "Found here before" on the phone: one quiet line under a step (how the shop's earlier completed
// runs of this tree went there) and under a root cause (how often it was found on the same make
// and model). Loaded once per run from GET /api/insights/found-here; nothing shows below the API's
// threshold, on a practice run (no hints for the trainee), or when it can't be loaded (offline).
import { useQuery } from "@tanstack/react-query";
import { causeSentence, stepSentence, type FoundHere } from "~/lib/insights/found-here";
import { getJson } from "./api";
import type { RunHandle } from "./useRun";

function useFoundHere(run: RunHandle): FoundHere | undefined {
  const { version, unit, run: r } = run.view;
  const q = new URLSearchParams({ version: version.id, ...(unit ? { unit: unit.id } : {}) });
  const { data } = useQuery({
    queryKey: ["found-here", version.id, unit?.id ?? null],
    queryFn: () => getJson<FoundHere>(`/api/insights/found-here?${q}`),
    enabled: !r.practice,
    staleTime: 10 * 60_000,
    retry: false,
  });
  return data;
}

/** The line for a node, or null: a step's earlier branches, or how often a root cause was found (never "0 of …"). */
export function foundHereLine(found: FoundHere | undefined, node: { id: string; kind: string }): string | null {
  if (!found) return null;
  if (node.kind === "outcome") {
    const n = found.causes?.outcomes.find((o) => o.node === node.id)?.runs ?? 0;
    return n > 0 ? causeSentence(found, node.id) : null;
  }
  const step = found.shown ? found.steps.find((s) => s.node === node.id) : undefined;
  return step && step.runs > 0 ? stepSentence(step) : null;
}

export function FoundHereLine({ run, node }: { run: RunHandle; node: { id: string; kind: string } }) {
  const line = foundHereLine(useFoundHere(run), node);
  if (!line) return null;
  return (
    <p className="text-base leading-snug text-ink-soft" aria-label="Found here before">
      <span aria-hidden="true">↺ </span>
      {line}
    </p>
  );
}
