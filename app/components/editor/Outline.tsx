// The outline view: the draft as an indented list, operable from the keyboard (a tree view:
// ↑ ↓ move, → opens or goes in, ← closes or goes out, Home / End, Enter opens the node's form).
// It edits the same draft as the canvas; on a phone it is the main editing surface.
import { useEffect, useMemo, useRef, useState, type KeyboardEvent } from "react";
import type { Tree } from "~/engine/types";
import { KIND_LABEL, KIND_MARK } from "./kinds";
import { outlineRows, visibleRows, type OutlineRow } from "./outline";

export type NodeMarks = Map<string, { errors: number; warnings: number }>;

type Props = {
  tree: Tree;
  selected: string | null;
  marks: NodeMarks;
  /** Open a node's form (Enter, click). `field` names a branch to look at ("low", "next"). */
  onOpen: (nodeId: string, field?: string) => void;
};

export function Outline({ tree, selected, marks, onOpen }: Props) {
  const rows = useMemo(() => outlineRows(tree), [tree]);
  const [collapsed, setCollapsed] = useState<Set<string>>(new Set());
  const shown = useMemo(() => visibleRows(rows, collapsed), [rows, collapsed]);
  const [focusKey, setFocusKey] = useState<string | null>(null);
  const refs = useRef(new Map<string, HTMLLIElement>());
  const pendingFocus = useRef<string | null>(null);

  const current = shown.find((r) => r.key === focusKey) ?? shown.find((r) => r.type === "node" && r.nodeId === selected) ?? shown[0];
  const byNode = useMemo(() => new Map(rows.filter((r) => r.type === "node").map((r) => [r.nodeId, r])), [rows]);

  useEffect(() => {
    const k = pendingFocus.current;
    if (k) {
      pendingFocus.current = null;
      refs.current.get(k)?.focus();
    }
  });

  const focus = (r: OutlineRow | undefined) => {
    if (!r) return;
    setFocusKey(r.key);
    pendingFocus.current = r.key;
    refs.current.get(r.key)?.focus();
  };
  const setOpen = (r: OutlineRow, open: boolean) =>
    setCollapsed((c) => {
      const n = new Set(c);
      if (open) n.delete(r.key);
      else n.add(r.key);
      return n;
    });

  const activate = (r: OutlineRow) => {
    if (r.type === "ref") {
      const target = byNode.get(r.nodeId);
      if (target) {
        // Open every collapsed ancestor of the written-out row, then go there.
        setCollapsed((c) => {
          const n = new Set(c);
          for (let p = target.parent; p; p = rows.find((x) => x.key === p)?.parent ?? null) n.delete(p);
          return n;
        });
        setFocusKey(target.key);
        pendingFocus.current = target.key;
      }
      onOpen(r.nodeId);
    } else if (r.type === "open") onOpen(r.nodeId, r.viaKey ?? undefined);
    else if (r.type === "missing") {
      const parent = rows.find((x) => x.key === r.parent);
      if (parent) onOpen(parent.nodeId, r.viaKey ?? undefined);
    } else onOpen(r.nodeId);
  };

  const onKey = (e: KeyboardEvent, r: OutlineRow) => {
    const i = shown.indexOf(r);
    const open = r.children > 0 && !collapsed.has(r.key);
    switch (e.key) {
      case "ArrowDown":
        focus(shown[i + 1]);
        break;
      case "ArrowUp":
        focus(shown[i - 1]);
        break;
      case "ArrowRight":
        if (r.children > 0 && !open) setOpen(r, true);
        else if (open) focus(shown[i + 1]);
        break;
      case "ArrowLeft":
        if (open) setOpen(r, false);
        else focus(shown.find((x) => x.key === r.parent));
        break;
      case "Home":
        focus(shown[0]);
        break;
      case "End":
        focus(shown[shown.length - 1]);
        break;
      case "Enter":
      case " ":
        activate(r);
        break;
      default:
        return;
    }
    e.preventDefault();
  };

  if (!tree.nodes.length) {
    return <p className="card text-ink-soft">No nodes yet. Add the first one — usually a caution or a question — with “Add a node”.</p>;
  }

  const siblings = (r: OutlineRow) => shown.filter((x) => x.parent === r.parent && x.detached === r.detached);
  const firstDetached = shown.find((r) => r.detached && r.depth === 1);

  return (
    <ul role="tree" aria-label="Outline of the draft" className="space-y-1">
      {shown.map((r) => {
        const node = r.type === "node" || r.type === "ref" ? tree.nodes.find((n) => n.id === r.nodeId) : undefined;
        const sib = siblings(r);
        const mark = r.type === "node" ? marks.get(r.nodeId) : undefined;
        const isSelected = r.type === "node" && r.nodeId === selected;
        return (
          <li
            key={r.key}
            ref={(el) => {
              if (el) refs.current.set(r.key, el);
              else refs.current.delete(r.key);
            }}
            role="treeitem"
            data-node={r.type === "node" ? r.nodeId : undefined}
            aria-level={r.depth}
            aria-setsize={sib.length}
            aria-posinset={sib.indexOf(r) + 1}
            aria-expanded={r.children > 0 ? !collapsed.has(r.key) : undefined}
            aria-selected={isSelected}
            tabIndex={current?.key === r.key ? 0 : -1}
            onKeyDown={(e) => onKey(e, r)}
            onClick={(e) => {
              e.stopPropagation();
              setFocusKey(r.key);
              activate(r);
            }}
            onFocus={(e) => {
              if (e.target === e.currentTarget) setFocusKey(r.key);
            }}
            className={[
              "flex min-h-12 cursor-pointer items-center gap-2 rounded-lg border px-2 py-1",
              isSelected ? "border-copper bg-copper-soft" : "border-transparent hover:border-rule hover:bg-card",
              r === firstDetached ? "mt-4" : "",
            ].join(" ")}
            style={{ marginLeft: `${(r.depth - 1) * 1.25}rem` }}
          >
            {r === firstDetached && <span className="sr-only">Not reached from the first node: </span>}
            {r.children > 0 ? (
              <button
                type="button"
                tabIndex={-1}
                aria-hidden="true"
                className="inline-flex size-11 shrink-0 items-center justify-center rounded text-ink-soft hover:bg-paper lg:size-8"
                onClick={(e) => {
                  e.stopPropagation();
                  setOpen(r, collapsed.has(r.key));
                }}
              >
                {collapsed.has(r.key) ? "▸" : "▾"}
              </button>
            ) : (
              <span className="inline-block size-11 shrink-0 lg:size-8" aria-hidden="true" />
            )}
            {r.via !== null && (
              <span className="shrink-0 rounded bg-paper px-1.5 py-0.5 text-sm font-semibold text-ink-soft">{r.via} →</span>
            )}
            {r.loop && <span className="shrink-0 text-sm text-ink-soft">(re-check)</span>}
            <RowBody row={r} title={node?.title} kind={node?.kind} start={tree.start === r.nodeId && r.type === "node"} />
            {mark && mark.errors > 0 && (
              <span className="ml-auto shrink-0 rounded bg-out-soft px-1.5 text-sm font-semibold text-out">
                {mark.errors} error{mark.errors === 1 ? "" : "s"}
              </span>
            )}
            {mark && mark.errors === 0 && mark.warnings > 0 && (
              <span className="ml-auto shrink-0 rounded bg-marginal-soft px-1.5 text-sm font-semibold text-marginal">
                {mark.warnings} warning{mark.warnings === 1 ? "" : "s"}
              </span>
            )}
          </li>
        );
      })}
    </ul>
  );
}

function RowBody({ row, title, kind, start }: { row: OutlineRow; title?: string; kind?: keyof typeof KIND_LABEL; start: boolean }) {
  if (row.type === "open") return <span className="italic text-out">not connected yet — choose where it leads</span>;
  if (row.type === "missing") return <span className="italic text-out">missing node ‘{row.nodeId}’</span>;
  return (
    <span className="min-w-0 flex-1">
      <span aria-hidden="true" className="mr-1.5 inline-flex size-6 items-center justify-center rounded border border-ink-soft text-sm">
        {KIND_MARK[kind!]}
      </span>
      <span className="sr-only">{KIND_LABEL[kind!]}: </span>
      <span className={row.type === "ref" ? "text-ink-soft" : "font-semibold"}>{title}</span>
      {row.type === "ref" && (
        <span className="text-sm text-ink-soft">
          {" "}
          (see above<span className="sr-only">; press Enter to go there</span>)
        </span>
      )}
      {start && <span className="ml-2 rounded bg-copper-soft px-1.5 text-sm font-semibold text-copper-dark">first</span>}
    </span>
  );
}
