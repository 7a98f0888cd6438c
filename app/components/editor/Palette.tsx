// Add a node of any kind. The first node added becomes the tree's first node.
import { useId } from "react";
import type { NodeKind } from "~/engine/types";
import { KIND_HINT, KIND_LABEL, KIND_MARK, PALETTE_KINDS } from "./kinds";

export function Palette({ onAdd }: { onAdd: (kind: NodeKind) => void }) {
  const id = useId();
  return (
    <section aria-labelledby={`${id}-heading`} className="space-y-2">
      <h2 id={`${id}-heading`} className="text-lg font-bold">
        Add a node
      </h2>
      <ul className="grid grid-cols-2 gap-2 lg:grid-cols-1 lg:gap-1.5">
        {PALETTE_KINDS.map((k) => (
          <li key={k}>
            <button
              type="button"
              className="flex min-h-12 w-full items-center gap-2 rounded-lg border border-rule bg-card px-2 py-1.5 text-left text-base leading-tight hover:border-copper lg:min-h-10"
              onClick={() => onAdd(k)}
              title={KIND_HINT[k]}
              aria-describedby={`${id}-${k}`}
            >
              <span
                aria-hidden="true"
                className="inline-flex size-7 shrink-0 items-center justify-center rounded border border-ink text-base"
              >
                {KIND_MARK[k]}
              </span>
              <span className="font-semibold">
                <span className="sr-only">Add </span>
                {KIND_LABEL[k]}
              </span>
              <span id={`${id}-${k}`} className="sr-only">
                {KIND_HINT[k]}
              </span>
            </button>
          </li>
        ))}
      </ul>
    </section>
  );
}
