import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { readFileSync, readdirSync } from "node:fs";
import { parseTree } from "../../../app/engine/markdown/parse";
import { validateTree, validateTreeData } from "../../../app/engine/validate";
import { adjacency, components, reachFrom } from "../../../app/engine/validation/walk";
import { DEFAULT_REASON, DEFAULT_REMEDY, DEFAULT_TITLE } from "../../../app/engine/defaults";
import type { Branch, Finding, MeasurementNode, Tree, TreeNode } from "../../../app/engine/types";

const TREES = new URL("../../../trees/", import.meta.url);

const tree = (nodes: TreeNode[], start = nodes[0]?.id ?? "a"): Tree => ({ title: "T", category: "other", symptom: "s", start, nodes });
const outcome = (id: string): TreeNode => ({ id, kind: "outcome", title: `Outcome ${id}`, remedy: "fix it", parts: [] });
const step = (id: string, to?: string, extra: Partial<Branch> = {}): TreeNode =>
  to === undefined ? { id, kind: "step", title: `Step ${id}` } : { id, kind: "step", title: `Step ${id}`, next: { to, ...extra } };
const measure = (id: string, over: Partial<MeasurementNode> = {}): MeasurementNode => ({
  id,
  kind: "measurement",
  title: `Measure ${id}`,
  quantity: "voltage",
  unit: "V",
  limits: { kind: "range", min: { value: 1 }, max: { value: 2 } },
  branches: { low: { to: "end" }, within: { to: "end" }, high: { to: "end" } },
  ...over,
});
const codes = (t: Tree) => validateTree(t).findings.map((f) => `${f.severity}:${f.code}${f.nodeId ? `@${f.nodeId}` : ""}`);
const find = (t: Tree, code: string): Finding | undefined => validateTree(t).findings.find((f) => f.code === code);

describe("starter trees", () => {
  for (const file of readdirSync(TREES).filter((f) => f.endsWith(".md"))) {
    it(`trees/${file} validates with no errors or warnings`, () => {
      const r = parseTree(readFileSync(new URL(file, TREES), "utf8"));
      if (!r.ok) throw new Error(JSON.stringify(r.errors));
      expect(validateTree(r.tree).findings).toEqual([]);
    });
  }
  it("at least five trees across at least five equipment categories, each with a caution", () => {
    const trees = readdirSync(TREES)
      .filter((f) => f.endsWith(".md"))
      .map((f) => parseTree(readFileSync(new URL(f, TREES), "utf8")))
      .map((r) => (r.ok ? r.tree : null))
      .filter((t): t is Tree => t !== null);
    expect(trees.length).toBeGreaterThanOrEqual(5);
    expect(new Set(trees.map((t) => t.category)).size).toBeGreaterThanOrEqual(5);
    for (const t of trees) expect(t.nodes.some((n) => n.kind === "caution")).toBe(true);
  });
});

describe("findings a lead tech can act on", () => {
  it("a step with no way on", () => {
    const f = find(tree([{ id: "a", kind: "step", title: "Check fan rotation" }]), "dead-end");
    expect(f).toMatchObject({ severity: "error", nodeId: "a" });
    expect(f!.message).toBe("Step ‘Check fan rotation’ has no way on: add a next step or make it an outcome.");
  });
  it("unreachable nodes are warnings", () => {
    expect(codes(tree([step("a", "end"), outcome("end"), outcome("lost")]))).toEqual(["warning:unreachable@lost"]);
  });
  it("a branch to an id that doesn't exist", () => {
    const f = find(tree([step("a", "nowhere")]), "unknown-target");
    expect(f!.message).toBe("Step ‘Step a’ sends ‘next’ to ‘nowhere’, but no step has that id.");
    expect(f!.field).toBe("next");
  });
  it("duplicate ids", () => {
    expect(codes(tree([step("a", "end"), outcome("end"), outcome("end")]))).toContain("error:duplicate-id@end");
  });
  it("the start must exist", () => {
    expect(codes(tree([outcome("end")], "begin"))).toContain("error:start-missing");
  });
  it("verdicts with no branch: at least low/within/high, plus marginal under guarded acceptance", () => {
    const t = tree([
      measure("a", { branches: { within: { to: "end" } }, acceptance: "guarded", meter: { percent: 1, counts: 1, resolution: 0.1 } }),
      outcome("end"),
    ]);
    const msgs = validateTree(t)
      .findings.filter((f) => f.code === "missing-branch")
      .map((f) => f.message);
    expect(msgs).toEqual([
      "Measurement ‘Measure a’ has nowhere to go on a low reading: add ‘- low → …’.",
      "Measurement ‘Measure a’ has nowhere to go on a high reading: add ‘- high → …’.",
      "Measurement ‘Measure a’ has nowhere to go on a marginal reading: add ‘- marginal → …’.",
    ]);
  });
  it("one-sided limits need only their two branches; an impossible branch is a warning", () => {
    expect(
      codes(
        tree([
          measure("a", { limits: { kind: "atLeast", min: { value: 135 } }, branches: { low: { to: "end" }, within: { to: "end" } } }),
          outcome("end"),
        ]),
      ),
    ).toEqual([]);
    expect(codes(tree([measure("a", { limits: { kind: "atLeast", min: { value: 135 } } }), outcome("end")]))).toEqual([
      "warning:unused-branch@a",
    ]);
  });
  it("answers: at least two, no duplicates", () => {
    expect(codes(tree([{ id: "a", kind: "question", title: "Q", answers: [{ label: "yes", to: "end" }] }, outcome("end")]))).toEqual([
      "error:too-few-answers@a",
    ]);
    expect(
      codes(
        tree([
          {
            id: "a",
            kind: "question",
            title: "Q",
            answers: [
              { label: "yes", to: "end" },
              { label: "yes", to: "end" },
            ],
          },
          outcome("end"),
        ]),
      ),
    ).toEqual(["error:duplicate-answer@a"]);
  });
  it("cycles are errors unless marked as a bounded re-check loop", () => {
    const loop = tree([
      step("a", "b"),
      measure("b", { branches: { low: { to: "a" }, within: { to: "end" }, high: { to: "end" } } }),
      outcome("end"),
    ]);
    const f = find(loop, "cycle");
    expect(f!.message).toMatch(/^These steps loop with no limit: a → b → a\./);
    const marked = tree([
      step("a", "b"),
      measure("b", { branches: { low: { to: "a", recheck: { max: 2 } }, within: { to: "end" }, high: { to: "end" } } }),
      outcome("end"),
    ]);
    expect(codes(marked)).toEqual([]);
  });
  it("every cycle must pass through a marked branch, even one that leaves by the exit", () => {
    // b's marked loop exits to c, and c goes straight back to a: an unbounded cycle a → b → c → a.
    const t = tree([
      step("a", "b"),
      measure("b", { branches: { low: { to: "a", recheck: { max: 2, onExceed: "c" } }, within: { to: "end" }, high: { to: "end" } } }),
      step("c", "a"),
      outcome("end"),
    ]);
    // Reported at the branch that closes the unbounded loop: c's next, back to a (issue 10 item 10).
    expect(codes(t)).toContain("error:cycle@c");
    expect(find(t, "cycle")).toMatchObject({ nodeId: "c", field: "next" });
  });
  it("a re-check mark on a branch that doesn't loop is a warning; a bound below 1 is an error", () => {
    expect(codes(tree([step("a", "end", { recheck: { max: 2 } }), outcome("end")]))).toEqual(["warning:recheck-not-a-loop@a"]);
    expect(codes(tree([step("a", "a", { recheck: { max: 0 } })]))).toContain("error:recheck-bound@a");
  });
  it("dimension mismatches between a node's unit and its quantity or limits", () => {
    expect(find(tree([measure("a", { quantity: "capacitance", unit: "V" }), outcome("end")]), "unit-quantity")!.message).toBe(
      "Measurement ‘Measure a’ records a capacitance, but its unit ‘V’ is a voltage: use µF, nF, pF, F.",
    );
    const f = find(
      tree([
        measure("a", {
          limits: { kind: "atMost", max: { value: 2, unit: "µF" } },
          branches: { within: { to: "end" }, high: { to: "end" } },
        }),
        outcome("end"),
      ]),
      "limit-dimension",
    );
    expect(f!.message).toBe("A limit of Measurement ‘Measure a’ is in µF (a capacitance), but the step measures a voltage in V.");
    expect(codes(tree([measure("a", { unit: "uFF" }), outcome("end")]))).toContain("error:unit-unknown@a");
    expect(
      codes(
        tree([
          measure("a", {
            limits: { kind: "nominal", nominal: { value: 5 }, tolerance: { kind: "absolute", plus: 1, minus: 1, unit: "A" } },
          }),
          outcome("end"),
        ]),
      ),
    ).toContain("error:limit-dimension@a");
  });
  it("inconsistent limits: min above max, negative tolerance, percent of a temperature", () => {
    expect(codes(tree([measure("a", { limits: { kind: "range", min: { value: 218 }, max: { value: 191 } } }), outcome("end")]))).toEqual([
      "error:limits-inverted@a",
    ]);
    expect(
      codes(tree([measure("a", { limits: { kind: "range", min: { value: 2, unit: "kV" }, max: { value: 300 } } }), outcome("end")])),
    ).toEqual(["error:limits-inverted@a"]);
    expect(
      codes(
        tree([
          measure("a", { limits: { kind: "nominal", nominal: { value: 5 }, tolerance: { kind: "percent", plus: 6, minus: -6 } } }),
          outcome("end"),
        ]),
      ),
    ).toEqual(["error:negative-tolerance@a"]);
    expect(
      codes(
        tree([
          measure("a", {
            quantity: "temperature",
            unit: "°F",
            limits: { kind: "nominal", nominal: { value: 350 }, tolerance: { kind: "percent", plus: 5, minus: 5 } },
          }),
          outcome("end"),
        ]),
      ),
    ).toEqual(["warning:percent-of-temperature@a"]);
  });
  it("meters and guarded acceptance", () => {
    expect(codes(tree([measure("a", { meter: { percent: 1, counts: 3, resolution: 0 } }), outcome("end")]))).toEqual([
      "error:meter-invalid@a",
    ]);
    expect(
      codes(
        tree([
          measure("a", {
            acceptance: "guarded",
            branches: { low: { to: "end" }, within: { to: "end" }, high: { to: "end" }, marginal: { to: "end" } },
          }),
          outcome("end"),
        ]),
      ),
    ).toEqual(["warning:guarded-without-meter@a"]);
  });
  it("formulas: syntax, unknown functions and unknown variables", () => {
    const f = (formula: string) =>
      tree([
        measure("a", { limits: { kind: "nominal", nominal: { formula }, tolerance: { kind: "percent", plus: 5, minus: 5 } } }),
        outcome("end"),
      ]);
    expect(codes(f("volts^^2"))).toContain("error:formula-syntax@a");
    expect(codes(f("cbrt(8)"))).toContain("error:formula-function@a");
    expect(find(f("rated_uf"), "unknown-variable")!.message).toBe(
      "Measurement ‘Measure a’ uses ‘rated_uf’ in its limits, but no nameplate input or measurement records ‘rated_uf’.",
    );
  });
  it("variables: one unit per name, no function names", () => {
    const np = (id: string, unit: string, to: string, variable = "rated"): TreeNode => ({
      id,
      kind: "nameplate",
      title: `Plate ${id}`,
      variable,
      quantity: "capacitance",
      unit,
      next: { to },
    });
    expect(codes(tree([np("a", "µF", "b"), np("b", "nF", "end"), outcome("end")]))).toEqual(["error:variable-units@b"]);
    expect(codes(tree([np("a", "µF", "end", "sqrt"), outcome("end")]))).toEqual(["error:variable-reserved@a"]);
  });
});

describe("data flow: a formula variable must be recorded on every path into the node", () => {
  const np = (id: string, variable: string, to: string): TreeNode => ({
    id,
    kind: "nameplate",
    title: `Plate ${id}`,
    variable,
    quantity: "voltage",
    unit: "V",
    next: { to },
  });
  const uses = (id: string, formula: string): MeasurementNode =>
    measure(id, { limits: { kind: "nominal", nominal: { formula }, tolerance: { kind: "percent", plus: 5, minus: 5 } } });
  const q = (id: string, a: string, b: string): TreeNode => ({
    id,
    kind: "question",
    title: `Q ${id}`,
    answers: [
      { label: "x", to: a },
      { label: "y", to: b },
    ],
  });

  it("defined on both arms of a diamond: fine", () => {
    expect(codes(tree([q("s", "p1", "p2"), np("p1", "v", "m"), np("p2", "v", "m"), uses("m", "v * 2"), outcome("end")]))).toEqual([]);
  });
  it("defined on one arm only: an error with an example path that skips it", () => {
    const f = find(tree([q("s", "p1", "m"), np("p1", "v", "m"), uses("m", "v * 2"), outcome("end")]), "variable-not-always-set");
    expect(f!.message).toBe(
      "Measurement ‘Measure m’ uses ‘v’ in its limits, but some ways into it don't record ‘v’ first — for example s → m. Record it earlier on every path, or use fixed limits.",
    );
  });
  it("defined after the use: an error", () => {
    expect(
      codes(
        tree(
          [uses("m", "v"), np("p", "v", "end"), outcome("end")].map((n) =>
            n.id === "m" ? { ...n, branches: { low: { to: "p" }, within: { to: "p" }, high: { to: "p" } } } : n,
          ) as TreeNode[],
        ),
      ),
    ).toContain("error:variable-not-always-set@m");
  });
  it("a measurement's own reading is not available to its own limits", () => {
    expect(codes(tree([{ ...uses("m", "v"), variable: "v" }, outcome("end")]))).toContain("error:variable-not-always-set@m");
  });
  it("defined inside a re-check loop body before the use: fine", () => {
    const t = tree([
      np("p", "v", "m"),
      {
        ...uses("m", "v"),
        branches: { low: { to: "p", recheck: { max: 2, onExceed: "end" } }, within: { to: "end" }, high: { to: "end" } },
      },
      outcome("end"),
    ]);
    expect(codes(t)).toEqual([]);
  });

  it("works across many variables (more than one 32-bit word of the bitset)", () => {
    const names = Array.from({ length: 40 }, (_, i) => `v${i}`);
    const chain = names.map((v, i) => np(`p${i}`, v, i + 1 < names.length ? `p${i + 1}` : "s"));
    // One arm of the diamond records v33 again; the other skips past v39's use…
    const t = tree([...chain, q("s", "x1", "m"), np("x1", "v33", "m"), uses("m", "v31 + v33 + v39 + v0"), outcome("end")], "p0");
    expect(codes(t)).toEqual([]);
    // …and here v33 is only recorded on one arm.
    const t2 = tree(
      [
        ...chain.filter((n) => n.id !== "p33").map((n) => (n.id === "p32" ? { ...n, next: { to: "p34" } } : n)),
        q("s", "x1", "m"),
        np("x1", "v33", "m"),
        uses("m", "v31 + v33 + v39"),
        outcome("end"),
      ] as TreeNode[],
      "p0",
    );
    expect(codes(t2)).toEqual(["error:variable-not-always-set@m"]);
  });

  // Property: compare with an independent oracle — per variable, search from the start without
  // passing through any node that records it; a use reached that way is not always defined.
  const graphArb = fc.integer({ min: 2, max: 10 }).chain((n) =>
    fc.tuple(
      fc.constant(n),
      fc.array(
        fc.record({
          kind: fc.constantFrom("nameplate", "measurement", "question", "step", "outcome"),
          variable: fc.constantFrom("a", "b", "c", undefined),
          uses: fc.subarray(["a", "b", "c"]),
          to: fc.array(fc.nat(n - 1), { minLength: 2, maxLength: 2 }),
        }),
        { minLength: n, maxLength: n },
      ),
    ),
  );
  function build([n, specs]: [number, { kind: string; variable: string | undefined; uses: string[]; to: number[] }[]]): Tree {
    const id = (i: number) => `n${i}`;
    const nodes: TreeNode[] = specs.slice(0, n).map((s, i) => {
      const [t0, t1] = s.to.map(id) as [string, string];
      switch (s.kind) {
        case "nameplate":
          return {
            id: id(i),
            kind: "nameplate",
            title: id(i),
            variable: s.variable ?? "a",
            quantity: "voltage",
            unit: "V",
            next: { to: t0 },
          };
        case "measurement": {
          const m: MeasurementNode = {
            id: id(i),
            kind: "measurement",
            title: id(i),
            quantity: "voltage",
            unit: "V",
            limits: s.uses.length
              ? { kind: "nominal", nominal: { formula: s.uses.join(" + ") }, tolerance: { kind: "percent", plus: 1, minus: 1 } }
              : { kind: "atLeast", min: { value: 1 } },
            branches: s.uses.length ? { low: { to: t0 }, within: { to: t1 }, high: { to: t0 } } : { low: { to: t0 }, within: { to: t1 } },
          };
          if (s.variable) m.variable = s.variable;
          return m;
        }
        case "question":
          return {
            id: id(i),
            kind: "question",
            title: id(i),
            answers: [
              { label: "p", to: t0 },
              { label: "q", to: t1 },
            ],
          };
        case "step":
          return { id: id(i), kind: "step", title: id(i), next: { to: t0 } };
        default:
          return { id: id(i), kind: "outcome", title: id(i), remedy: "r", parts: [] };
      }
    });
    return tree(nodes, "n0");
  }
  function oracle(t: Tree): Set<string> {
    const byId = new Map(t.nodes.map((n) => [n.id, n]));
    const succ = (n: TreeNode): string[] =>
      n.kind === "question"
        ? n.answers.map((a) => a.to)
        : n.kind === "measurement"
          ? Object.values(n.branches).map((b) => b!.to)
          : "next" in n && n.next
            ? [n.next.to]
            : [];
    const records = (n: TreeNode, v: string) => (n.kind === "nameplate" || n.kind === "measurement") && n.variable === v;
    const reachable = new Set<string>([t.start]);
    for (const id of reachable) for (const s of succ(byId.get(id)!)) reachable.add(s);
    const out = new Set<string>();
    for (const v of ["a", "b", "c"]) {
      if (!t.nodes.some((n) => records(n, v))) continue;
      const seen = new Set<string>([t.start]);
      for (const id of seen) {
        const n = byId.get(id)!;
        if (records(n, v)) continue;
        for (const s of succ(n)) seen.add(s);
      }
      for (const n of t.nodes) {
        if (n.kind !== "measurement" || !reachable.has(n.id) || n.limits.kind !== "nominal" || !("formula" in n.limits.nominal)) continue;
        if (n.limits.nominal.formula.split(" + ").includes(v) && seen.has(n.id)) out.add(`${n.id}:${v}`);
      }
    }
    return out;
  }
  it("property: the bitset analysis flags exactly the uses the oracle finds", () => {
    fc.assert(
      fc.property(graphArb, (g) => {
        const t = build(g);
        const got = new Set(
          validateTree(t)
            .findings.filter((f) => f.code === "variable-not-always-set")
            .map((f) => `${f.nodeId}:${/uses ‘(\w+)’/.exec(f.message)![1]}`),
        );
        expect([...got].sort()).toEqual([...oracle(t)].sort());
      }),
      { numRuns: 1000 },
    );
  });
});

describe("data of unknown shape", () => {
  it("goes through the schema first", () => {
    const r = validateTreeData({
      title: "T",
      category: "toaster",
      symptom: "s",
      start: "a",
      nodes: [{ id: "A B", kind: "step", title: "x" }],
    });
    expect(r.tree).toBeNull();
    expect(r.result.findings.map((f) => f.code)).toEqual(["shape", "shape"]);
    expect(r.result.findings[1]).toMatchObject({ nodeIndex: 0, nodeId: "A B" });
  });
});

describe("graph walks (one depth-first search under reachability and Tarjan's components)", () => {
  const graphs = fc
    .integer({ min: 1, max: 12 })
    .chain((n) => fc.tuple(fc.constant(n), fc.array(fc.tuple(fc.nat(n - 1), fc.nat(n - 1)), { maxLength: 30 })));
  // Oracle: plain breadth-first reachability from each node.
  function reaches(n: number, edges: [number, number][]): boolean[][] {
    return Array.from({ length: n }, (_, s) => {
      const seen = Array<boolean>(n).fill(false);
      seen[s] = true;
      const queue = [s];
      for (let q = 0; q < queue.length; q++)
        for (const [a, b] of edges)
          if (a === queue[q] && !seen[b]) {
            seen[b] = true;
            queue.push(b);
          }
      return seen;
    });
  }
  it("property: two nodes share a component exactly when each reaches the other; reverse post-order lists what the start reaches", () => {
    fc.assert(
      fc.property(graphs, ([n, edges]) => {
        const g = adjacency(
          n,
          edges.map((e) => e[0]),
          edges.map((e) => e[1]),
          () => true,
        );
        const r = reaches(n, edges);
        const c = components(g, n);
        for (let a = 0; a < n; a++) for (let b = 0; b < n; b++) expect(c.comp[a] === c.comp[b]).toBe(r[a]![b]! && r[b]![a]!);
        const { reach, order } = reachFrom(g, n, 0);
        expect([...reach].map(Boolean)).toEqual(r[0]);
        expect([...order].sort((x, y) => x - y)).toEqual(r[0]!.flatMap((v, i) => (v ? [i] : [])));
        // Reverse post-order: along an edge between different components, the tail comes first.
        const pos = new Map(order.map((v, i) => [v, i]));
        for (const [a, b] of edges) if (reach[a] && c.comp[a] !== c.comp[b]) expect(pos.get(a)!).toBeLessThan(pos.get(b)!);
      }),
      { numRuns: 500 },
    );
  });
});

describe("issue 10 items 9–11: findings told once, at their cause, and placeholders caught", () => {
  it("item 9: one branch to a missing node reports the cause once and folds what it cuts off into it", () => {
    // The capacitor branch has a typo: 'cap-mesure' for 'cap-measure'; everything behind it is cut off.
    const t = tree([
      {
        id: "fans",
        kind: "question",
        title: "Fans",
        answers: [
          { label: "ok", to: "end" },
          { label: "slow", to: "cap-mesure" },
        ],
      },
      measure("cap-measure", { branches: { low: { to: "failed" }, within: { to: "shaft" }, high: { to: "failed" } } }),
      {
        id: "shaft",
        kind: "question",
        title: "Shaft",
        answers: [
          { label: "free", to: "winding" },
          { label: "stiff", to: "seized" },
        ],
      },
      outcome("failed"),
      outcome("winding"),
      outcome("seized"),
      outcome("end"),
    ]);
    const r = validateTree(t);
    expect(r.findings.map((f) => `${f.severity}:${f.code}@${f.nodeId}`)).toEqual(["error:unknown-target@fans"]);
    expect(r.findings[0]!.message).toBe(
      "Question ‘Fans’ sends ‘slow’ to ‘cap-mesure’, but no step has that id — did you mean ‘cap-measure’? Until it is fixed, ‘cap-measure’ and the 4 steps after it can't be reached.",
    );
    expect(r.findings[0]!.covers).toEqual(["cap-measure", "failed", "shaft", "winding", "seized"]);
  });
  it("item 9: on a 10,000-node tree one typo is one finding, not a thousand", async () => {
    const { generateTree } = await import("../../../scripts/bench-engine");
    const big = generateTree(10_000);
    const k = 417;
    const m = big.nodes.find((n) => n.id === `b${k - 1}-m`) as MeasurementNode;
    m.branches.within = { to: `b${k}-cuation` }; // typo for b417-caution
    const r = validateTree(big);
    expect(r.findings).toHaveLength(1);
    expect(r.findings[0]!.message).toMatch(
      /did you mean ‘b417-caution’\? Until it is fixed, ‘b417-caution’ and the 4,\d{3} steps after it can't be reached\.$/,
    );
  });
  it("item 9: an unreachable part with no missing branch behind it is one warning at its first node", () => {
    const t = tree([step("a", "end"), outcome("end"), step("lost", "lost2"), step("lost2", "lost3"), outcome("lost3")]);
    expect(validateTree(t).findings).toEqual([
      {
        severity: "warning",
        code: "unreachable",
        nodeId: "lost",
        nodeIndex: 2,
        message:
          "Step ‘Step lost’ can't be reached from the start, nor can the 2 steps after it: link to it from another step or delete them.",
        covers: ["lost2", "lost3"],
      },
    ]);
  });
  it("item 10: an unbounded loop is reported at the branch that closes it", () => {
    const t = tree([
      step("a", "b"),
      step("b", "c"),
      measure("c", { branches: { low: { to: "b" }, within: { to: "end" }, high: { to: "end" } } }),
      outcome("end"),
    ]);
    const f = find(t, "cycle")!;
    expect(f).toMatchObject({ nodeId: "c", nodeIndex: 2, field: "low" });
    expect(f.message).toBe(
      "These steps loop with no limit: b → c → b. ‘low’ of Measurement ‘Measure c’ goes back to ‘b’: mark it as a re-check loop, like ‘(re-check up to 2 times, then escalate-id)’, or remove it.",
    );
  });
  it("item 11: the editor's placeholder texts are errors until replaced", () => {
    const t = tree([
      { id: "a", kind: "step", title: DEFAULT_TITLE.step, next: { to: "b" } },
      {
        id: "b",
        kind: "question",
        title: "Is it hot?",
        answers: [
          { label: "yes", to: "c" },
          { label: "no", to: "d" },
        ],
      },
      { id: "c", kind: "outcome", title: "Element failed", remedy: DEFAULT_REMEDY, parts: [] },
      { id: "d", kind: "escalate", title: DEFAULT_TITLE.escalate, reason: DEFAULT_REASON },
    ]);
    const r = validateTree(t);
    expect(r.findings.map((f) => `${f.code}@${f.nodeId}:${f.field}`)).toEqual([
      "default-text@a:title",
      "default-text@c:remedy",
      "default-text@d:title",
      "default-text@d:reason",
    ]);
    expect(r.findings[0]!.message).toBe("Step ‘New step’ still has the editor's placeholder title ‘New step’: say what this step is.");
    expect(r.ok).toBe(false);
  });
  it("item 11: a placeholder the editor numbered (‘New root cause 2’) is still a placeholder; a real title with a number is not", () => {
    const t = tree([
      { id: "a", kind: "step", title: "Check fan 2", next: { to: "b" } },
      { id: "b", kind: "outcome", title: `${DEFAULT_TITLE.outcome} 2`, remedy: "Replace the capacitor.", parts: [] },
    ]);
    expect(
      validateTree(t)
        .findings.filter((f) => f.code === "default-text")
        .map((f) => `${f.nodeId}:${f.field}`),
    ).toEqual(["b:title"]);
  });
  it("item 11: two nodes with the same title are flagged, so they can be told apart", () => {
    const t = tree([step("a", "b"), { id: "b", kind: "step", title: "Step a", next: { to: "end" } }, outcome("end")]);
    expect(validateTree(t).findings).toEqual([
      {
        severity: "warning",
        code: "duplicate-title",
        nodeId: "b",
        nodeIndex: 1,
        field: "title",
        message:
          "‘b’ and ‘a’ are both titled ‘Step a’: give each its own title, so they can be told apart wherever they are picked (branch lists, the run's history, the report).",
      },
    ]);
  });
});
