// Which node is open, which pane shows, and where focus goes next. On a laptop the three columns
// show at once (canvas or outline in the middle); on a phone one pane at a time, as tabs. Opening
// a node from anywhere (outline, canvas, a check's link) selects it and shows its form; adding one
// opens its form with focus in its title; after a delete, focus goes to the node that led to the
// deleted one (in the outline or on the canvas). Each of these is announced to screen readers.
import { useCallback, useEffect, useState, type Dispatch } from "react";
import { announce } from "~/components/Announcer";
import { nodeBranches } from "~/engine/graph";
import type { NodeKind, Tree, TreeNode } from "~/engine/types";
import { newTitle, type DraftAction } from "./draft";
import { KIND_LABEL } from "./kinds";

export type Pane = "outline" | "canvas" | "node" | "checks";

/** The element that shows `nodeId` in the middle column: its outline row or its canvas box. */
function nodeElement(nodeId: string | null): HTMLElement | null {
  const q = (s: string) => document.querySelector<HTMLElement>(s);
  if (nodeId) {
    const id = CSS.escape(nodeId);
    // On the canvas, the focusable wrapper of a box carries its id (only the canvas chunk names reactflow's classes).
    const el = q(`#pane-outline [data-node="${id}"]`) ?? q(`#pane-canvas [data-id="${id}"][tabindex]`);
    if (el) return el;
  }
  return q(`#pane-outline [role="treeitem"][tabindex="0"]`) ?? q("#pane-canvas") ?? q("#pane-outline");
}

export function useSelection(tree: Tree, dispatch: Dispatch<DraftAction>) {
  const [pane, setPane] = useState<Pane>("outline");
  const [wideView, setWideView] = useState<"canvas" | "outline">("canvas");
  const [mounted, setMounted] = useState(false);
  const [wide, setWide] = useState(false);
  const [focusField, setFocusField] = useState<string | undefined>();
  // Where focus goes once the screen has caught up with a delete (a fresh object each time).
  const [focusAfter, setFocusAfter] = useState<{ nodeId: string | null } | null>(null);

  useEffect(() => {
    setMounted(true);
    const mq = window.matchMedia("(min-width: 1024px)");
    const update = () => setWide(mq.matches);
    update();
    mq.addEventListener("change", update);
    return () => mq.removeEventListener("change", update);
  }, []);

  useEffect(() => {
    if (!focusAfter) return;
    const raf = requestAnimationFrame(() => nodeElement(focusAfter.nodeId)?.focus());
    return () => cancelAnimationFrame(raf);
  }, [focusAfter]);

  const open = useCallback(
    (nodeId: string, field?: string) => {
      dispatch({ type: "select", id: nodeId });
      setFocusField(field);
      setPane("node");
      // On a phone the pane that was used disappears: focus goes on to the node's form.
      if (!wide && !field) requestAnimationFrame(() => document.getElementById("pane-node")?.focus());
    },
    [dispatch, wide],
  );
  const add = (kind: NodeKind) => {
    const title = newTitle(tree, kind);
    dispatch({ type: "add-node", kind });
    setFocusField("title");
    setPane("node");
    announce(`Added a new ${KIND_LABEL[kind].toLowerCase()}, ‘${title}’. Its form is open.`);
  };
  const act = useCallback(
    (a: DraftAction) => {
      dispatch(a);
      if (a.type === "delete-node") setPane("outline");
    },
    [dispatch],
  );
  /** After a confirmed delete (the draft has already dropped `node`). */
  const deleted = (node: TreeNode) => {
    const parent = tree.nodes.find((n) => n.id !== node.id && nodeBranches(n).some(({ branch }) => branch.to === node.id));
    setFocusAfter({ nodeId: parent?.id ?? null });
    announce(`Deleted ‘${node.title}’.${parent ? ` ‘${parent.title}’ led to it: choose where that branch goes now.` : ""}`);
  };

  return {
    pane,
    setPane,
    wideView,
    setWideView,
    mounted,
    wide,
    focusField,
    /** What the middle column shows: the laptop's choice, or the phone's tab. */
    centerView: wide ? wideView : pane === "canvas" ? ("canvas" as const) : ("outline" as const),
    open,
    add,
    act,
    deleted,
  };
}

export type Selection = ReturnType<typeof useSelection>;
