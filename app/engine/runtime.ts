// The runner's slice of the engine: units, limits, verdicts and traversal. No zod, no Markdown
// parser, so the phone downloads only what it needs to judge readings offline.
export * from "./types";
export {
  parseReading,
  parseRating,
  isOverload,
  exampleReading,
  resolveUnit,
  convert,
  unitQuantity,
  unitLabel,
  normaliseUnit,
  kindNoun,
  quantityWord,
  QUANTITY_INFO,
} from "./units";
export type { ParsedReading, ParseReadingResult, ReadingError, ReadingErrorCode, QuantityInfo } from "./units";
export { computeLimits, showLimits, possibleVerdicts, limitFormulas, LETTER_PERCENT, LETTER_SMALL_CAP_PF } from "./limits";
export type { ComputedLimits, LimitsResult, FormulaUse } from "./limits";
export { evaluateReading, judge, meterUncertainty, describeMeter } from "./verdict";
export type { Verdict, VerdictResult, VerdictError, Uncertainty, EvaluateOptions, Confirmation } from "./verdict";
export { compileFormula, evaluateFormula, FormulaError, FUNCTIONS } from "./formula";
export type { CompiledFormula } from "./formula";
export { Run, startRun, replay, tryEntry, choicesAt } from "./traversal";
export type { LogEntry, RunState, RunStep, RunVariable, RunEnd, Rejection, ApplyResult, RecordedValue } from "./traversal";
export { nodeBranches, branchName, describeNode, isTerminal } from "./graph";
export type { NodeBranch } from "./graph";
export { formatSig, formatCompact, countSigFigs } from "./format";
