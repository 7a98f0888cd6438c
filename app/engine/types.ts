// The tree model: what a lead tech authors and a technician walks.
// Plain data (JSON-safe), so it can sit in a DB column, travel to the phone and round-trip
// through the Markdown tree format. The zod schemas in ./schema accept exactly these shapes.

export const NODE_KINDS = ["question", "measurement", "step", "caution", "nameplate", "outcome", "escalate"] as const;
export type NodeKind = (typeof NODE_KINDS)[number];

/** Physical quantities a reading or nameplate value can have. Each maps to one dimension. */
export const QUANTITIES = [
  "voltage",
  "current",
  "resistance",
  "capacitance",
  "temperature",
  "pressure",
  "power",
  "frequency",
  "time",
  "rotation",
] as const;
export type Quantity = (typeof QUANTITIES)[number];

export const CATEGORIES = ["rotisserie", "fryer", "oven", "griddle", "hot-holding", "range", "broiler", "steamer", "other"] as const;
export type EquipmentCategory = (typeof CATEGORIES)[number];

export const HAZARDS = ["electrical", "stored-energy", "gas", "hot-oil", "hot-surface", "steam", "moving-parts", "other"] as const;
export type Hazard = (typeof HAZARDS)[number];

export const VERDICTS = ["low", "within", "high", "marginal"] as const;
export type VerdictKind = (typeof VERDICTS)[number];

/** IEC 60062 tolerance letters supported on a nominal value. */
export const TOLERANCE_LETTERS = ["B", "C", "D", "F", "G", "J", "K", "M", "Z"] as const;
export type ToleranceLetter = (typeof TOLERANCE_LETTERS)[number];

/**
 * A branch taken more than once on purpose (re-measure, re-test) is a bounded re-check loop:
 * it may be taken at most `max` times in one run; the next time the run goes to `onExceed`,
 * or, without one, ends escalated ("re-check limit reached").
 */
export interface Recheck {
  max: number;
  onExceed?: string;
}

export interface Branch {
  to: string;
  recheck?: Recheck;
}

export interface Answer extends Branch {
  /** What the technician taps; unique within the question. Also the key in the run log. */
  label: string;
}

/** A value in a limit: a number (in `unit`, default the node's unit) or a formula over the run's variables. */
export type LimitValue = { value: number; unit?: string } | { formula: string; unit?: string };

export type Tolerance =
  | { kind: "percent"; plus: number; minus: number }
  | { kind: "absolute"; plus: number; minus: number; unit?: string }
  | { kind: "letter"; letter: ToleranceLetter };

export type Limits =
  | { kind: "range"; min: LimitValue; max: LimitValue }
  | { kind: "atLeast"; min: LimitValue }
  | { kind: "atMost"; max: LimitValue }
  | { kind: "nominal"; nominal: LimitValue; tolerance: Tolerance };

/** A meter's stated accuracy: ±(percent % of reading + counts × resolution). */
export interface Meter {
  percent: number;
  counts: number;
  resolution: number;
  /** Unit of the resolution (and the scale the percentage applies to); default the node's unit. */
  unit?: string;
  /**
   * Top of the meter's range in `unit`, when the shop lists it: a reading above it is refused
   * (the meter can't show it), and an overload ("OL") counts as high when it is at or above the
   * step's upper limit. Trees don't carry it; the runner passes the chosen shop meter's.
   */
  range?: number;
}

export type Acceptance = "simple" | "guarded";

interface NodeBase {
  id: string;
  title: string;
  /** Markdown, kept as written (images allowed). */
  body?: string;
}

export interface QuestionNode extends NodeBase {
  kind: "question";
  answers: Answer[];
}

export interface MeasurementNode extends NodeBase {
  kind: "measurement";
  quantity: Quantity;
  /** Display unit, as the author writes it: "µF", "V", "°F", "inWC", "Ω". */
  unit: string;
  limits: Limits;
  /** Records the reading (in `unit`) under this name for later formulas. */
  variable?: string;
  meter?: Meter;
  acceptance?: Acceptance;
  branches: Partial<Record<VerdictKind, Branch>>;
}

export interface StepNode extends NodeBase {
  kind: "step";
  next?: Branch;
}

export interface CautionNode extends NodeBase {
  kind: "caution";
  hazard?: Hazard;
  next?: Branch;
}

export interface NameplateNode extends NodeBase {
  kind: "nameplate";
  variable: string;
  quantity: Quantity;
  unit: string;
  next?: Branch;
}

export interface OutcomeNode extends NodeBase {
  kind: "outcome";
  /** The title is the root cause; the remedy says what to do about it. */
  remedy: string;
  parts: string[];
}

export interface EscalateNode extends NodeBase {
  kind: "escalate";
  reason: string;
}

export type TreeNode = QuestionNode | MeasurementNode | StepNode | CautionNode | NameplateNode | OutcomeNode | EscalateNode;

export interface Tree {
  title: string;
  category: EquipmentCategory;
  symptom: string;
  /** Free text: which models or families the tree covers. */
  equipment?: string;
  /** Id of the first node. */
  start: string;
  /** Markdown introduction shown before the first step. */
  description?: string;
  nodes: TreeNode[];
}

// ---------------------------------------------------------------------------------------------
// Validation

export type Severity = "error" | "warning";

export interface Finding {
  severity: Severity;
  code: string;
  message: string;
  nodeId?: string;
  /** Index into tree.nodes (useful when ids are duplicated). */
  nodeIndex?: number;
  /** Which part of the node: "limits", "unit", "meter", "variable", "next", "branch:low", "answer:<label>"… */
  field?: string;
  /** Ids of other nodes this finding accounts for: what a missing branch target or an unreachable step cuts off. */
  covers?: string[];
}
