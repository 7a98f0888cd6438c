// Cluepath's diagnostic engine: pure TypeScript (no React, no DB, no I/O), shared by the
// editor, the runner, the API and the CLI, on the server and in the browser.
export * from "./runtime";
export {
  TreeSchema,
  NodeSchema,
  LimitsSchema,
  MeterSchema,
  AnswerSchema,
  BranchSchema,
  QuestionSchema,
  MeasurementSchema,
  StepSchema,
  CautionSchema,
  NameplateSchema,
  OutcomeSchema,
  EscalateSchema,
  NodeIdSchema,
  VariableSchema,
  UnitSchema,
  NODE_ID_PATTERN,
  VARIABLE_PATTERN,
  normaliseBody,
} from "./schema";
export { validateTree, validateTreeData, errorsOf } from "./validate";
export type { ValidationResult } from "./validate";
export { parseTree, formatParseError } from "./markdown/parse";
export type { ParseResult, ParseError, SourceMap, NodeLines } from "./markdown/parse";
export { serializeTree } from "./markdown/serialize";
// (parseLimits and parseMeter stay inside the parser: they throw a SyntaxError_ that parseTree turns into a located error.)
export { formatLimits, formatMeter } from "./markdown/syntax";
