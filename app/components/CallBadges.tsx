// Priority and status of a service call, in words and colour.
const PRIORITY: Record<string, { label: string; cls: string }> = {
  urgent: { label: "Urgent", cls: "bg-out text-white" },
  high: { label: "High", cls: "bg-out-soft text-out" },
  normal: { label: "Normal", cls: "bg-paper text-ink" },
  low: { label: "Low", cls: "bg-paper text-ink-soft" },
};
const STATUS: Record<string, { label: string; cls: string }> = {
  open: { label: "Open", cls: "bg-copper-soft text-copper-dark" },
  in_progress: { label: "In progress", cls: "bg-marginal-soft text-marginal" },
  escalated: { label: "With a lead", cls: "bg-marginal-soft text-marginal" },
  done: { label: "Done", cls: "bg-within-soft text-within" },
  cancelled: { label: "Cancelled", cls: "bg-paper text-ink-soft" },
};

const pill = "inline-block rounded-full px-2.5 py-0.5 text-sm font-bold";

export function PriorityBadge({ priority }: { priority: string }) {
  const p = PRIORITY[priority] ?? PRIORITY.normal!;
  return <span className={`${pill} ${p.cls}`}>{p.label}</span>;
}

export function StatusBadge({ status }: { status: string }) {
  const s = STATUS[status] ?? STATUS.open!;
  return <span className={`${pill} ${s.cls}`}>{s.label}</span>;
}
