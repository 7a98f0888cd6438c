// A small tree used by the authoring tests: question → measurement → two outcomes.
// 1.5 µF ± 6 %: a fan-motor run capacitor and the field rule for replacing one (REFERENCES.md,
// trade practice / common practice).
import type { LogEntry } from "../../app/engine/traversal";
import type { Tree } from "../../app/engine/types";

/** trees/rotisserie-uneven-heat.md walked to the capacitor measurement: three cautions, 208 V
 * across L1–L2, one fan slow, the capacitor's caution, its rating 1.5 µF. */
export const ROTISSERIE_TO_CAPACITOR: LogEntry[] = [
  { type: "acknowledge", node: "lockout" },
  { type: "acknowledge", node: "discharge-caps" },
  { type: "acknowledge", node: "live-test" },
  { type: "reading", node: "supply-voltage", reading: "208 V" },
  { type: "answer", node: "fans", answer: "one slow" },
  { type: "acknowledge", node: "cap-lockout" },
  { type: "nameplate", node: "cap-rating", value: "1.5 µF" },
];

export function smallTree(title = "Fan hums but won't turn"): Tree {
  return {
    title,
    category: "rotisserie",
    symptom: "The convection fan hums but does not turn",
    start: "cap-look",
    nodes: [
      {
        id: "cap-look",
        kind: "question",
        title: "Is the run capacitor bulging or leaking?",
        answers: [
          { label: "yes", to: "cap-failed" },
          { label: "no", to: "cap-measure" },
        ],
      },
      {
        id: "cap-measure",
        kind: "measurement",
        title: "Run capacitor against its rating",
        quantity: "capacitance",
        unit: "µF",
        limits: { kind: "nominal", nominal: { value: 1.5 }, tolerance: { kind: "percent", plus: 6, minus: 6 } },
        branches: { low: { to: "cap-failed" }, within: { to: "motor-failed" }, high: { to: "cap-failed" } },
      },
      {
        id: "cap-failed",
        kind: "outcome",
        title: "Failed run capacitor",
        remedy: "Replace it with one of the same µF and voltage rating.",
        parts: ["Motor-run capacitor"],
      },
      { id: "motor-failed", kind: "outcome", title: "Failed fan motor", remedy: "Replace the fan motor.", parts: [] },
    ],
  };
}
