// The Markdown tree format: one .md file per tree, readable in a code review.
//
//   # Two-fan rotisserie heats unevenly            ← the tree's title
//   - category: rotisserie                         ← tree fields, right under the title
//   - symptom: One side of the load browns slower
//   - start: lockout
//                                                  ← blank line
//   Optional introduction (Markdown, kept as written).
//
//   ## Measurement `supply-voltage`: Supply voltage across L1–L2     ← one heading per node:
//   - unit: V                                                            kind, `id`, title
//   - limits: 191 V to 218 V                       ← fields as "- name: value", right under it
//   - low → low-supply                             ← branches as "- key → node-id"
//   - within → fans
//
//   Body: Markdown kept as written (images, lists, code…) up to the next "##" heading.
//
// Questions list their answers the same way: "- one slow → cap-rating". A branch can be a
// bounded re-check loop: "- marginal → remeasure (re-check up to 2 times, then call-lead)".
// mdast-util-from-markdown finds the headings (so a "## " inside a code block stays body);
// fields and bodies are taken from the source lines verbatim.
import { fromMarkdown } from "mdast-util-from-markdown";
import type { RootContent } from "mdast";
import {
  CATEGORIES,
  HAZARDS,
  QUANTITIES,
  type Branch,
  type EquipmentCategory,
  type Hazard,
  type Quantity,
  type Tree,
  type TreeNode,
  type VerdictKind,
} from "../types";
import { TreeSchema, normaliseBody } from "../schema";
import { unitQuantity } from "../units";
import { SyntaxError_, parseBranch, parseLimits, parseMeter } from "./syntax";
import { KIND_HEADING } from "./serialize";

export interface ParseError {
  line: number;
  column: number;
  message: string;
}

export interface NodeLines {
  heading: number;
  /** Line of each field or branch, keyed like Finding.field: "unit", "limits", "low", "next", "answer:<label>". */
  fields: Record<string, number>;
}

export interface SourceMap {
  title: number;
  fields: Record<string, number>;
  nodes: NodeLines[];
}

export type ParseResult = { ok: true; tree: Tree; map: SourceMap } | { ok: false; errors: ParseError[]; map: SourceMap };

/** "line 14:3: expected …" */
export function formatParseError(e: ParseError): string {
  return `line ${e.line}:${e.column}: ${e.message}`;
}

const KIND_BY_WORD = new Map<string, TreeNode["kind"]>(
  (Object.entries(KIND_HEADING) as [TreeNode["kind"], string][]).map(([k, w]) => [w.toLowerCase(), k]),
);
const KIND_WORDS = Object.values(KIND_HEADING);

const FIELDS: Record<TreeNode["kind"] | "tree", readonly string[]> = {
  tree: ["category", "symptom", "equipment", "start"],
  question: [],
  measurement: ["quantity", "unit", "limits", "meter", "acceptance", "variable"],
  step: [],
  caution: ["hazard"],
  nameplate: ["variable", "quantity", "unit"],
  outcome: ["remedy", "part"],
  escalate: ["reason"],
};
const BRANCH_KEYS: Record<TreeNode["kind"], readonly string[]> = {
  question: [],
  measurement: ["low", "within", "high", "marginal"],
  step: ["next"],
  caution: ["next"],
  nameplate: ["next"],
  outcome: [],
  escalate: [],
};
const ALL_BRANCH_WORDS = /^(next|low|within|high|marginal)\b/;

interface Item {
  text: string;
  line: number;
  /** 1-based column where text starts. */
  col: number;
}

const list = (xs: readonly string[]): string => (xs.length > 1 ? `${xs.slice(0, -1).join(", ")} or ${xs[xs.length - 1]}` : (xs[0] ?? ""));
const clip = (s: string) => (s.length > 60 ? s.slice(0, 57) + "…" : s);

class Parser {
  errors: ParseError[] = [];
  lines: string[];

  constructor(readonly text: string) {
    this.lines = text.split("\n");
  }

  /** A list item read as a branch; undefined (with the error reported at its column) when it is malformed. */
  branchOf(it: { text: string; line: number; col: number }): ReturnType<typeof parseBranch> | undefined {
    try {
      return parseBranch(it.text);
    } catch (e) {
      if (!(e instanceof SyntaxError_)) throw e;
      this.err(it.line, it.col + e.offset, e.message);
      return undefined;
    }
  }

  err(line: number, column: number, message: string): void {
    this.errors.push({ line, column, message });
  }

  /** Field lines right under a heading (0-based index of the heading line), then the body. */
  section(h: number, end: number): { items: Item[]; body: string | undefined; bodyLine: number } {
    const items: Item[] = [];
    let j = h + 1;
    for (; j < end; j++) {
      const l = this.lines[j]!;
      const m = /^([-*+])(?:[ \t]+(.*))?$/.exec(l);
      if (!m) break;
      const content = (m[2] ?? "").trimEnd();
      if (content === "") {
        this.err(j + 1, 1, "expected a field like ‘- unit: V’ or a branch like ‘- next → step-id’, got an empty list item");
        continue;
      }
      items.push({ text: content, line: j + 1, col: l.indexOf(content) + 1 });
    }
    if (items.length && j < end && this.lines[j]!.trim() !== "") {
      this.err(
        j + 1,
        1,
        `expected a blank line after the fields (each field is one ‘- name: value’ line), got ‘${clip(this.lines[j]!.trim())}’`,
      );
      while (j < end && this.lines[j]!.trim() !== "") j++;
    }
    const raw = this.lines.slice(j, end).join("\n");
    const body = normaliseBody(raw);
    let bodyLine = j + 1;
    while (bodyLine - 1 < end && this.lines[bodyLine - 1]!.trim() === "") bodyLine++;
    return { items, body: body === "" ? undefined : body, bodyLine };
  }

  /** Split field items into fields and branches, with errors for everything else. */
  fields(
    kind: TreeNode["kind"] | "tree",
    kindWord: string,
    items: Item[],
    lines: Record<string, number>,
  ): {
    fields: Map<string, Item & { value: string; valueCol: number }>;
    parts: Item[];
    branches: Map<string, { branch: Branch; item: Item }>;
    answers: { label: string; branch: Branch; item: Item }[];
  } {
    const fields = new Map<string, Item & { value: string; valueCol: number }>();
    const parts: Item[] = [];
    const branches = new Map<string, { branch: Branch; item: Item }>();
    const answers: { label: string; branch: Branch; item: Item }[] = [];
    const allowed = FIELDS[kind];
    const branchKeys = kind === "tree" ? [] : BRANCH_KEYS[kind];

    for (const it of items) {
      if (kind === "question") {
        const b = this.branchOf(it);
        if (b === undefined) continue;
        if (!b || b.key === "") {
          this.err(it.line, it.col, `expected an answer like ‘- yes → next-step’, got ‘- ${clip(it.text)}’`);
          continue;
        }
        answers.push({ label: b.key, branch: b.branch, item: it });
        if (lines[`answer:${b.key}`] === undefined) lines[`answer:${b.key}`] = it.line;
        continue;
      }
      const bw = ALL_BRANCH_WORDS.exec(it.text);
      if (bw && /^\S+\s*(→|->)/.test(it.text)) {
        const b = this.branchOf(it);
        if (b === undefined) continue;
        const key = b?.key ?? bw[1]!;
        if (!branchKeys.includes(key) || !b) {
          this.err(
            it.line,
            it.col,
            branchKeys.length
              ? `‘${key}’ isn't a branch of a ${kindWord}: use ${list(branchKeys.map((k) => `‘- ${k} → …’`))}`
              : `a ${kindWord} ends the run, so it has no branches`,
          );
          continue;
        }
        if (branches.has(key)) {
          this.err(it.line, it.col, `the ‘${key}’ branch is given twice (first on line ${branches.get(key)!.item.line})`);
          continue;
        }
        branches.set(key, { branch: b.branch, item: it });
        lines[key] = it.line;
        continue;
      }
      const f = /^([A-Za-z][\w-]*):(?:[ \t]+(.*))?$/.exec(it.text);
      if (!f) {
        if (bw) {
          const words = it.text.split(/\s+/);
          this.err(it.line, it.col, `expected a branch like ‘- ${bw[1]} → ${words[1] ?? "next-step"}’, got ‘- ${clip(it.text)}’`);
        } else {
          const example = branchKeys.length ? ` or a branch like ‘- ${branchKeys[0]} → step-id’` : "";
          this.err(it.line, it.col, `expected a field like ‘- ${allowed[0] ?? "name"}: …’${example}, got ‘- ${clip(it.text)}’`);
        }
        continue;
      }
      const key = f[1]!;
      const value = (f[2] ?? "").trim();
      if (!allowed.includes(key)) {
        this.err(
          it.line,
          it.col,
          allowed.length
            ? `‘${key}’ isn't a field of a ${kindWord}: use ${list(allowed)}`
            : `a ${kindWord} has no fields like ‘${key}’${branchKeys.length ? `; it takes ${list(branchKeys.map((k) => `‘- ${k} → …’`))}` : ""}`,
        );
        continue;
      }
      const colon = it.text.indexOf(":") + 1;
      const valueCol = it.col + (value === "" ? colon : it.text.indexOf(value, colon));
      if (value === "") {
        this.err(it.line, valueCol, `expected a value after ‘${key}:’`);
        continue;
      }
      if (key === "part") {
        parts.push({ ...it, text: value, col: valueCol });
        lines[`part:${parts.length - 1}`] = it.line;
        continue;
      }
      const prev = fields.get(key);
      if (prev) {
        this.err(it.line, it.col, `‘${key}’ is given twice (first on line ${prev.line})`);
        continue;
      }
      fields.set(key, { ...it, value, valueCol });
      lines[key] = it.line;
    }
    return { fields, parts, branches, answers };
  }

  /** A required field, or an error at the heading. */
  need = <F>(fields: Map<string, F>, line: number, kind: TreeNode["kind"], id: string, key: string, hint: string): F | undefined => {
    const f = fields.get(key);
    if (!f) this.err(line, 1, `${KIND_HEADING[kind]} \`${id}\` needs ‘- ${key}: …’ (${hint})`);
    return f;
  };

  enumField<T extends string>(
    f: { value: string; line: number; valueCol: number } | undefined,
    allowed: readonly T[],
    what: string,
  ): T | undefined {
    if (!f) return undefined;
    if ((allowed as readonly string[]).includes(f.value)) return f.value as T;
    this.err(f.line, f.valueCol, `expected ${what} (${list(allowed)}), got ‘${clip(f.value)}’`);
    return undefined;
  }
}

const HEADING_LINE = /^(#{1,2})(?:[ \t]|$)/;
const FENCE = /^ {0,3}(`{3,}|~{3,})(.*)$/;
/** Lines per batch handed to mdast: micromark copies its event list whenever a list closes, so
 * one call over a long file costs O(lists × file); bounded batches keep the whole parse linear. */
const BATCH_LINES = 200;

/**
 * The tree and node headings: lines that start with "# " or "## " outside fenced code. mdast
 * then parses the file in batches cut at those lines, and must agree: a heading it doesn't see
 * (swallowed by an HTML block, say) or one the scan didn't expect (a setext heading made by
 * --- under text, an indented "##") is an error at its line.
 */
function findHeadings(p: Parser): { line: number; depth: 1 | 2 }[] {
  const lines = p.lines;
  const heads: { line: number; depth: 1 | 2 }[] = [];
  let fence: { char: string; len: number; line: number } | null = null;
  for (let i = 0; i < lines.length; i++) {
    const l = lines[i]!;
    const f = FENCE.exec(l);
    if (fence) {
      if (f && f[1]![0] === fence.char && f[1]!.length >= fence.len && f[2]!.trim() === "") fence = null;
      continue;
    }
    if (f && !(f[1]![0] === "`" && f[2]!.includes("`"))) {
      fence = { char: f[1]![0]!, len: f[1]!.length, line: i + 1 };
      continue;
    }
    const h = HEADING_LINE.exec(l);
    if (h) heads.push({ line: i + 1, depth: h[1]!.length as 1 | 2 });
  }
  if (fence) p.err(fence.line, 1, "this code block is never closed: end it with " + fence.char.repeat(fence.len) + " on a line of its own");

  // Cross-check with mdast, batch by batch.
  const expected = new Set(heads.map((h) => h.line));
  let from = 0;
  let hi = 0; // first heading at or after `from`
  while (from < lines.length) {
    // Extend the batch heading by heading until it holds BATCH_LINES lines.
    let hj = hi;
    let to = lines.length;
    while (hj < heads.length) {
      const cut = heads[hj]!.line - 1;
      if (cut > from && cut - from >= BATCH_LINES) {
        to = cut;
        break;
      }
      hj++;
    }
    // Field lines are read line by line (Parser.section); mdast needs only the headings and
    // bodies, so the fields go in as blank lines, which keeps the line numbers.
    const chunk = lines.slice(from, to);
    for (let k = hi; k < hj; k++) {
      const h = heads[k]!;
      for (let j = h.line - from; j < chunk.length && /^[-*+](?:[ \t]|$)/.test(chunk[j]!); j++) chunk[j] = "";
    }
    const root = fromMarkdown(chunk.join("\n"));
    const seen = new Set<number>();
    for (const node of root.children as RootContent[]) {
      if (node.type !== "heading" || node.depth > 2 || !node.position) continue;
      const line = node.position.start.line + from;
      seen.add(line);
      if (!expected.has(line)) {
        const raw = lines[line - 1] ?? "";
        p.err(
          line,
          1,
          /^\s+#/.test(raw)
            ? "expected headings to start at the beginning of the line"
            : "expected a heading that starts with ‘##’; a line of --- or === under text turns that text into a heading, so add a blank line above it",
        );
      }
    }
    for (let k = hi; k < hj; k++) {
      const h = heads[k]!;
      if (!seen.has(h.line)) {
        p.err(
          h.line,
          1,
          "Markdown reads this heading as part of the block above it (an HTML block left open?): add a blank line before it or close the block",
        );
      }
    }
    from = to;
    hi = hj;
  }
  return heads;
}

/** Parse a tree file. Errors carry line:column and say what was expected. */
export function parseTree(source: string): ParseResult {
  const text = source.replace(/\r\n?/g, "\n");
  const p = new Parser(text);
  const map: SourceMap = { title: 1, fields: {}, nodes: [] };
  const heads = findHeadings(p);
  const firstContent = p.lines.findIndex((l) => l.trim() !== "");
  const titleHead = heads[0];
  if (!titleHead || titleHead.depth !== 1 || titleHead.line !== firstContent + 1) {
    const line = firstContent + 1 || 1;
    p.err(line, 1, `expected the tree's title first, like ‘# Rotisserie heats unevenly’, got ‘${clip(p.lines[line - 1]?.trim() ?? "")}’`);
    return { ok: false, errors: sortErrors(p.errors), map };
  }

  const ends = heads.map((h, i) => (i + 1 < heads.length ? heads[i + 1]!.line - 1 : p.lines.length));
  const tree: Record<string, unknown> = {};
  const nodes: Record<string, unknown>[] = [];

  heads.forEach((h, hi) => {
    const line = h.line;
    const raw = p.lines[line - 1]!;
    const sec = p.section(line - 1, ends[hi]!);

    if (hi === 0) {
      map.title = line;
      tree.title = raw.replace(/^ {0,3}#[ \t]*/, "").trim();
      const { fields } = p.fields("tree", "tree", sec.items, map.fields);
      const category = p.enumField<EquipmentCategory>(fields.get("category"), CATEGORIES, "an equipment category");
      if (category) tree.category = category;
      else if (!fields.has("category")) p.err(line, 1, "the tree needs ‘- category: …’ right under the title (" + list(CATEGORIES) + ")");
      const symptom = fields.get("symptom");
      if (symptom) tree.symptom = symptom.value;
      else p.err(line, 1, "the tree needs ‘- symptom: …’ right under the title, saying what the customer reports");
      const eq = fields.get("equipment");
      if (eq) tree.equipment = eq.value;
      const start = fields.get("start");
      if (start) tree.start = start.value;
      if (sec.body !== undefined) tree.description = sec.body;
      return;
    }

    if (h.depth === 1) {
      p.err(line, 1, "expected one ‘#’ title per tree; steps use ‘##’ headings");
      return;
    }
    const m = /^ {0,3}##[ \t]+(.*)$/.exec(raw);
    const head = (m?.[1] ?? "").trim();
    const hm = /^(\S+)[ \t]+`([^`]*)`:[ \t]*(.*)$/.exec(head);
    const example = "‘## Measurement `supply-voltage`: Supply voltage across L1–L2’";
    if (!hm) {
      const word = head.split(/\s+/)[0] ?? "";
      if (word && !KIND_BY_WORD.has(word.toLowerCase())) {
        p.err(line, 4, `expected a heading like ${example}: ‘${clip(word)}’ isn't a kind of step (${list(KIND_WORDS)})`);
      } else if (!/`/.test(head)) {
        p.err(line, 4 + word.length, `expected the step's id in backticks after ‘${word}’, like ${example}`);
      } else {
        p.err(line, 4, `expected a heading like ${example}, got ‘${clip(raw.trim())}’`);
      }
      return;
    }
    const kind = KIND_BY_WORD.get(hm[1]!.toLowerCase());
    if (!kind) {
      p.err(line, 4, `‘${clip(hm[1]!)}’ isn't a kind of step: use ${list(KIND_WORDS)}`);
      return;
    }
    const id = hm[2]!.trim();
    const title = hm[3]!.trim();
    if (title === "") p.err(line, raw.length + 1, "expected a title after the id, like ‘: Check fan rotation’");
    const lines: NodeLines = { heading: line, fields: {} };
    map.nodes.push(lines);
    const word = KIND_HEADING[kind].toLowerCase();
    const { fields, parts, branches, answers } = p.fields(kind, word, sec.items, lines.fields);
    const node: Record<string, unknown> = { id, kind, title };
    if (sec.body !== undefined) {
      node.body = sec.body;
      lines.fields.body = sec.bodyLine;
      if (sec.items.length === 0 && looksLikeField(kind, sec.body.split("\n")[0]!)) {
        p.err(sec.bodyLine, 1, "fields and branches go right under the heading, with no blank line between: this line is read as the body");
      }
    }
    const need = p.need;
    const next = branches.get("next");

    switch (kind) {
      case "question":
        node.answers = answers.map((a) => ({ label: a.label, ...a.branch }));
        break;
      case "measurement":
      case "nameplate": {
        if (kind === "nameplate") {
          const v = need(fields, line, kind, id, "variable", "the name later formulas use, like rated_uf");
          if (v) node.variable = v.value;
        }
        const unit = need(
          fields,
          line,
          kind,
          id,
          "unit",
          kind === "measurement" ? "the unit readings are shown in, like V or µF" : "the unit on the label, like µF or W",
        );
        const q = fields.get("quantity");
        let quantity: Quantity | undefined;
        if (q) quantity = p.enumField<Quantity>(q, QUANTITIES, "a quantity");
        else if (unit) {
          quantity = unitQuantity(unit.value) ?? undefined;
          if (!quantity)
            p.err(unit.line, unit.valueCol, `can't tell what ‘${clip(unit.value)}’ measures: add ‘- quantity: …’ (${list(QUANTITIES)})`);
        }
        if (quantity) node.quantity = quantity;
        if (unit) node.unit = unit.value;
        if (kind === "nameplate") {
          if (next) node.next = next.branch;
          break;
        }
        const lim = need(fields, line, kind, id, "limits", "like ‘191 V to 218 V’, ‘at least 135 °F’ or ‘1.5 µF ± 6 %’");
        if (lim) {
          try {
            node.limits = parseLimits(lim.value);
          } catch (e) {
            if (!(e instanceof SyntaxError_)) throw e;
            p.err(lim.line, lim.valueCol + e.offset, e.message);
          }
        }
        const meter = fields.get("meter");
        if (meter) {
          try {
            node.meter = parseMeter(meter.value);
          } catch (e) {
            if (!(e instanceof SyntaxError_)) throw e;
            p.err(meter.line, meter.valueCol + e.offset, e.message);
          }
        }
        const acc = p.enumField(fields.get("acceptance"), ["simple", "guarded"] as const, "an acceptance rule");
        if (acc) node.acceptance = acc;
        const v = fields.get("variable");
        if (v) node.variable = v.value;
        const out: Partial<Record<VerdictKind, Branch>> = {};
        for (const k of ["low", "within", "high", "marginal"] as const) {
          const b = branches.get(k);
          if (b) out[k] = b.branch;
        }
        node.branches = out;
        break;
      }
      case "step":
        if (next) node.next = next.branch;
        break;
      case "caution": {
        const hz = p.enumField<Hazard>(fields.get("hazard"), HAZARDS, "a hazard");
        if (hz) node.hazard = hz;
        if (next) node.next = next.branch;
        break;
      }
      case "outcome": {
        const r = need(fields, line, kind, id, "remedy", "what the technician does about it");
        if (r) node.remedy = r.value;
        node.parts = parts.map((x) => x.text);
        break;
      }
      case "escalate": {
        const r = need(fields, line, kind, id, "reason", "why the call goes to a lead");
        if (r) node.reason = r.value;
        break;
      }
    }
    nodes.push(node);
  });

  tree.nodes = nodes;
  if (tree.start === undefined && nodes[0]) tree.start = nodes[0].id;
  if (tree.start === undefined) p.err(map.title, 1, "the tree has no steps: add a ‘## Step `id`: …’ heading");
  if (p.errors.length) return { ok: false, errors: sortErrors(p.errors), map };

  const checked = TreeSchema.safeParse(tree);
  if (!checked.success) {
    for (const issue of checked.error.issues) {
      const { line, what } = locate(issue.path, map, tree);
      p.err(line, 1, `${what}: ${issue.message}`);
    }
    return { ok: false, errors: p.errors, map };
  }
  return { ok: true, tree: checked.data as Tree, map };
}

function sortErrors(errors: ParseError[]): ParseError[] {
  return errors.sort((a, b) => a.line - b.line || a.column - b.column);
}

function looksLikeField(kind: TreeNode["kind"], line: string): boolean {
  const m = /^[-*+][ \t]+(.*)$/.exec(line);
  if (!m) return false;
  const t = m[1]!;
  if (kind === "question") return /\s(→|->)\s*[a-z0-9-]+\s*$/.test(t);
  const f = /^([a-z]+):\s/.exec(t);
  if (f && FIELDS[kind].includes(f[1]!)) return true;
  const b = /^([a-z]+)\s*(→|->)/.exec(t);
  return Boolean(b && BRANCH_KEYS[kind].includes(b[1]!));
}

function locate(path: readonly PropertyKey[], map: SourceMap, tree: Record<string, unknown>): { line: number; what: string } {
  const describe = (key: PropertyKey | undefined, value: unknown) => {
    const v = typeof value === "string" ? ` ‘${clip(value)}’` : "";
    switch (key) {
      case "id":
        return `the id${v} isn't valid`;
      case "unit":
        return `the unit${v} isn't valid`;
      case "variable":
        return `the variable name${v} isn't valid`;
      case "to":
      case "onExceed":
        return `the step id${v} isn't valid`;
      default:
        return `‘${path.map(String).join(".")}’ isn't valid`;
    }
  };
  let value: unknown = tree;
  for (const k of path) value = value && typeof value === "object" ? (value as Record<PropertyKey, unknown>)[k as string] : undefined;
  const leaf = path[path.length - 1];
  if (path[0] !== "nodes" || typeof path[1] !== "number") {
    const l = typeof path[0] === "string" ? map.fields[path[0]] : undefined;
    return { line: l ?? map.title, what: path[0] === "title" ? "the title isn't valid" : describe(leaf, value) };
  }
  const lines = map.nodes[path[1]];
  if (!lines) return { line: map.title, what: describe(leaf, value) };
  const field = path[2];
  let l: number | undefined;
  if (field === "answers" && typeof path[3] === "number") {
    const node = (tree.nodes as { answers?: { label: string }[] }[])[path[1]];
    const label = node?.answers?.[path[3]]?.label;
    l = label !== undefined ? lines.fields[`answer:${label}`] : undefined;
  } else if (field === "branches" && typeof path[3] === "string") l = lines.fields[path[3]];
  else if (field === "parts" && typeof path[3] === "number") l = lines.fields[`part:${path[3]}`];
  else if (typeof field === "string") l = lines.fields[field];
  return { line: l ?? lines.heading, what: describe(leaf, value) };
}
