// The go / cancel pair at the foot of a runner panel.
export function PanelButtons({
  go,
  disabled,
  danger,
  onCancel,
}: {
  go: string;
  disabled?: boolean;
  danger?: boolean;
  onCancel: () => void;
}) {
  return (
    <div className="flex gap-2">
      <button type="submit" className={`min-h-14 flex-1 ${danger ? "btn bg-out text-white" : "btn-primary"}`} disabled={disabled}>
        {go}
      </button>
      <button type="button" className="btn-quiet min-h-14 flex-1" onClick={onCancel}>
        Cancel
      </button>
    </div>
  );
}
