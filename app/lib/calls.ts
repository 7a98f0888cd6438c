// Service-call priorities and statuses, and how they read. Shared by the schema, server and client.
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
