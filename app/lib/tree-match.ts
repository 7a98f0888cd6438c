// Which published trees fit a service call: the unit's equipment (its category, and the kind of
// that equipment its make and model name — a deck oven is not a convection oven, a gas fryer is not
// an electric one) and the words of the symptom the customer reported. Pure: the call page's model
// uses it, and the unit tests check it alone.
import type { EquipmentCategory } from "../engine/types";

/**
 * Words that tell kinds of equipment apart inside a category. Two words of one group exclude each
 * other (a unit named "deck oven" is not served by a tree written for "convection ovens"); a unit
 * or tree that names no word of a group fits any. Common practice in the trade: the heat source
 * and, for ovens, the build decide which faults and readings apply.
 */
export const KIND_GROUPS: readonly { name: string; words: Readonly<Record<string, string>> }[] = [
  { name: "heat source", words: { gas: "gas", lp: "gas", propane: "gas", natural: "gas", electric: "electric" } },
  {
    name: "build",
    words: { convection: "convection", deck: "deck", conveyor: "conveyor", combi: "combi", combination: "combi", rack: "rack" },
  },
];

/** The kinds a text names, by group ("EO-6 electric deck oven" → heat source: electric, build: deck). */
export function kindsIn(text: string): Map<string, string> {
  const out = new Map<string, string>();
  for (const raw of text.toLowerCase().match(/[a-z]+/g) ?? []) {
    for (const g of KIND_GROUPS) {
      const kind = g.words[raw];
      if (kind && !out.has(g.name)) out.set(g.name, kind);
    }
  }
  return out;
}

/** Words that carry meaning in a symptom ("heats unevenly" → heat, uneven). */
export function symptomWords(text: string): Set<string> {
  const out = new Set<string>();
  for (const raw of text.toLowerCase().match(/[a-z]+/g) ?? []) {
    if (raw.length < 3 || STOP.has(raw)) continue;
    out.add(raw.replace(/(?:ly|ing|ed|es|s)$/, "") || raw);
  }
  return out;
}
const STOP = new Set(["the", "and", "not", "one", "than", "other", "side", "unit", "with", "for", "does", "doesn", "won", "from", "but"]);

export type UnitKind = { category: EquipmentCategory; make: string; model: string };
export type TreeToMatch = { title: string; category: EquipmentCategory; symptom: string; equipment: string | null };

export type TreeFit = {
  /** Symptom words the call and the tree share. */
  score: number;
  sameCategory: boolean;
  /** Kinds the unit and the tree both name (e.g. "deck"). */
  kindsShared: number;
  /** Where the tree is written for another kind than the unit: "convection, not deck"; null when it isn't. */
  otherKind: string | null;
  /** Same category and no kind against the unit's: a tree to offer for this call. */
  fits: boolean;
};

/** How well one tree fits a call on a unit. */
export function fitOf(unit: UnitKind, symptom: string, tree: TreeToMatch): TreeFit {
  const reported = symptomWords(symptom);
  const own = symptomWords(`${tree.title} ${tree.symptom}`);
  let score = 0;
  for (const w of reported) if (own.has(w)) score++;
  const unitKinds = kindsIn(`${unit.make} ${unit.model}`);
  const treeKinds = kindsIn(`${tree.title} ${tree.equipment ?? ""}`);
  let kindsShared = 0;
  const against: string[] = [];
  for (const [group, kind] of unitKinds) {
    const theirs = treeKinds.get(group);
    if (theirs === kind) kindsShared++;
    else if (theirs) against.push(`${theirs}, not ${kind}`);
  }
  const sameCategory = tree.category === unit.category;
  const otherKind = sameCategory && against.length ? against.join("; ") : null;
  return { score, sameCategory, kindsShared, otherKind, fits: sameCategory && otherKind === null };
}

/**
 * Trees for a call, best first: those that fit the unit (its category, no kind against it) ranked
 * by shared symptom words, then by kinds named alike; then the same category's trees for another
 * kind; then the rest of the library. The first is a best match only when it fits and shares a word.
 */
export function rankTrees<T extends TreeToMatch>(unit: UnitKind, symptom: string, trees: readonly T[]): (T & TreeFit)[] {
  const rank = (t: TreeFit) => (t.fits ? 0 : t.sameCategory ? 1 : 2);
  return trees
    .map((t) => ({ ...t, ...fitOf(unit, symptom, t) }))
    .sort((a, b) => rank(a) - rank(b) || b.score - a.score || b.kindsShared - a.kindsShared || a.title.localeCompare(b.title));
}

/** Whether the first of a ranked list is worth calling the best match. */
export function isBestMatch(t: TreeFit | undefined): boolean {
  return Boolean(t && t.fits && t.score > 0);
}
