// How the editor names each kind of node, and what a new one starts as. Shared by the palette,
// the outline, the canvas and the node forms.
import { DEFAULT_REASON, DEFAULT_REMEDY, DEFAULT_TITLE, DEFAULT_VARIABLE } from "~/engine/defaults";
import { CATEGORIES, type NodeKind, type TreeNode } from "~/engine/types";

export const KIND_LABEL: Record<NodeKind, string> = {
  question: "Question",
  measurement: "Measurement",
  step: "Step",
  caution: "Caution",
  nameplate: "Nameplate value",
  outcome: "Outcome",
  escalate: "Hand to a lead",
};

/** One line each, for the palette: what the technician sees at a node of this kind. */
export const KIND_HINT: Record<NodeKind, string> = {
  question: "The technician picks an answer; each answer leads on.",
  measurement: "A reading judged against limits: low, within, high (or marginal).",
  step: "An instruction to carry out, then on to the next node.",
  caution: "A hazard the technician must acknowledge before going on.",
  nameplate: "A rating read off the unit, kept for later limits.",
  outcome: "The root cause found, with the remedy and parts.",
  escalate: "Ends the run by handing it to a lead, with the reason.",
};

/** A short mark shown beside each node so kinds can be told apart without colour. */
export const KIND_MARK: Record<NodeKind, string> = {
  question: "?",
  measurement: "≈",
  step: "→",
  caution: "!",
  nameplate: "#",
  outcome: "✓",
  escalate: "↑",
};

export const CATEGORY_OPTIONS = CATEGORIES.map((c) => ({
  value: c,
  label: c === "hot-holding" ? "Hot holding" : c.charAt(0).toUpperCase() + c.slice(1),
}));

export function categoryLabel(c: string): string {
  return CATEGORY_OPTIONS.find((o) => o.value === c)?.label ?? c;
}

/** Palette order: the usual flow of a tree. */
export const PALETTE_KINDS: NodeKind[] = ["question", "measurement", "step", "caution", "nameplate", "outcome", "escalate"];

/** The title a new node of `kind` starts with (the draft numbers repeats: see newTitle). */
export function defaultTitle(kind: NodeKind): string {
  return DEFAULT_TITLE[kind];
}

/** A node of `kind` that the engine's schema accepts, for the author to fill in. */
export function newNode(kind: NodeKind, id: string, variable = DEFAULT_VARIABLE, title = DEFAULT_TITLE[kind]): TreeNode {
  switch (kind) {
    case "question":
      return { id, kind, title, answers: [] };
    case "measurement":
      return {
        id,
        kind,
        title,
        quantity: "voltage",
        unit: "V",
        limits: { kind: "range", min: { value: 0 }, max: { value: 0 } },
        branches: {},
      };
    case "step":
      return { id, kind, title };
    case "caution":
      return { id, kind, title, hazard: "electrical" };
    case "nameplate":
      return { id, kind, title, variable, quantity: "voltage", unit: "V" };
    case "outcome":
      return { id, kind, title, remedy: DEFAULT_REMEDY, parts: [] };
    case "escalate":
      return { id, kind, title, reason: DEFAULT_REASON };
  }
}
