// A stored step as the run view gives it, for tests of the run log: an acknowledged caution at the
// rotisserie tree's lockout step unless the test says otherwise.
import type { StepView } from "../../app/lib/run-log";

export const storedStep = (over: Partial<StepView> = {}): StepView => ({
  seq: 0,
  key: crypto.randomUUID(),
  type: "acknowledge",
  node: "lockout",
  kind: "caution",
  answer: null,
  typed: null,
  value: null,
  unit: null,
  si: null,
  siUnit: null,
  verdict: null,
  message: null,
  limitsText: null,
  meterId: null,
  meter: null,
  to: null,
  undone: false,
  undoesSeq: null,
  enteredBy: "u",
  recordedAt: new Date(0).toISOString(),
  ...over,
});
