// Which node is open and which pane shows: on a laptop the three columns show at once (canvas or
// outline in the middle); on a phone one pane at a time, as tabs. Opening a node from anywhere
// (outline, canvas, a check's link) selects it and shows its form.
import { useCallback, useEffect, useState, type Dispatch } from "react";
import type { NodeKind } from "~/engine/types";
import type { DraftAction } from "./draft";

export type Pane = "outline" | "canvas" | "node" | "checks";

export function useSelection(dispatch: Dispatch<DraftAction>) {
  const [pane, setPane] = useState<Pane>("outline");
  const [wideView, setWideView] = useState<"canvas" | "outline">("canvas");
  const [mounted, setMounted] = useState(false);
  const [wide, setWide] = useState(false);
  const [focusField, setFocusField] = useState<string | undefined>();

  useEffect(() => {
    setMounted(true);
    const mq = window.matchMedia("(min-width: 1024px)");
    const update = () => setWide(mq.matches);
    update();
    mq.addEventListener("change", update);
    return () => mq.removeEventListener("change", update);
  }, []);

  const open = useCallback(
    (nodeId: string, field?: string) => {
      dispatch({ type: "select", id: nodeId });
      setFocusField(field);
      setPane("node");
    },
    [dispatch],
  );
  const add = (kind: NodeKind) => {
    dispatch({ type: "add-node", kind });
    setPane("node");
  };
  const act = useCallback(
    (a: DraftAction) => {
      dispatch(a);
      if (a.type === "delete-node") setPane("outline");
    },
    [dispatch],
  );

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
  };
}

export type Selection = ReturnType<typeof useSelection>;
