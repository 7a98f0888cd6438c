// What the editor puts into a node it creates, before the author has written anything. Kept in
// the engine so the editor builds new nodes from these and validation can flag any of them left
// in a tree (a placeholder must never reach a technician as if it were the procedure).
import type { NodeKind } from "./types";

export const DEFAULT_TITLE: Readonly<Record<NodeKind, string>> = {
  question: "New question",
  measurement: "New measurement",
  step: "New step",
  caution: "New caution",
  nameplate: "New nameplate value",
  outcome: "New root cause",
  escalate: "Needs a lead",
};

/** A new outcome's remedy. */
export const DEFAULT_REMEDY = "Say what to do about it.";

/** A new escalation's reason. */
export const DEFAULT_REASON = "Say why a lead should take over.";

/** The variable a new nameplate input records (numbered on when taken: rated_value_2…). */
export const DEFAULT_VARIABLE = "rated_value";

const TITLES: ReadonlySet<string> = new Set(Object.values(DEFAULT_TITLE));
const LONGEST = Math.max(...[...TITLES].map((t) => t.length));

/**
 * True when a title is one of the editor's placeholders (of any kind: copied nodes keep theirs),
 * also as the editor numbers repeats ("New root cause 2"). Titles are trimmed by the schema.
 */
export function isDefaultTitle(title: string): boolean {
  if (title.length > LONGEST + 5) return false;
  return TITLES.has(title) || TITLES.has(title.replace(/ \d{1,4}$/, ""));
}
