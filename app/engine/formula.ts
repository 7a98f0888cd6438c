// Formulas for derived limits: plain math over the run's variables, e.g. "volts^2 / watts" or
// "1000 * (1 + 3.9083e-3 * t - 5.775e-7 * t^2)". jsep parses; this file walks the syntax tree
// itself, allowing only numbers, the run's variables, + - * / ^ (power, right-associative),
// parentheses and a short list of functions. There is no eval and no way to reach anything else.
import jsep from "jsep";

jsep.addBinaryOp("^", 11, true);

type Fn = { arity: [number, number]; f: (...a: number[]) => number };
export const FUNCTIONS: Readonly<Record<string, Fn>> = {
  sqrt: { arity: [1, 1], f: Math.sqrt },
  abs: { arity: [1, 1], f: Math.abs },
  min: { arity: [1, 16], f: Math.min },
  max: { arity: [1, 16], f: Math.max },
  pow: { arity: [2, 2], f: Math.pow },
  exp: { arity: [1, 1], f: Math.exp },
  ln: { arity: [1, 1], f: Math.log },
  log10: { arity: [1, 1], f: Math.log10 },
  round: { arity: [1, 1], f: Math.round },
};
export const CONSTANTS: Readonly<Record<string, number>> = { pi: Math.PI };

const RESERVED = new Set([...Object.keys(FUNCTIONS), ...Object.keys(CONSTANTS)]);
/** Names a variable may not take. */
export function isReservedName(name: string): boolean {
  return RESERVED.has(name);
}

type Ast =
  | { t: "num"; v: number }
  | { t: "var"; name: string }
  | { t: "neg"; a: Ast }
  | { t: "bin"; op: "+" | "-" | "*" | "/" | "^"; a: Ast; b: Ast }
  | { t: "call"; f: Fn; args: Ast[] };

export interface CompiledFormula {
  source: string;
  /** Variables the formula reads, in order of first use. */
  variables: string[];
  /** Evaluate with the given variables; throws FormulaError when one is missing or the result isn't finite. */
  evaluate(vars: Readonly<Record<string, number>>): number;
}

export class FormulaError extends Error {
  constructor(
    message: string,
    readonly code: "syntax" | "not-allowed" | "unknown-function" | "missing-variable" | "not-finite",
  ) {
    super(message);
  }
}

export type CompileResult = { ok: true; formula: CompiledFormula } | { ok: false; code: FormulaError["code"]; message: string };

const BINARY = new Set(["+", "-", "*", "/", "^"]);

function convert(node: jsep.Expression, vars: string[]): Ast {
  switch (node.type) {
    case "Literal": {
      const v = (node as jsep.Literal).value;
      if (typeof v !== "number") throw new FormulaError(`only numbers are allowed, not ${(node as jsep.Literal).raw}`, "not-allowed");
      return { t: "num", v };
    }
    case "Identifier": {
      const name = (node as jsep.Identifier).name;
      if (Object.hasOwn(CONSTANTS, name)) return { t: "num", v: CONSTANTS[name]! };
      if (Object.hasOwn(FUNCTIONS, name)) throw new FormulaError(`${name} is a function: write ${name}(…)`, "not-allowed");
      if (!vars.includes(name)) vars.push(name);
      return { t: "var", name };
    }
    case "UnaryExpression": {
      const u = node as jsep.UnaryExpression;
      if (u.operator === "-") return { t: "neg", a: convert(u.argument, vars) };
      if (u.operator === "+") return convert(u.argument, vars);
      throw new FormulaError(`‘${u.operator}’ isn't allowed in a formula`, "not-allowed");
    }
    case "BinaryExpression": {
      const b = node as jsep.BinaryExpression;
      if (!BINARY.has(b.operator)) {
        throw new FormulaError(`‘${b.operator}’ isn't allowed in a formula: use + - * / ^ and parentheses`, "not-allowed");
      }
      return { t: "bin", op: b.operator as "+", a: convert(b.left, vars), b: convert(b.right, vars) };
    }
    case "CallExpression": {
      const c = node as jsep.CallExpression;
      if (c.callee.type !== "Identifier") throw new FormulaError("only named functions can be called", "not-allowed");
      const name = (c.callee as jsep.Identifier).name;
      const fn = Object.hasOwn(FUNCTIONS, name) ? FUNCTIONS[name] : undefined;
      if (!fn) {
        throw new FormulaError(`‘${name}’ isn't a function formulas know (${Object.keys(FUNCTIONS).join(", ")})`, "unknown-function");
      }
      const [lo, hi] = fn.arity;
      if (c.arguments.length < lo || c.arguments.length > hi) {
        throw new FormulaError(`${name} takes ${lo === hi ? lo : `${lo} to ${hi}`} argument${hi === 1 ? "" : "s"}`, "not-allowed");
      }
      return { t: "call", f: fn, args: c.arguments.map((a) => convert(a, vars)) };
    }
    default:
      throw new FormulaError(`this kind of expression (${node.type}) isn't allowed in a formula`, "not-allowed");
  }
}

/**
 * jsep binds a leading minus tighter than ^, so "-t^2" would mean (-t)^2. In school maths it
 * means -(t^2). Rather than guess, refuse the ambiguous spelling.
 */
function checkMinusPower(src: string): void {
  const tokens = src.match(/\d+(?:\.\d*)?(?:[eE][+-]?\d+)?|\.\d+(?:[eE][+-]?\d+)?|[A-Za-z_][A-Za-z0-9_]*|\*\*|\S/g) ?? [];
  for (let i = 0; i < tokens.length; i++) {
    const tok = tokens[i]!;
    if (tok !== "-" && tok !== "+") continue;
    const prev = tokens[i - 1];
    const unary = prev === undefined || /^[-+*/^(,]$/.test(prev);
    if (!unary) continue;
    // Skip the operand: a number, a name, a name(…) or (…).
    let j = i + 1;
    const t = tokens[j];
    if (t === undefined) return;
    if (/^[A-Za-z_]/.test(t) && tokens[j + 1] === "(") j++;
    if (tokens[j] === "(") {
      let depth = 0;
      for (; j < tokens.length; j++) {
        if (tokens[j] === "(") depth++;
        else if (tokens[j] === ")" && --depth === 0) break;
      }
    }
    if (tokens[j + 1] === "^") {
      throw new FormulaError(
        `write -(${tokens.slice(i + 1, j + 1).join("")}^…) or (-${tokens.slice(i + 1, j + 1).join("")})^…: a minus in front of a power is easy to misread`,
        "syntax",
      );
    }
  }
}

function run(ast: Ast, vars: Readonly<Record<string, number>>): number {
  switch (ast.t) {
    case "num":
      return ast.v;
    case "var": {
      const v = Object.hasOwn(vars, ast.name) ? vars[ast.name] : undefined;
      if (v === undefined) throw new FormulaError(`no value for ‘${ast.name}’ yet`, "missing-variable");
      return v;
    }
    case "neg":
      return -run(ast.a, vars);
    case "bin": {
      const a = run(ast.a, vars);
      const b = run(ast.b, vars);
      switch (ast.op) {
        case "+":
          return a + b;
        case "-":
          return a - b;
        case "*":
          return a * b;
        case "/":
          return a / b;
        case "^":
          return a ** b;
      }
      return NaN;
    }
    case "call": {
      const args: number[] = [];
      for (const x of ast.args) args.push(run(x, vars));
      return ast.f.f(...args);
    }
  }
}

const cache = new Map<string, CompileResult>();

/** Parse and check a formula once; the result is cached by its text. */
export function compileFormula(source: string): CompileResult {
  const hit = cache.get(source);
  if (hit) return hit;
  let result: CompileResult;
  try {
    if (source.trim() === "") throw new FormulaError("the formula is empty", "syntax");
    checkMinusPower(source);
    let tree: jsep.Expression;
    try {
      tree = jsep(source);
    } catch (e) {
      const msg = e instanceof Error ? e.message : String(e);
      throw new FormulaError(
        msg.replace(/^./, (c) => c.toLowerCase()),
        "syntax",
      );
    }
    if (tree.type === "Compound") throw new FormulaError("a formula is one expression", "syntax");
    const variables: string[] = [];
    const ast = convert(tree, variables);
    result = {
      ok: true,
      formula: {
        source,
        variables,
        evaluate(vars) {
          const v = run(ast, vars);
          if (!Number.isFinite(v)) throw new FormulaError(`‘${source}’ gives no finite number (division by zero?)`, "not-finite");
          return v;
        },
      },
    };
  } catch (e) {
    if (!(e instanceof FormulaError)) throw e;
    result = { ok: false, code: e.code, message: e.message };
  }
  if (cache.size > 5000) cache.clear();
  cache.set(source, result);
  return result;
}

export type EvaluateResult = { ok: true; value: number } | { ok: false; code: FormulaError["code"]; message: string };

/** Evaluate a formula text directly. Never throws: a refused formula or a missing or non-finite value comes back as an error. */
export function evaluateFormula(source: string, vars: Readonly<Record<string, number>>): EvaluateResult {
  const c = compileFormula(source);
  if (!c.ok) return c;
  try {
    return { ok: true, value: c.formula.evaluate(vars) };
  } catch (e) {
    if (e instanceof FormulaError) return { ok: false, code: e.code, message: e.message };
    return { ok: false, code: "not-finite", message: e instanceof Error ? e.message : String(e) };
  }
}
