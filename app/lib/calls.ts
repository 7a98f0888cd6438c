// Service-call priorities and statuses, and how they read. Shared by the schema, server and client.
import type { RunStatus } from "./run-log";
export const CALL_PRIORITIES = ["low", "normal", "high", "urgent"] as const;
export type CallPriority = (typeof CALL_PRIORITIES)[number];

/** open → in_progress (a run started) → escalated ⇄ in_progress → done; cancelled from any but done. */
export const CALL_STATUSES = ["open", "in_progress", "escalated", "done", "cancelled"] as const;
export type CallStatus = (typeof CALL_STATUSES)[number];

export const PRIORITY_LABEL: Record<CallPriority, string> = { low: "Low", normal: "Normal", high: "High", urgent: "Urgent" };
export const STATUS_LABEL: Record<CallStatus, string> = {
  open: "Open",
  in_progress: "In progress",
  escalated: "With a lead",
  done: "Done",
  cancelled: "Cancelled",
};

/** How a run's status reads in lists. */
export const RUN_STATUS_LABEL: Record<RunStatus, string> = {
  active: "In progress",
  paused: "Paused",
  escalated: "With a lead",
  abandoned: "Abandoned",
  done: "Finished",
};

export type OpenRunState = { status: RunStatus; heldByMe: boolean; holder: string };

/** What the way into a call's open run says to the technician: carry on, resume, or that a lead has it now. */
export function openRunLine(run: OpenRunState): string {
  if (run.status === "escalated") return "Waiting for a lead — open the run";
  if (!run.heldByMe) return `${run.holder} has taken over the run — read it`;
  return run.status === "paused" ? "Resume the paused run" : "Carry on with the run";
}
