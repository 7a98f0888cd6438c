// Invented service history for a shop: customers, sites and units, service calls, and runs that
// walk the shop's published trees with the engine's own traversal (so every path and verdict is
// one the app itself would store), with readings, undos, hand-offs to a lead, abandoned runs,
// parts, reports and practice runs. Deterministic: the same options always give the same rows.
// Used by the demo seed (a few months) and by `npm run db:history` (100,000 runs for the benchmark).
import { and, desc, eq, sql } from "drizzle-orm";
import { createHash } from "node:crypto";
import {
  customers,
  equipmentUnits,
  escalations,
  reports,
  runParts,
  runs,
  runSteps,
  serviceCalls,
  sites,
  treeVersions,
  type EquipmentCategory,
} from "./schema";
import { computeLimits } from "../app/engine/limits";
import { Run } from "../app/engine/traversal";
import type { LogEntry, RunStep } from "../app/engine/traversal";
import type { MeasurementNode, QuestionNode, Tree, TreeNode, VerdictKind } from "../app/engine/types";
import { db } from "../app/lib/db.server";
import { writeRunFacts } from "../app/models/insights/_facts.server";
import { loadVersion } from "../app/models/trees/versions.server";

// --- a small deterministic random source (mulberry32) ----------------------------------------------

export function random(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    next,
    between: (lo: number, hi: number) => lo + (hi - lo) * next(),
    int: (lo: number, hi: number) => lo + Math.floor((hi - lo + 1) * next()),
    chance: (p: number) => next() < p,
    pick: <T>(list: readonly T[]): T => list[Math.floor(next() * list.length)]!,
    weighted: <T>(list: readonly { item: T; weight: number }[]): T => {
      const total = list.reduce((s, x) => s + x.weight, 0);
      let r = next() * total;
      for (const x of list) if ((r -= x.weight) < 0) return x.item;
      return list[list.length - 1]!.item;
    },
    /** Exponentially distributed, with this mean. */
    exp: (mean: number) => -Math.log(1 - next()) * mean,
  };
}
type Random = ReturnType<typeof random>;

const hashInt = (s: string) => createHash("sha256").update(s).digest().readUInt32BE(0);

// --- invented equipment ------------------------------------------------------------------------------

/** Invented makes and models per category (no real brands). */
export const HISTORY_MODELS: Partial<
  Record<EquipmentCategory, { make: string; model: string; nameplate: Record<string, { value: number; unit: string }> }[]>
> = {
  rotisserie: [
    {
      make: "Vantor",
      model: "RCF-2208 two-fan convection rotisserie",
      nameplate: { supply: { value: 208, unit: "V" }, power: { value: 5600, unit: "W" } },
    },
    {
      make: "Vantor",
      model: "RCF-1604 two-fan convection rotisserie",
      nameplate: { supply: { value: 208, unit: "V" }, power: { value: 4200, unit: "W" } },
    },
    { make: "Ostrell", model: "SR-9 spit rotisserie", nameplate: { supply: { value: 208, unit: "V" }, power: { value: 6000, unit: "W" } } },
  ],
  fryer: [
    { make: "Quellmark", model: "GF-40N gas fryer", nameplate: { manifold: { value: 3.5, unit: "inWC" } } },
    { make: "Quellmark", model: "GF-30L gas fryer (LP)", nameplate: { manifold: { value: 10, unit: "inWC" } } },
    { make: "Hobbern", model: "TF-50 tube fryer", nameplate: { manifold: { value: 3.5, unit: "inWC" } } },
  ],
  oven: [
    {
      make: "Brenmoor",
      model: "EO-6 electric deck oven",
      nameplate: { supply: { value: 208, unit: "V" }, power: { value: 6000, unit: "W" } },
    },
    {
      make: "Brenmoor",
      model: "EO-10 convection oven",
      nameplate: { supply: { value: 208, unit: "V" }, power: { value: 10000, unit: "W" } },
    },
    {
      make: "Ostrell",
      model: "CV-5 half-size convection oven",
      nameplate: { supply: { value: 240, unit: "V" }, power: { value: 5000, unit: "W" } },
    },
  ],
  griddle: [
    {
      make: "Brenmoor",
      model: "EG-36 electric griddle",
      nameplate: { supply: { value: 240, unit: "V" }, power: { value: 10800, unit: "W" } },
    },
    {
      make: "Hobbern",
      model: "FG-48 electric griddle",
      nameplate: { supply: { value: 208, unit: "V" }, power: { value: 14400, unit: "W" } },
    },
  ],
  "hot-holding": [
    {
      make: "Caldra",
      model: "HHC-12 heated display case",
      nameplate: { supply: { value: 120, unit: "V" }, power: { value: 1320, unit: "W" } },
    },
    {
      make: "Caldra",
      model: "HHC-8 heated holding cabinet",
      nameplate: { supply: { value: 120, unit: "V" }, power: { value: 1000, unit: "W" } },
    },
    {
      make: "Ostrell",
      model: "HC-20 humidified cabinet",
      nameplate: { supply: { value: 120, unit: "V" }, power: { value: 1500, unit: "W" } },
    },
  ],
};

const PLACE = [
  "Quillfen",
  "Marrowby",
  "Tansel",
  "Brackwell",
  "Orrindale",
  "Fennick",
  "Wexbury",
  "Saltreach",
  "Cobbleton",
  "Dunmere",
  "Hartsell",
  "Pimberly",
];
const TRADE = ["Market", "Bistro", "School Kitchen", "Deli", "Canteen", "Grill House", "Bakehouse", "Diner"];
const STREET = ["Quarry Lane", "Foundry Road", "Weir Street", "Mill Row", "Tanner's Yard", "Chapel Walk", "Barrow Street", "Kiln Road"];

/** Values a technician reads off a nameplate, by the tree's variable name. */
const NAMEPLATE_VALUES: Record<string, readonly string[]> = {
  rated_uf: ["1.5 µF", "1.5 µF", "2 µF", "1.2 µF"],
  element_volts: ["208 V", "208 V", "240 V"],
  element_watts: ["2800 W", "3000 W", "3600 W", "2000 W"],
  probe_r0: ["100 Ω", "1000 Ω"],
  rated_kw: ["6 kW", "10 kW", "5 kW"],
  rated_volts: ["208 V", "240 V"],
  set_temp: ["350 °F", "325 °F", "160 °F"],
  rated_manifold: ["3.5 inWC", "10 inWC"],
  heater_watts: ["1320 W", "1000 W", "1500 W"],
  heater_volts: ["120 V"],
};

// --- what the generator writes ---------------------------------------------------------------------

export type HistoryOptions = {
  shopId: string;
  /** Real runs that end (completed or abandoned); practice runs come on top (about 3 %). */
  runs: number;
  /** The history ends this many days before `end`… */
  days: number;
  end: Date;
  seed: number;
  /** Prefix for ids, so two histories never collide; "demo" ids come from `idOf`. */
  idOf: (kind: string, n: number) => string;
  technicians: string[];
  leads: string[];
  /** Units that exist already (worked first); more are invented as needed. */
  units?: { id: string; category: EquipmentCategory; make: string; model: string }[];
  /** Average days between two calls on one unit, beyond the 30 days a fix is given. */
  meanGapDays: number;
  callNumberFrom: number;
  reportNumberFrom: number;
  town: string;
  /** Called after each batch with the runs written so far. */
  progress?: (written: number) => void;
};

type Version = { versionId: string; treeId: string; tree: Tree; category: EquipmentCategory; symptom: string };

/** The newest published version of each of the shop's trees, with its engine tree. */
async function publishedTrees(shopId: string): Promise<Version[]> {
  const rows = await db()
    .select({ id: treeVersions.id, treeId: treeVersions.treeId, number: treeVersions.number })
    .from(treeVersions)
    .where(and(eq(treeVersions.shopId, shopId), eq(treeVersions.state, "published")))
    .orderBy(desc(treeVersions.number));
  const newest = new Map<string, string>();
  for (const r of rows) if (!newest.has(r.treeId)) newest.set(r.treeId, r.id);
  const out: Version[] = [];
  for (const versionId of [...newest.values()].sort()) {
    const loaded = await loadVersion({ shopId, userId: "", role: "owner" }, versionId);
    if (loaded)
      out.push({
        versionId,
        treeId: loaded.version.treeId,
        tree: loaded.tree,
        category: loaded.version.category,
        symptom: loaded.version.symptom,
      });
  }
  return out;
}

type Rows = {
  customers: (typeof customers.$inferInsert)[];
  sites: (typeof sites.$inferInsert)[];
  units: (typeof equipmentUnits.$inferInsert)[];
  calls: (typeof serviceCalls.$inferInsert)[];
  runs: (typeof runs.$inferInsert)[];
  steps: (typeof runSteps.$inferInsert)[];
  escalations: (typeof escalations.$inferInsert)[];
  parts: (typeof runParts.$inferInsert)[];
  reports: (typeof reports.$inferInsert)[];
  ended: string[];
};
const emptyRows = (): Rows => ({
  customers: [],
  sites: [],
  units: [],
  calls: [],
  runs: [],
  steps: [],
  escalations: [],
  parts: [],
  reports: [],
  ended: [],
});

const SECONDS: Record<TreeNode["kind"], [number, number]> = {
  caution: [15, 60],
  step: [60, 420],
  nameplate: [20, 90],
  question: [20, 150],
  measurement: [60, 300],
  outcome: [0, 0],
  escalate: [0, 0],
};

/** A reading that should come out `want` against the step's limits (the engine has the last word). */
function readingFor(node: MeasurementNode, vars: Readonly<Record<string, number>>, want: VerdictKind, r: Random): string {
  const lim = computeLimits(node, vars);
  let value = 1;
  if (lim.ok) {
    const { lo, hi } = lim.limits;
    const span = lo !== undefined && hi !== undefined ? hi - lo : Math.abs(lo ?? hi ?? 1) * 0.2;
    if (want === "low" && lo !== undefined) value = lo - span * r.between(0.1, 0.8) - Math.abs(lo) * 0.02;
    else if (want === "high" && hi !== undefined) value = hi + span * r.between(0.1, 0.8) + Math.abs(hi) * 0.02;
    else if (want === "marginal" && lo !== undefined) value = lo + span * r.between(0, 0.01);
    else if (lo !== undefined && hi !== undefined) value = lo + span * r.between(0.25, 0.75);
    else if (lo !== undefined) value = lo + span * r.between(0.2, 2);
    else if (hi !== undefined) value = hi - span * r.between(0.2, 2);
    if (node.quantity !== "temperature") value = Math.max(value, 0.001);
  }
  return `${Number(value.toPrecision(4))} ${node.unit}`;
}

/** Weights that differ per tree step and answer, so each step has its own plausible spread. */
function answerWeight(treeKey: string, node: string, label: string, index: number): number {
  return 1 + (hashInt(`${treeKey}:${node}:${label}`) % 7) + (index === 0 ? 3 : 0);
}
/**
 * Steps still to go below a node on its longest path (re-check loops left out). Service calls come
 * in after the simple checks failed, so the generator leans toward the deeper branches.
 */
const depths = new WeakMap<Tree, Map<string, number>>();
function depthOf(tree: Tree, id: string): number {
  let memo = depths.get(tree);
  if (!memo) depths.set(tree, (memo = new Map()));
  const known = memo.get(id);
  if (known !== undefined) return known;
  memo.set(id, 0);
  const node = tree.nodes.find((n) => n.id === id);
  const targets = !node
    ? []
    : node.kind === "question"
      ? node.answers.filter((a) => !a.recheck).map((a) => a.to)
      : node.kind === "measurement"
        ? Object.values(node.branches)
            .filter((b) => b && !b.recheck)
            .map((b) => b!.to)
        : "next" in node && node.next && !node.next.recheck
          ? [node.next.to]
          : [];
  const depth = targets.length ? 1 + Math.max(...targets.map((t) => depthOf(tree, t))) : 0;
  memo.set(id, depth);
  return depth;
}
const deeper = (tree: Tree, to: string | undefined) => {
  if (!to) return 1;
  // Most calls end at a root cause; a tree's "hand it to a lead" ends are the rarer way out.
  const handOver = tree.nodes.find((n) => n.id === to)?.kind === "escalate" ? 0.3 : 1;
  return (1 + depthOf(tree, to) / 2) * handOver;
};

const VERDICT_WEIGHT: Record<VerdictKind, number> = { within: 10, low: 1.3, high: 0.8, marginal: 0.5 };

type Walker = {
  run: Run;
  log: { entry: LogEntry; step?: RunStep; at: Date; by: string; undoes?: number }[];
  clock: Date;
};

function advance(w: Walker, r: Random, node: TreeNode) {
  const [lo, hi] = SECONDS[node.kind];
  w.clock = new Date(w.clock.getTime() + Math.round(r.between(lo, hi) * 1000));
}

/** One entry at the current node, chosen as a technician would; avoid: branches not to take. */
function entryAt(v: Version, node: TreeNode, run: Run, r: Random, avoid: Set<string>, nameplate: Record<string, string>): LogEntry {
  switch (node.kind) {
    case "question": {
      const q = node as QuestionNode;
      const options = q.answers.filter((a) => !avoid.has(`answer:${a.label}`));
      const list = (options.length ? options : q.answers).map((a) => ({
        item: a.label,
        weight: answerWeight(v.treeId, q.id, a.label, q.answers.indexOf(a)) * deeper(v.tree, a.to),
      }));
      return { type: "answer", node: node.id, answer: r.weighted(list) };
    }
    case "measurement": {
      const m = node as MeasurementNode;
      const kinds = (Object.keys(m.branches) as VerdictKind[]).filter((k) => !avoid.has(k));
      const want = kinds.length
        ? r.weighted(kinds.map((k) => ({ item: k, weight: VERDICT_WEIGHT[k] * deeper(v.tree, m.branches[k]?.to) })))
        : "within";
      const entry: LogEntry = { type: "reading", node: node.id, reading: readingFor(m, run.variableValues, want, r) };
      return m.meter ? { ...entry, meter: m.meter } : entry;
    }
    case "nameplate":
      return {
        type: "nameplate",
        node: node.id,
        value: nameplate[node.variable] ?? r.pick(NAMEPLATE_VALUES[node.variable] ?? [`100 ${node.unit}`]),
      };
    case "caution":
      return { type: "acknowledge", node: node.id };
    default:
      return { type: "continue", node: node.id };
  }
}

/** Walks from where the run stands until it ends (or `stopAfter` entries), with the odd mis-tap undone. */
function walk(
  w: Walker,
  v: Version,
  r: Random,
  by: string,
  nameplate: Record<string, string>,
  stopAfter = Infinity,
  avoidFirst = new Set<string>(),
) {
  for (let n = 0; n < stopAfter && w.run.currentNode; n++) {
    const avoid = n === 0 ? avoidFirst : new Set<string>();
    const node = w.run.currentNode;
    advance(w, r, node);
    if ((node.kind === "question" || node.kind === "measurement") && r.chance(0.04)) {
      // A mis-tap or a mistyped reading, taken back at once.
      const wrong = entryAt(v, node, w.run, r, new Set(), nameplate);
      const res = w.run.apply(wrong);
      if (res.ok && res.step) {
        w.log.push({ entry: wrong, step: res.step, at: w.clock, by });
        w.clock = new Date(w.clock.getTime() + 8000);
        const index = res.step.index;
        w.run.apply({ type: "undo" });
        w.log.push({ entry: { type: "undo" }, at: w.clock, by, undoes: index });
      }
    }
    const entry = entryAt(v, node, w.run, r, avoid, nameplate);
    const res = w.run.apply(entry);
    if (!res.ok) throw new Error(`history: ${res.rejection.message}`);
    w.log.push({ entry, step: res.step, at: w.clock, by });
  }
}

function stepRow(
  shopId: string,
  runId: string,
  seq: number,
  item: Walker["log"][number],
  id: string,
  undone: boolean,
): typeof runSteps.$inferInsert {
  const s = item.step;
  const v = s?.verdict;
  const e = item.entry;
  return {
    id,
    runId,
    shopId,
    seq,
    idempotencyKey: id,
    payloadHash: createHash("sha256").update(JSON.stringify(e)).digest("hex"),
    type: e.type,
    nodeKey: e.type === "undo" ? null : e.node,
    kind: s?.kind ?? null,
    answer: s?.answer ?? null,
    typed: e.type === "reading" ? e.reading : e.type === "nameplate" ? e.value : null,
    value: v?.reading.value ?? s?.nameplate?.value ?? null,
    unit: v?.reading.unit ?? s?.nameplate?.unit ?? null,
    siValue: v?.reading.si ?? s?.nameplate?.si ?? null,
    siUnit: v?.reading.siUnit ?? s?.nameplate?.siUnit ?? null,
    verdict: v?.verdict ?? null,
    limitsLo: v?.limits.lo ?? null,
    limitsHi: v?.limits.hi ?? null,
    limits: v?.limits ?? null,
    message: v ? v.message.slice(0, 600) : s?.nameplate ? `${s.nameplate.display} ${s.nameplate.unit}` : null,
    meterId: null,
    meter: e.type === "reading" ? (e.meter ?? null) : null,
    uncertainty: v?.uncertainty?.value ?? null,
    branch: s?.branch ?? null,
    toNode: s?.to ?? null,
    undoesSeq: item.undoes ?? null,
    undone,
    enteredBy: item.by,
    clientAt: item.at,
    recordedAt: item.at,
  };
}

const PART_NUMBER = (description: string) => `P-${String((hashInt(description) % 90000) + 10000)}`;

/** Writes invented history into the shop. Returns how many runs (real and practice) were written. */
export async function generateHistory(
  o: HistoryOptions,
): Promise<{ runs: number; practice: number; steps: number; units: number; calls: number }> {
  const versions = await publishedTrees(o.shopId);
  if (!versions.length) throw new Error("history: the shop has no published trees to walk");
  const byCategory = new Map<string, Version[]>();
  for (const v of versions) byCategory.set(v.category, [...(byCategory.get(v.category) ?? []), v]);
  const categories = [...byCategory.keys()].filter((c) => HISTORY_MODELS[c as EquipmentCategory]) as EquipmentCategory[];
  const r = random(o.seed);
  const start = o.end.getTime() - o.days * 86_400_000;
  const counter = new Map<string, number>();
  const id = (kind: string) => {
    const n = (counter.get(kind) ?? 0) + 1;
    counter.set(kind, n);
    return o.idOf(kind, n);
  };
  let rows = emptyRows();
  const totals = { runs: 0, practice: 0, steps: 0, units: 0, calls: 0 };
  let callNumber = o.callNumberFrom;
  let reportNumber = o.reportNumberFrom;
  let written = 0;

  const flush = async () => {
    const d = db();
    const chunks = async <T>(list: T[], size: number, write: (part: T[]) => Promise<unknown>) => {
      for (let i = 0; i < list.length; i += size) await write(list.slice(i, i + size));
    };
    // Ids are deterministic, so a history cut short by an error is completed by running it again.
    const again = { set: { id: sql`id` } };
    await chunks(rows.customers, 500, (p) => d.insert(customers).values(p).onDuplicateKeyUpdate(again));
    await chunks(rows.sites, 500, (p) => d.insert(sites).values(p).onDuplicateKeyUpdate(again));
    await chunks(rows.units, 500, (p) => d.insert(equipmentUnits).values(p).onDuplicateKeyUpdate(again));
    await chunks(rows.calls, 500, (p) => d.insert(serviceCalls).values(p).onDuplicateKeyUpdate(again));
    await chunks(rows.runs, 500, (p) => d.insert(runs).values(p).onDuplicateKeyUpdate(again));
    await chunks(rows.steps, 1000, (p) => d.insert(runSteps).values(p).onDuplicateKeyUpdate(again));
    await chunks(rows.escalations, 500, (p) => d.insert(escalations).values(p).onDuplicateKeyUpdate(again));
    await chunks(rows.parts, 500, (p) => d.insert(runParts).values(p).onDuplicateKeyUpdate(again));
    await chunks(rows.reports, 500, (p) => d.insert(reports).values(p).onDuplicateKeyUpdate(again));
    await writeRunFacts(d, rows.ended);
    written += rows.runs.length;
    o.progress?.(written);
    rows = emptyRows();
  };

  type Unit = { id: string; category: EquipmentCategory; make: string; model: string };
  const existing = [...(o.units ?? [])].filter((u) => byCategory.has(u.category));
  let customerId = "";
  let siteId = "";
  let siteName = "";
  let invented = 0;
  const newUnit = (): Unit => {
    const n = invented++;
    if (n % 12 === 0) {
      customerId = id("customer");
      const name = `${PLACE[Math.floor(n / 12) % PLACE.length]} ${TRADE[Math.floor(n / 12 / PLACE.length) % TRADE.length]}${n >= 12 * PLACE.length * TRADE.length ? ` ${Math.floor(n / (12 * PLACE.length * TRADE.length)) + 1}` : ""}`;
      rows.customers.push({ id: customerId, shopId: o.shopId, name, phone: `555-${String(1000 + (n % 9000)).padStart(4, "0")}` });
      siteName = name;
    }
    if (n % 4 === 0) {
      siteId = id("site");
      const k = Math.floor((n % 12) / 4) + 1;
      rows.sites.push({
        id: siteId,
        shopId: o.shopId,
        customerId,
        name: `${siteName} — kitchen ${k}`,
        address: `${(n % 97) + 1} ${STREET[n % STREET.length]}, ${o.town}`,
        contactName: "Kitchen manager",
        contactEmail: `kitchen${k}@${siteName.toLowerCase().replace(/[^a-z]+/g, "")}.example`,
      });
    }
    const category = categories[n % categories.length]!;
    const m = r.pick(HISTORY_MODELS[category]!);
    const unit = { id: id("unit"), category, make: m.make, model: m.model };
    rows.units.push({
      ...unit,
      shopId: o.shopId,
      siteId,
      serial: `${m.make.slice(0, 2).toUpperCase()}-${String(100000 + n)}`,
      installedOn: `20${String(15 + (n % 9)).padStart(2, "0")}-0${(n % 9) + 1}-1${n % 9}`,
      nameplate: m.nameplate,
    });
    return unit;
  };

  /** One run on a call (or a practice run without one). */
  const oneRun = (
    v: Version,
    unit: Unit | null,
    callId: string | null,
    at: Date,
    tech: string,
    opts: { abandon?: boolean; practice?: boolean },
  ) => {
    const runId = id("run");
    const w: Walker = { run: new Run(v.tree), log: [], clock: at };
    const nameplate: Record<string, string> = {};
    for (const [k, list] of Object.entries(NAMEPLATE_VALUES)) nameplate[k] = r.pick(list);
    let status: "done" | "abandoned" = "done";
    let holder = tech;
    let abandonReason: string | null = null;
    const escalate = (reason: string, fromTree: boolean) => {
      const raisedAt = new Date(w.clock.getTime() + 60_000);
      const takeOver = !fromTree || r.chance(0.85);
      const lead = r.pick(o.leads);
      const nodeKey = w.run.currentNode?.id ?? w.run.snapshot().finished?.node ?? null;
      w.clock = new Date(raisedAt.getTime() + r.between(10, 90) * 60_000);
      rows.escalations.push({
        id: id("escalation"),
        runId,
        shopId: o.shopId,
        reason,
        nodeKey,
        fromTree,
        raisedBy: tech,
        raisedAt,
        takenBy: takeOver ? lead : null,
        takenAt: takeOver ? w.clock : null,
        closedAt: w.clock,
      });
      return takeOver ? lead : null;
    };
    if (opts.abandon) {
      walk(w, v, r, tech, nameplate, r.int(2, 6));
      status = "abandoned";
      abandonReason = r.pick([
        "Customer needs the unit back for service; return with parts",
        "No access to the panel today",
        "Unit needs a second technician for the lift",
      ]);
    } else if (!opts.practice && r.chance(0.03)) {
      // The technician asks a lead partway, the lead takes it over (or not) and finishes.
      walk(w, v, r, tech, nameplate, r.int(3, 6));
      const lead = w.run.currentNode ? escalate("Not sure what I am seeing; please have a look", false) : null;
      if (lead) holder = lead;
      walk(w, v, r, holder, nameplate);
    } else {
      walk(w, v, r, tech, nameplate);
    }
    const end = w.run.snapshot().finished;
    if (status === "done" && end && end.kind !== "outcome") {
      // The tree sent the run to a lead: the lead takes it over and goes another way, or it is abandoned.
      const lead = escalate(end.reason, true);
      const last = w.log[w.log.length - 1]!;
      if (lead && !opts.practice && last.step) {
        holder = lead;
        w.run.apply({ type: "undo" });
        w.log.push({ entry: { type: "undo" }, at: w.clock, by: lead, undoes: last.step.index });
        walk(w, v, r, lead, nameplate, Infinity, new Set([last.step.branch]));
      }
      if (w.run.snapshot().finished?.kind !== "outcome") {
        status = "abandoned";
        abandonReason = "Handed to the customer's electrician or gas fitter before more work";
      }
    }
    const state = w.run.snapshot();
    const undone = new Set(state.undone);
    w.log.forEach((item, seq) => rows.steps.push(stepRow(o.shopId, runId, seq, item, id("step"), undone.has(seq))));
    totals.steps += w.log.length;
    const outcome =
      status === "done" ? (v.tree.nodes.find((n) => n.id === state.finished?.node) as Extract<TreeNode, { kind: "outcome" }>) : null;
    const diagnosed = w.clock;
    const repairMinutes = r.between(15, 110);
    const completedAt =
      status === "done" ? new Date(diagnosed.getTime() + repairMinutes * 60_000) : new Date(w.clock.getTime() + 5 * 60_000);
    rows.runs.push({
      id: runId,
      shopId: o.shopId,
      callId,
      unitId: unit?.id ?? null,
      treeId: v.treeId,
      versionId: v.versionId,
      technicianId: holder,
      startedBy: tech,
      practice: Boolean(opts.practice),
      scenarioId: null,
      status,
      stepCount: w.log.length,
      currentNode: state.current,
      endKind: state.finished?.kind ?? null,
      endNode: state.finished?.node ?? null,
      rootCause: outcome ? outcome.title.slice(0, 300) : null,
      actionTaken: outcome ? outcome.remedy.slice(0, 4000) : null,
      minutesOnJob: outcome ? Math.max(1, Math.round((completedAt.getTime() - at.getTime()) / 60_000 + r.between(5, 25))) : null,
      abandonReason,
      startedAt: at,
      pausedAt: null,
      completedAt,
      updatedAt: completedAt,
    });
    if (outcome && outcome.parts.length && r.chance(0.85)) {
      const chosen = outcome.parts.slice(0, r.chance(0.3) ? 2 : 1);
      chosen.forEach((p, position) =>
        rows.parts.push({
          id: id("part"),
          runId,
          shopId: o.shopId,
          position,
          partNumber: PART_NUMBER(p),
          description: p.slice(0, 300),
          quantity: r.chance(0.15) ? 2 : 1,
        }),
      );
    }
    if (outcome && !opts.practice)
      rows.reports.push({
        id: id("report"),
        shopId: o.shopId,
        number: reportNumber++,
        runId,
        callId,
        createdBy: holder,
        createdAt: completedAt,
      });
    if (opts.practice) totals.practice++;
    else {
      totals.runs++;
      rows.ended.push(runId);
    }
    return { status, completedAt };
  };

  while (totals.runs < o.runs) {
    const unit = existing.shift() ?? newUnit();
    totals.units++;
    const choices = byCategory.get(unit.category)!;
    let t = start + r.between(0, o.meanGapDays + 30) * 86_400_000;
    while (t < o.end.getTime() - 86_400_000 && totals.runs < o.runs) {
      const v = r.pick(choices);
      const tech = r.pick(o.technicians);
      const callId = id("call");
      const openedAt = new Date(t);
      let at = new Date(t + r.between(1, 30) * 3_600_000);
      const firstAbandoned = r.chance(0.04);
      let result = oneRun(v, unit, callId, at, tech, { abandon: firstAbandoned });
      if (firstAbandoned) {
        at = new Date(result.completedAt.getTime() + r.between(1, 5) * 86_400_000);
        result = oneRun(v, unit, callId, at, tech, {});
      }
      const closed = result.status === "done";
      rows.calls.push({
        id: callId,
        shopId: o.shopId,
        number: callNumber++,
        unitId: unit.id,
        symptom: v.symptom.slice(0, 300),
        priority: r.pick(["normal", "normal", "high", "urgent", "low"] as const),
        // A call whose run was handed on to the customer's electrician or gas fitter is closed unfixed.
        status: closed ? "done" : "cancelled",
        assignedTo: tech,
        notes: null,
        openedBy: r.pick(o.leads),
        openedAt,
        closedAt: result.completedAt,
        updatedAt: result.completedAt,
      });
      totals.calls++;
      if (r.chance(0.03)) oneRun(v, null, null, new Date(t + 3_600_000), r.pick(o.technicians), { practice: true });
      // The unit comes back within the 30 days now and then; otherwise its next call is later.
      const gap = r.chance(0.1) ? r.between(2, 28) : 31 + r.exp(o.meanGapDays);
      t = result.completedAt.getTime() + gap * 86_400_000;
    }
    if (rows.runs.length >= 400) await flush();
  }
  await flush();
  return totals;
}
