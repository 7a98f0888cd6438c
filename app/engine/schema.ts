// zod schemas for the tree model. They check shape (kinds, required fields, id and name
// patterns, finite numbers); the meaning (graph, units, limits, formulas) is ./validate's job,
// so a draft with a negative tolerance or a dangling branch still parses and gets a finding.
import { z } from "zod";
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

const oneLine = (what: string) =>
  z
    .string()
    .min(1, `${what} is empty`)
    .max(500)
    .refine((s) => !/[\r\n]/.test(s), `${what} must fit on one line`)
    .refine((s) => s === s.trim(), `${what} has spaces at the start or end`);

export const NodeIdSchema = z
  .string()
  .max(64)
  .regex(NODE_ID_PATTERN, "ids are lower-case words joined by hyphens, like check-fan-rotation");
export const VariableSchema = z
  .string()
  .max(64)
  .regex(VARIABLE_PATTERN, "variable names are letters, digits and _ and start with a letter, like rated_uf");
export const UnitSchema = z
  .string()
  .max(32)
  .regex(UNIT_PATTERN, "a unit is one word like µF, V, °F or inWC")
  .refine((s) => !["to", "letter", "%", "/", "least", "most"].includes(s), "that word can't be a unit");
const finite = z.number().refine(Number.isFinite, "must be a finite number");
const body = z
  .string()
  .min(1)
  .refine((s) => s === normaliseBody(s), "body has blank lines or spaces at the start or end");

/** Bodies are kept as written, minus leading blank lines and trailing whitespace. */
export function normaliseBody(s: string): string {
  return s.replace(/\r\n?/g, "\n").replace(/^(?:[ \t]*\n)+/, "").trimEnd();
}

export const RecheckSchema = z.strictObject({
  max: z.number().int(),
  onExceed: NodeIdSchema.optional(),
});
export const BranchSchema = z.strictObject({ to: NodeIdSchema, recheck: RecheckSchema.optional() });
export const AnswerSchema = z.strictObject({
  label: oneLine("An answer"),
  to: NodeIdSchema,
  recheck: RecheckSchema.optional(),
});

const formula = z
  .string()
  .min(1)
  .max(500)
  .refine((s) => !/[`\r\n]/.test(s) && s === s.trim(), "a formula is one line without backticks");

export const LimitValueSchema = z.union([
  z.strictObject({ value: finite, unit: UnitSchema.optional() }),
  z.strictObject({ formula, unit: UnitSchema.optional() }),
]);

export const ToleranceSchema = z.discriminatedUnion("kind", [
  z.strictObject({ kind: z.literal("percent"), plus: finite, minus: finite }),
  z.strictObject({ kind: z.literal("absolute"), plus: finite, minus: finite, unit: UnitSchema.optional() }),
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
  unit: UnitSchema.optional(),
});

const base = {
  id: NodeIdSchema,
  title: oneLine("A title"),
  body: body.optional(),
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
  variable: VariableSchema.optional(),
  meter: MeterSchema.optional(),
  acceptance: z.enum(["simple", "guarded"]).optional(),
  branches: z.strictObject({
    low: BranchSchema.optional(),
    within: BranchSchema.optional(),
    high: BranchSchema.optional(),
    marginal: BranchSchema.optional(),
  }),
});
export const StepSchema = z.strictObject({ ...base, kind: z.literal("step"), next: BranchSchema.optional() });
export const CautionSchema = z.strictObject({
  ...base,
  kind: z.literal("caution"),
  hazard: z.enum(HAZARDS).optional(),
  next: BranchSchema.optional(),
});
export const NameplateSchema = z.strictObject({
  ...base,
  kind: z.literal("nameplate"),
  variable: VariableSchema,
  quantity: z.enum(QUANTITIES),
  unit: UnitSchema,
  next: BranchSchema.optional(),
});
export const OutcomeSchema = z.strictObject({
  ...base,
  kind: z.literal("outcome"),
  remedy: oneLine("The remedy"),
  parts: z.array(oneLine("A part")),
});
export const EscalateSchema = z.strictObject({ ...base, kind: z.literal("escalate"), reason: oneLine("The reason") });

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
  title: oneLine("The tree's title"),
  category: z.enum(CATEGORIES),
  symptom: oneLine("The symptom"),
  equipment: oneLine("The equipment").optional(),
  start: NodeIdSchema,
  description: body.optional(),
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
