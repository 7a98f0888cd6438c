// The one-line syntaxes inside a tree file: limits, meter accuracy, branches.
// Shared by the parser and the serializer so both sides agree on the canonical form.
//
//   limits:  191 V to 218 V          at least 135 °F          at most 41 °F
//            1.5 µF ± 6 %            350 °F ± 15 °F           100 Ω +5 % / -10 %
//            4.7 kΩ letter J         `rated_uf` ± 6 %         `volts^2 / watts` Ω ± 10 %
//   meter:   ±(1 % + 3 counts) at 0.1 V
//   branch:  within → next-step      low → remeasure (re-check up to 2 times, then call-lead)
import type { Branch, Limits, LimitValue, Meter, Tolerance, ToleranceLetter } from "../types";
import { TOLERANCE_LETTERS } from "../types";
import { formatExact } from "../format";

export class SyntaxError_ extends Error {
  constructor(
    message: string,
    /** 0-based offset into the text being parsed. */
    readonly offset: number,
  ) {
    super(message);
  }
}

const NUM = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

// --- limits ----------------------------------------------------------------------------------

export function formatValue(v: LimitValue): string {
  const head = "formula" in v ? `\`${v.formula}\`` : formatExact(v.value);
  return v.unit !== undefined ? `${head} ${v.unit}` : head;
}

function formatTolerance(t: Tolerance): string {
  if (t.kind === "letter") return `letter ${t.letter}`;
  const u = t.kind === "percent" ? " %" : t.unit !== undefined ? ` ${t.unit}` : "";
  if (t.plus === t.minus) return `± ${formatExact(t.plus)}${u}`;
  return `+${formatExact(t.plus)}${u} / -${formatExact(t.minus)}${u}`;
}

export function formatLimits(l: Limits): string {
  switch (l.kind) {
    case "range":
      return `${formatValue(l.min)} to ${formatValue(l.max)}`;
    case "atLeast":
      return `at least ${formatValue(l.min)}`;
    case "atMost":
      return `at most ${formatValue(l.max)}`;
    case "nominal":
      return `${formatValue(l.nominal)} ${formatTolerance(l.tolerance)}`;
  }
}

interface Tok {
  s: string;
  at: number;
}

function tokenize(text: string): Tok[] {
  const out: Tok[] = [];
  let i = 0;
  while (i < text.length) {
    const c = text[i]!;
    // Any white space, not only " " and tab: a non-breaking space here used to loop for ever.
    if (/\s/.test(c)) {
      i++;
      continue;
    }
    if (c === "`") {
      const j = text.indexOf("`", i + 1);
      if (j < 0) throw new SyntaxError_("expected a closing ` after the formula", text.length);
      out.push({ s: text.slice(i, j + 1), at: i });
      i = j + 1;
      continue;
    }
    if (c === "±") {
      out.push({ s: "±", at: i });
      i++;
      continue;
    }
    let j = i;
    while (j < text.length && !/[\s`±]/.test(text[j]!)) j++;
    let word = text.slice(i, j);
    // "6%" → "6" "%"
    const pct = /^([+\-−]?[\d.eE+-]+)%$/.exec(word);
    if (pct) {
      out.push({ s: pct[1]!, at: i });
      out.push({ s: "%", at: i + pct[1]!.length });
      i = j;
      continue;
    }
    word = word.replace(/^−/, "-");
    out.push({ s: word, at: i });
    i = j;
  }
  return out;
}

const LIMITS_EXAMPLES = "‘191 V to 218 V’, ‘at least 135 °F’, ‘1.5 µF ± 6 %’ or ‘`rated_uf` ± 6 %’";

class Cursor {
  i = 0;
  constructor(
    readonly toks: Tok[],
    readonly end: number,
  ) {}
  peek(): Tok | undefined {
    return this.toks[this.i];
  }
  next(): Tok | undefined {
    return this.toks[this.i++];
  }
  at(): number {
    return this.peek()?.at ?? this.end;
  }
}

function isUnitToken(s: string): boolean {
  return (
    !/^[+\-−]/.test(s) &&
    s !== "to" &&
    s !== "letter" &&
    s !== "/" &&
    s !== "%" &&
    s !== "±" &&
    s !== "+/-" &&
    s !== "+-" &&
    !/^[+\-−]?[\d.]/.test(s) &&
    !s.startsWith("`")
  );
}

function readValue(c: Cursor): LimitValue {
  const t = c.next();
  if (!t) throw new SyntaxError_(`expected a number or a \`formula\``, c.end);
  let v: LimitValue;
  if (t.s.startsWith("`")) {
    const formula = t.s.slice(1, -1).trim();
    if (!formula) throw new SyntaxError_("expected a formula between the backticks", t.at);
    v = { formula };
  } else if (NUM.test(t.s)) {
    v = { value: Number(t.s) };
  } else {
    throw new SyntaxError_(`expected a number or a \`formula\`, got ‘${t.s}’`, t.at);
  }
  const u = c.peek();
  if (u && isUnitToken(u.s)) {
    c.next();
    v.unit = u.s;
  }
  return v;
}

function readSide(c: Cursor, sign: "+" | "-"): { x: number; unit: string | undefined; at: number } {
  const t = c.next();
  if (!t) throw new SyntaxError_(`expected ${sign}number`, c.end);
  let s = t.s;
  if (s === sign || (sign === "-" && s === "−")) {
    const n = c.next();
    if (!n) throw new SyntaxError_(`expected a number after ${sign}`, c.end);
    s = n.s;
  } else if (s.startsWith(sign)) {
    s = s.slice(1);
  } else {
    throw new SyntaxError_(`expected ‘${sign}’ and a number, got ‘${t.s}’`, t.at);
  }
  if (!NUM.test(s)) throw new SyntaxError_(`expected a number, got ‘${s}’`, t.at);
  const u = c.peek();
  let unit: string | undefined;
  if (u && (u.s === "%" || isUnitToken(u.s))) {
    c.next();
    unit = u.s;
  }
  return { x: Number(s), unit, at: t.at };
}

export function parseLimits(text: string): Limits {
  const toks = tokenize(text);
  const c = new Cursor(toks, text.length);
  const first = c.peek();
  if (!first) throw new SyntaxError_(`expected limits like ${LIMITS_EXAMPLES}`, 0);
  let limits: Limits;
  if (first.s === "at" && (toks[1]?.s === "least" || toks[1]?.s === "most")) {
    c.next();
    const which = c.next()!.s;
    const v = readValue(c);
    limits = which === "least" ? { kind: "atLeast", min: v } : { kind: "atMost", max: v };
  } else {
    const v = readValue(c);
    const op = c.next();
    if (!op) throw new SyntaxError_(`expected ‘to’, ‘±’, ‘+… / -…’ or ‘letter’ after ‘${text.trim()}’`, text.length);
    if (op.s === "to") {
      limits = { kind: "range", min: v, max: readValue(c) };
    } else if (op.s === "letter") {
      const l = c.next();
      if (!l || !(TOLERANCE_LETTERS as readonly string[]).includes(l.s)) {
        throw new SyntaxError_(
          `expected a tolerance letter (${TOLERANCE_LETTERS.join(", ")})${l ? `, got ‘${l.s}’` : ""}`,
          l?.at ?? text.length,
        );
      }
      limits = { kind: "nominal", nominal: v, tolerance: { kind: "letter", letter: l.s as ToleranceLetter } };
    } else if (op.s === "±" || op.s === "+/-" || op.s === "+-") {
      const t = c.next();
      if (!t || !NUM.test(t.s)) throw new SyntaxError_(`expected a number after ±${t ? `, got ‘${t.s}’` : ""}`, t?.at ?? text.length);
      const u = c.peek();
      let unit: string | undefined;
      if (u && (u.s === "%" || isUnitToken(u.s))) {
        c.next();
        unit = u.s;
      }
      const x = Number(t.s);
      limits = {
        kind: "nominal",
        nominal: v,
        tolerance: unit === "%" ? { kind: "percent", plus: x, minus: x } : absolute(x, x, unit),
      };
    } else if (op.s.startsWith("+")) {
      c.i--;
      const plus = readSide(c, "+");
      const slash = c.next();
      if (!slash || slash.s !== "/")
        throw new SyntaxError_(`expected ‘/’ and the minus side, like ‘+5 % / -10 %’`, slash?.at ?? text.length);
      const minus = readSide(c, "-");
      if ((plus.unit === "%") !== (minus.unit === "%") || (plus.unit !== "%" && plus.unit !== minus.unit)) {
        throw new SyntaxError_(`expected both sides in the same unit, like ‘+5 % / -10 %’`, minus.at);
      }
      limits = {
        kind: "nominal",
        nominal: v,
        tolerance: plus.unit === "%" ? { kind: "percent", plus: plus.x, minus: minus.x } : absolute(plus.x, minus.x, plus.unit),
      };
    } else {
      throw new SyntaxError_(`expected ‘to’, ‘±’, ‘+… / -…’ or ‘letter’ after the value, got ‘${op.s}’`, op.at);
    }
  }
  const extra = c.peek();
  if (extra) throw new SyntaxError_(`expected the end of the limits, got ‘${text.slice(extra.at).trim()}’`, extra.at);
  return limits;
}

function absolute(plus: number, minus: number, unit: string | undefined): Tolerance {
  return unit === undefined ? { kind: "absolute", plus, minus } : { kind: "absolute", plus, minus, unit };
}

// --- meter -------------------------------------------------------------------------------------

export function formatMeter(m: Meter): string {
  const counts = `${formatExact(m.counts)} count${m.counts === 1 ? "" : "s"}`;
  const res = m.unit !== undefined ? `${formatExact(m.resolution)} ${m.unit}` : formatExact(m.resolution);
  return `±(${formatExact(m.percent)} % + ${counts}) at ${res}`;
}

const N = String.raw`[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?`;
const METER = new RegExp(
  String.raw`^(?:±|\+/-)\s*\(\s*(${N})\s*%\s*\+\s*(${N})\s*(?:counts?|digits?|dgts?|d)\s*\)\s*(?:at|@)\s*(${N})(?:\s*([^\s\d` +
    "`" +
    String.raw`][^\s` +
    "`" +
    String.raw`]*))?\s*$`,
);

export function parseMeter(text: string): Meter {
  const m = METER.exec(text.trim());
  if (!m) throw new SyntaxError_(`expected a meter accuracy like ‘±(1 % + 3 counts) at 0.1 V’, got ‘${text.trim()}’`, 0);
  const meter: Meter = { percent: Number(m[1]), counts: Number(m[2]), resolution: Number(m[3]) };
  if (m[4] !== undefined) meter.unit = m[4];
  return meter;
}

// --- branches ----------------------------------------------------------------------------------

export function formatBranch(key: string, b: Branch): string {
  let s = `${key} → ${b.to}`;
  if (b.recheck) {
    const r = b.recheck;
    s += ` (re-check up to ${formatExact(r.max)} time${r.max === 1 ? "" : "s"}${r.onExceed ? `, then ${r.onExceed}` : ""})`;
  }
  return s;
}

const TARGET = /^([^\s()]+)(?:\s+\(re-check up to (-?\d+) times?(?:, then ([^\s()]+))?\))?\s*$/;

/**
 * Split "label → target (re-check …)" at its last arrow. Returns null when there is no arrow.
 * Throws when the part after the arrow isn't a target.
 */
export function parseBranch(text: string): { key: string; branch: Branch; targetAt: number } | null {
  let i = text.lastIndexOf(" → ");
  let len = 3;
  if (i < 0) {
    i = text.lastIndexOf(" -> ");
    len = 4;
  }
  if (i < 0) return null;
  const key = text.slice(0, i).trim();
  const rest = text.slice(i + len);
  const m = TARGET.exec(rest);
  if (!m) {
    throw new SyntaxError_(
      `expected a step id after the arrow, optionally with ‘(re-check up to 2 times, then other-id)’, got ‘${rest.trim()}’`,
      i + len,
    );
  }
  const branch: Branch = { to: m[1]! };
  if (m[2] !== undefined) {
    branch.recheck = { max: Number(m[2]) };
    if (m[3] !== undefined) branch.recheck.onExceed = m[3];
  }
  return { key, branch, targetAt: i + len };
}
