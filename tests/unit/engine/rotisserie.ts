// The two-fan rotisserie starter tree and the walks the engine tests take through it.
import { readFileSync } from "node:fs";
import { parseTree } from "../../../app/engine/markdown/parse";
import type { LogEntry } from "../../../app/engine/traversal";
import type { Tree } from "../../../app/engine/types";

export function loadTree(file: string): Tree {
  const r = parseTree(readFileSync(new URL(`../../../trees/${file}`, import.meta.url), "utf8"));
  if (!r.ok) throw new Error(`${file}: ${JSON.stringify(r.errors)}`);
  return r.tree;
}

export const rotisserie = loadTree("rotisserie-uneven-heat.md");

/** The three cautions before the supply reading. */
export const TO_SUPPLY: LogEntry[] = [
  { type: "acknowledge", node: "lockout" },
  { type: "acknowledge", node: "discharge-caps" },
  { type: "acknowledge", node: "live-test" },
];

/** The path a browser test walks: supply, one slow fan, its capacitor's rating. */
export const TO_CAPACITOR: LogEntry[] = [
  ...TO_SUPPLY,
  { type: "reading", node: "supply-voltage", reading: "208 V" },
  { type: "answer", node: "fans", answer: "one slow" },
  { type: "acknowledge", node: "cap-lockout" },
  { type: "nameplate", node: "cap-rating", value: "1.5 µF" },
];

/** Fans good, self-test reports `fault`: on to the elements or the probe. */
function pastFans(fault: "probe fault" | "element fault"): LogEntry[] {
  return [
    ...TO_SUPPLY,
    { type: "reading", node: "supply-voltage", reading: "208 V" },
    { type: "answer", node: "fans", answer: "both at full speed" },
    { type: "answer", node: "fan-direction", answer: "yes" },
    { type: "continue", node: "self-test" },
    { type: "answer", node: "self-test-result", answer: fault },
  ];
}

/** Up to the temperature at the probe (a °C step), a Pt1000 recorded. */
export const TO_AMBIENT: LogEntry[] = [
  ...pastFans("probe fault"),
  { type: "acknowledge", node: "probe-lockout" },
  { type: "answer", node: "probe-clean", answer: "yes" },
  { type: "nameplate", node: "probe-type", value: "1000 Ω" },
];

/** Up to the element's resistance, rated 208 V and 2000 W. */
export const TO_ELEMENT: LogEntry[] = [
  ...pastFans("element fault"),
  { type: "acknowledge", node: "element-lockout" },
  { type: "nameplate", node: "element-volts", value: "208 V" },
  { type: "nameplate", node: "element-watts", value: "2000 W" },
];
