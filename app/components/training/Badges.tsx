// Training's small marks: a scenario's check, an assignment's state, a right or wrong cause.
import type { AssignmentState } from "~/lib/training";

const pill = "inline-block rounded-full px-2.5 py-0.5 text-sm font-bold";

export function CheckBadge({ ok, errors }: { ok: boolean; errors?: number }) {
  return ok ? (
    <span className={`${pill} bg-within-soft text-within`}>Check passed</span>
  ) : (
    <span className={`${pill} bg-out-soft text-out`}>Needs fixing{errors ? ` (${errors})` : ""}</span>
  );
}

const STATE: Record<AssignmentState, string> = {
  "to do": "bg-copper-soft text-copper-dark",
  "in progress": "bg-marginal-soft text-marginal",
  abandoned: "bg-paper text-ink-soft",
  finished: "bg-practice-soft text-practice",
  reviewed: "bg-within-soft text-within",
  withdrawn: "bg-paper text-ink-soft",
};
const STATE_WORD: Record<AssignmentState, string> = {
  "to do": "To do",
  "in progress": "In progress",
  abandoned: "Abandoned — can start again",
  finished: "Finished — waiting for review",
  reviewed: "Reviewed",
  withdrawn: "Withdrawn",
};

export function StateBadge({ state }: { state: AssignmentState }) {
  return <span className={`${pill} ${STATE[state]}`}>{STATE_WORD[state]}</span>;
}

export function CauseMark({ right }: { right: boolean }) {
  return right ? (
    <span className={`${pill} bg-within-soft text-within`}>✓ Right cause</span>
  ) : (
    <span className={`${pill} bg-out-soft text-out`}>✗ Wrong cause</span>
  );
}
