// fast-check generators for trees of every shape the schema accepts (not only valid ones):
// generated ids, one-line labels full of punctuation, Markdown bodies, every limit kind, formulas.
import fc from "fast-check";
import {
  CATEGORIES,
  HAZARDS,
  QUANTITIES,
  TOLERANCE_LETTERS,
  type Branch,
  type Limits,
  type LimitValue,
  type Meter,
  type Quantity,
  type Tolerance,
  type Tree,
  type TreeNode,
} from "../../../app/engine/types";
import { QUANTITY_INFO } from "../../../app/engine/units";

export const idArb = fc.array(fc.stringMatching(/^[a-z0-9]{1,6}$/), { minLength: 1, maxLength: 3 }).map((parts) => parts.join("-"));

const PUNCT = [..."abcdefghijklmnopqrstuvwxyz ABCXYZ0123456789 .,;:!?'\"()[]{}<>/\\|@#$%^&*_+=~`-–—→←±°µΩ’‘“”…#*_"];
/** One line, trimmed, non-empty, with punctuation Markdown cares about. */
export const lineArb = fc
  .array(fc.constantFrom(...PUNCT), { minLength: 1, maxLength: 40 })
  .map((cs) =>
    cs
      .join("")
      .replace(/\s+/g, (m) => (m.length > 1 ? "  " : " "))
      .trim(),
  )
  .filter((s) => s.length > 0);

const WORDS = [
  "fan",
  "capacitor",
  "µF",
  "L1–L2",
  "208 V",
  "check",
  "the",
  "motor",
  "*hot*",
  "`code`",
  "**bold**",
  "[link](https://example.test/x)",
  "—",
  "±6 %",
  "O'Brien-free",
  "a_b",
  "#3",
];
const sentence = fc.array(fc.constantFrom(...WORDS), { minLength: 1, maxLength: 8 }).map((w) => w.join(" "));
/** Markdown bodies: paragraphs, lists, images, quotes, level-3 headings, fenced code with "##" inside. */
const block = fc.oneof(
  sentence.map((s) => `${s[0]!.toUpperCase()}${s.slice(1)}.`),
  fc.array(sentence, { minLength: 1, maxLength: 3 }).map((items) => items.map((i) => `- ${i}`).join("\n")),
  fc.array(sentence, { minLength: 1, maxLength: 3 }).map((items) => items.map((i, k) => `${k + 1}. ${i}`).join("\n")),
  sentence.map((s) => `![${s.replace(/[[\]]/g, "")}](images/part-1.jpg)`),
  sentence.map((s) => `> ${s}`),
  sentence.map((s) => `### ${s}`),
  sentence.map((s) => "```\n## not a heading\n" + s + "\n```"),
  fc.constant("| reading | verdict |\n|---|---|\n| 1.47 µF | within |"),
);
export const bodyArb = fc.array(block, { minLength: 1, maxLength: 4 }).map((bs) => bs.join("\n\n"));

const VARS = ["rated_uf", "volts", "watts", "t", "r0", "x1", "supply_volts"];
const numText = fc.oneof(
  fc.integer({ min: 0, max: 2000 }).map(String),
  fc.double({ min: 0.001, max: 100, noNaN: true }).map((x) => x.toPrecision(4)),
  fc.constant("3.9083e-3"),
);
const exprArb: fc.Arbitrary<string> = fc.letrec<{ e: string }>((tie) => ({
  e: fc.oneof(
    { depthSize: "small", withCrossShrink: true },
    fc.constantFrom(...VARS),
    numText,
    fc.tuple(tie("e"), fc.constantFrom("+", "-", "*", "/", "^"), tie("e")).map(([a, op, b]) => `(${a}) ${op} (${b})`),
    tie("e").map((a) => `sqrt(${a})`),
    fc.tuple(tie("e"), tie("e")).map(([a, b]) => `max(${a}, ${b})`),
  ),
})).e;
export const formulaArb = exprArb;

const finite = fc.double({ noNaN: true, noDefaultInfinity: true }).map((x) => (Object.is(x, -0) ? 0 : x));
const unitFor = (q: Quantity) => fc.constantFrom(...QUANTITY_INFO[q].units);
const valueArb = (q: Quantity): fc.Arbitrary<LimitValue> =>
  fc.oneof(
    fc.record({ value: finite }),
    fc.record({ value: finite, unit: unitFor(q) }),
    fc.record({ formula: formulaArb }),
    fc.record({ formula: formulaArb, unit: unitFor(q) }),
  );
const toleranceArb = (q: Quantity): fc.Arbitrary<Tolerance> =>
  fc.oneof(
    finite.map((x) => ({ kind: "percent" as const, plus: x, minus: x })),
    fc.record({ kind: fc.constant("percent" as const), plus: finite, minus: finite }),
    fc.record({ kind: fc.constant("absolute" as const), plus: finite, minus: finite }),
    fc.record({ kind: fc.constant("absolute" as const), plus: finite, minus: finite, unit: unitFor(q) }),
    fc.record({ kind: fc.constant("letter" as const), letter: fc.constantFrom(...TOLERANCE_LETTERS) }),
  );
const limitsArb = (q: Quantity): fc.Arbitrary<Limits> =>
  fc.oneof(
    fc.record({ kind: fc.constant("range" as const), min: valueArb(q), max: valueArb(q) }),
    fc.record({ kind: fc.constant("atLeast" as const), min: valueArb(q) }),
    fc.record({ kind: fc.constant("atMost" as const), max: valueArb(q) }),
    fc.record({ kind: fc.constant("nominal" as const), nominal: valueArb(q), tolerance: toleranceArb(q) }),
  );
const meterArb = (q: Quantity): fc.Arbitrary<Meter> =>
  fc.record(
    { percent: finite, counts: finite, resolution: finite, unit: unitFor(q) },
    { requiredKeys: ["percent", "counts", "resolution"] },
  );

const branchArb = (ids: string[]): fc.Arbitrary<Branch> =>
  fc.record(
    {
      to: fc.constantFrom(...ids),
      recheck: fc.record({ max: fc.integer({ min: -3, max: 50 }), onExceed: fc.constantFrom(...ids) }, { requiredKeys: ["max"] }),
    },
    { requiredKeys: ["to"] },
  );

const optional = <T>(a: fc.Arbitrary<T>) => fc.option(a, { nil: undefined });
function strip<T extends object>(o: T): T {
  for (const k of Object.keys(o) as (keyof T)[]) if (o[k] === undefined) delete o[k];
  return o;
}

const quantityUnit = fc.constantFrom(...QUANTITIES).chain((q) =>
  fc.oneof(
    { weight: 4, arbitrary: unitFor(q).map((unit) => ({ quantity: q, unit })) },
    // A mismatched unit (validation's job) still has to survive the round trip.
    { weight: 1, arbitrary: fc.constantFrom("µF", "V", "°F", "W", "flurb").map((unit) => ({ quantity: q, unit })) },
  ),
);

const nodeArb = (id: string, ids: string[]): fc.Arbitrary<TreeNode> => {
  const base = { id: fc.constant(id), title: lineArb, body: optional(bodyArb) };
  return fc
    .oneof(
      fc.record({
        ...base,
        kind: fc.constant("question" as const),
        answers: fc
          .uniqueArray(fc.record({ label: lineArb, branch: branchArb(ids) }), { selector: (a) => a.label, maxLength: 4 })
          .map((as) => as.map((a) => ({ label: a.label, ...a.branch }))),
      }),
      quantityUnit.chain(({ quantity, unit }) =>
        fc.record({
          ...base,
          kind: fc.constant("measurement" as const),
          quantity: fc.constant(quantity),
          unit: fc.constant(unit),
          limits: limitsArb(quantity),
          variable: optional(fc.constantFrom(...VARS)),
          meter: optional(meterArb(quantity)),
          acceptance: optional(fc.constantFrom("simple" as const, "guarded" as const)),
          branches: fc
            .record({ low: branchArb(ids), within: branchArb(ids), high: branchArb(ids), marginal: branchArb(ids) }, { requiredKeys: [] })
            .map((b) => strip({ ...b })),
        }),
      ),
      fc.record({ ...base, kind: fc.constant("step" as const), next: optional(branchArb(ids)) }),
      fc.record({
        ...base,
        kind: fc.constant("caution" as const),
        hazard: optional(fc.constantFrom(...HAZARDS)),
        next: optional(branchArb(ids)),
      }),
      quantityUnit.chain(({ quantity, unit }) =>
        fc.record({
          ...base,
          kind: fc.constant("nameplate" as const),
          variable: fc.constantFrom(...VARS),
          quantity: fc.constant(quantity),
          unit: fc.constant(unit),
          next: optional(branchArb(ids)),
        }),
      ),
      fc.record({ ...base, kind: fc.constant("outcome" as const), remedy: lineArb, parts: fc.array(lineArb, { maxLength: 3 }) }),
      fc.record({ ...base, kind: fc.constant("escalate" as const), reason: lineArb }),
    )
    .map((n) => strip(n as TreeNode & Record<string, unknown>) as TreeNode);
};

export const treeArb: fc.Arbitrary<Tree> = fc.uniqueArray(idArb, { minLength: 1, maxLength: 8 }).chain((ids) =>
  fc
    .record({
      title: lineArb,
      category: fc.constantFrom(...CATEGORIES),
      symptom: lineArb,
      equipment: optional(lineArb),
      start: fc.constantFrom(...ids),
      description: optional(bodyArb),
      nodes: fc.tuple(...ids.map((id) => nodeArb(id, ids))),
    })
    .map((t) => strip({ ...t, nodes: [...t.nodes] }) as Tree),
);
