// zod schemas for the tree model. They check shape (kinds, required fields, id and name
// patterns, finite numbers); the meaning (graph, units, limits, formulas) is ./validate's job,
// so a draft with a negative tolerance or a dangling branch still parses and gets a finding.
// zod/mini (functional checks, tree-shakeable: ~4 KB gzip instead of ~25 KB for classic zod);
// the schemas still have .parse / .safeParse for routes and editor forms.
import * as z from "zod/mini";
import {
  CATEGORIES,
  HAZARDS,
  NODE_KINDS,
  QUANTITIES,
  TOLERANCE_LETTERS,
  type Tree,
  type TreeNode,
  type Limits,
  type Meter,
  type Answer,
  type Branch,
} from "./types";

/** Node ids: lower-case words joined by hyphens ("check-fan-rotation"). */
export const NODE_ID_PATTERN = /^[a-z0-9]+(?:-[a-z0-9]+)*$/;
/** Formula variable names: letters, digits and underscores, starting with a letter. */
export const VARIABLE_PATTERN = /^[A-Za-z][A-Za-z0-9_]*$/;
/** A unit as written in a tree: one token, no spaces or backticks, not starting with a digit or sign. */
export const UNIT_PATTERN = /^[^\s`0-9+\-−±.,()][^\s`()]*$/;

/**
 * The longest text each field takes, in UTF-16 code units (JavaScript's string length). Each fits the
 * database column that stores it: a varchar(N) holds N characters, a TEXT column 65,535 bytes, and
 * one code unit is at most 3 bytes of UTF-8 (tests/integration/caps.test.ts compares them).
 */
export const TEXT_CAPS = {
  treeTitle: 200,
  symptom: 300,
  equipment: 300,
  nodeTitle: 300,
  /** An answer's label; stored as the branch key "answer:<label>" in 220 characters. */
  answer: 200,
  remedy: 500,
  part: 500,
  reason: 500,
  formula: 500,
  /** A node's body or the tree's description (TEXT: 20,000 × 3 bytes fit in 65,535). */
  body: 20_000,
} as const;

const oneLine = (what: string, max: number) =>
  z.string().check(
    z.minLength(1, `${what} is empty`),
    z.maxLength(max, `${what} is longer than ${max} characters`),
    z.refine((s) => !/[\r\n\u2028\u2029]/.test(s), `${what} must fit on one line`),
    z.refine((s) => s === s.trim(), `${what} has spaces at the start or end`),
  );

export const NodeIdSchema = z
  .string()
  .check(
    z.maxLength(64, "ids are at most 64 characters"),
    z.regex(NODE_ID_PATTERN, "ids are lower-case words joined by hyphens, like check-fan-rotation"),
  );
export const VariableSchema = z
  .string()
  .check(
    z.maxLength(64, "variable names are at most 64 characters"),
    z.regex(VARIABLE_PATTERN, "variable names are letters, digits and _ and start with a letter, like rated_uf"),
  );
export const UnitSchema = z.string().check(
  z.maxLength(32, "a unit is at most 32 characters"),
  z.regex(UNIT_PATTERN, "a unit is one word like µF, V, °F or inWC"),
  z.refine((s) => !["to", "letter", "%", "/", "least", "most"].includes(s), "that word can't be a unit"),
);
/** zod 4 numbers are finite already (no NaN, no Infinity). */
const finite = z.number();
const body = z.string().check(
  z.minLength(1),
  z.maxLength(TEXT_CAPS.body, `a body is longer than ${TEXT_CAPS.body} characters`),
  z.refine((s) => s === normaliseBody(s), "body has blank lines or spaces at the start or end"),
);

/** Bodies are kept as written, minus leading blank lines and trailing whitespace. */
export function normaliseBody(s: string): string {
  return s
    .replace(/\r\n?/g, "\n")
    .replace(/^(?:[ \t]*\n)+/, "")
    .trimEnd();
}

export const RecheckSchema = z.strictObject({
  max: z.int(),
  onExceed: z.optional(NodeIdSchema),
});
export const BranchSchema = z.strictObject({ to: NodeIdSchema, recheck: z.optional(RecheckSchema) });
export const AnswerSchema = z.strictObject({
  label: oneLine("An answer", TEXT_CAPS.answer),
  to: NodeIdSchema,
  recheck: z.optional(RecheckSchema),
});

const formula = z.string().check(
  z.minLength(1),
  z.maxLength(TEXT_CAPS.formula),
  z.refine((s) => !/[`\r\n\u2028\u2029]/.test(s) && s === s.trim(), "a formula is one line without backticks"),
);

export const LimitValueSchema = z.union([
  z.strictObject({ value: finite, unit: z.optional(UnitSchema) }),
  z.strictObject({ formula, unit: z.optional(UnitSchema) }),
]);

export const ToleranceSchema = z.discriminatedUnion("kind", [
  z.strictObject({ kind: z.literal("percent"), plus: finite, minus: finite }),
  z.strictObject({ kind: z.literal("absolute"), plus: finite, minus: finite, unit: z.optional(UnitSchema) }),
  z.strictObject({ kind: z.literal("letter"), letter: z.enum(TOLERANCE_LETTERS) }),
]);

export const LimitsSchema = z.discriminatedUnion("kind", [
  z.strictObject({ kind: z.literal("range"), min: LimitValueSchema, max: LimitValueSchema }),
  z.strictObject({ kind: z.literal("atLeast"), min: LimitValueSchema }),
  z.strictObject({ kind: z.literal("atMost"), max: LimitValueSchema }),
  z.strictObject({ kind: z.literal("nominal"), nominal: LimitValueSchema, tolerance: ToleranceSchema }),
]);

export const MeterSchema = z.strictObject({
  percent: finite,
  counts: finite,
  resolution: finite,
  unit: z.optional(UnitSchema),
});

const base = {
  id: NodeIdSchema,
  title: oneLine("A title", TEXT_CAPS.nodeTitle),
  body: z.optional(body),
};

export const QuestionSchema = z.strictObject({
  ...base,
  kind: z.literal("question"),
  answers: z.array(AnswerSchema),
});
export const MeasurementSchema = z.strictObject({
  ...base,
  kind: z.literal("measurement"),
  quantity: z.enum(QUANTITIES),
  unit: UnitSchema,
  limits: LimitsSchema,
  variable: z.optional(VariableSchema),
  meter: z.optional(MeterSchema),
  acceptance: z.optional(z.enum(["simple", "guarded"])),
  branches: z.strictObject({
    low: z.optional(BranchSchema),
    within: z.optional(BranchSchema),
    high: z.optional(BranchSchema),
    marginal: z.optional(BranchSchema),
  }),
});
export const StepSchema = z.strictObject({ ...base, kind: z.literal("step"), next: z.optional(BranchSchema) });
export const CautionSchema = z.strictObject({
  ...base,
  kind: z.literal("caution"),
  hazard: z.optional(z.enum(HAZARDS)),
  next: z.optional(BranchSchema),
});
export const NameplateSchema = z.strictObject({
  ...base,
  kind: z.literal("nameplate"),
  variable: VariableSchema,
  quantity: z.enum(QUANTITIES),
  unit: UnitSchema,
  next: z.optional(BranchSchema),
});
export const OutcomeSchema = z.strictObject({
  ...base,
  kind: z.literal("outcome"),
  remedy: oneLine("The remedy", TEXT_CAPS.remedy),
  parts: z.array(oneLine("A part", TEXT_CAPS.part)),
});
export const EscalateSchema = z.strictObject({ ...base, kind: z.literal("escalate"), reason: oneLine("The reason", TEXT_CAPS.reason) });

export const NodeSchema = z.discriminatedUnion("kind", [
  QuestionSchema,
  MeasurementSchema,
  StepSchema,
  CautionSchema,
  NameplateSchema,
  OutcomeSchema,
  EscalateSchema,
]);

export const TreeSchema = z.strictObject({
  title: oneLine("The tree's title", TEXT_CAPS.treeTitle),
  category: z.enum(CATEGORIES),
  symptom: oneLine("The symptom", TEXT_CAPS.symptom),
  equipment: z.optional(oneLine("The equipment", TEXT_CAPS.equipment)),
  start: NodeIdSchema,
  description: z.optional(body),
  nodes: z.array(NodeSchema),
});

export const NodeKindSchema = z.enum(NODE_KINDS);

// Compile-time proof that the schemas and the hand-written types in ./types agree.
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const agree: [
  Same<z.infer<typeof TreeSchema>, Tree>,
  Same<z.infer<typeof NodeSchema>, TreeNode>,
  Same<z.infer<typeof LimitsSchema>, Limits>,
  Same<z.infer<typeof MeterSchema>, Meter>,
  Same<z.infer<typeof AnswerSchema>, Answer>,
  Same<z.infer<typeof BranchSchema>, Branch>,
] = [true, true, true, true, true, true];
void agree;
