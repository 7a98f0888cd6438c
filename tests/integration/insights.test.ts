// Owner insights against the real MariaDB, on a small shop built here through the app's own model
// functions (calls, runs, steps, outcomes, hand-offs), with the clock set for each step so every
// count, rate, median and percentile below can be worked out by hand. The demo shop's invented
// history sits in the same database and must never leak in; practice runs never count.
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { quantileSeq } from "mathjs";
import { customers, equipmentUnits, memberships, shops, sites, users } from "../../db/schema";
import { DEMO_SHOP } from "../../db/demo";
import { stableId } from "../../db/seed";
import { parseTree } from "../../app/engine/markdown/parse";
import type { Ctx } from "../../app/lib/context";
import { closeDb, db } from "../../app/lib/db.server";
import { FOUND_HERE_MIN_RUNS, stepSentence } from "../../app/lib/insights/found-here";
import { parseFilters } from "../../app/lib/insights/filters";
import { createCall } from "../../app/models/calls.server";
import { factsOf, rebuildInsights } from "../../app/models/insights/_facts.server";
import { foundHereBefore } from "../../app/models/insights/found-here.server";
import { overview, overviewTable } from "../../app/models/insights/overview.server";
import { changeRunStatus, recordOutcome, type OutcomeInput } from "../../app/models/runs/lifecycle.server";
import { startRun } from "../../app/models/runs/start.server";
import { finishPractice } from "../../app/models/training/practice.server";
import { postStep, type StepInput } from "../../app/models/runs/steps.server";
import { createPublishedTree } from "../../app/models/trees/drafts.server";
import { loader as csvLoader } from "../../app/routes/api.insights.csv";
import { loader as foundHereLoader } from "../../app/routes/api.insights.found-here";
import { cookieFor, requestWith, routeArgs } from "../support/session";

afterAll(async () => {
  vi.useRealTimers();
  await closeDb();
});

const tag = crypto.randomUUID().slice(0, 8);
const treeFile = (name: string) => {
  const parsed = parseTree(readFileSync(`trees/${name}`, "utf8"));
  if (!parsed.ok) throw new Error(name);
  return parsed.tree;
};

type Shop = {
  id: string;
  owner: Ctx;
  lead: Ctx;
  tech1: Ctx;
  tech2: Ctx;
  trainer: Ctx;
  emails: Record<string, string>;
  units: Record<string, string>;
  trees: Record<string, { treeId: string; versionId: string }>;
};

/** A fresh invented shop with people, two customers, three units and the rotisserie and griddle trees. */
async function makeShop(
  name: string,
  unitSpecs: { key: string; category: string; make: string; model: string; customer: number }[],
): Promise<Shop> {
  const id = crypto.randomUUID();
  await db()
    .insert(shops)
    .values({ id, name, town: "Ashgrove", settings: { timeZone: "America/Chicago" } });
  const people: Record<string, Ctx> = {};
  const emails: Record<string, string> = {};
  for (const role of ["owner", "lead", "tech1", "tech2", "trainer"] as const) {
    const userId = crypto.randomUUID();
    emails[role] = `${role}-${tag}-${id.slice(0, 4)}@ashgrove.example`;
    await db()
      .insert(users)
      .values({ id: userId, email: emails[role]!, name: `${role} ${tag}`, passwordHash: "x" });
    const r = role.startsWith("tech") ? "technician" : role;
    await db()
      .insert(memberships)
      .values({ shopId: id, userId, role: r as Ctx["role"] });
    people[role] = { shopId: id, userId, role: r as Ctx["role"] };
  }
  const customerIds = [crypto.randomUUID(), crypto.randomUUID()];
  const siteIds = [crypto.randomUUID(), crypto.randomUUID()];
  for (const i of [0, 1]) {
    await db()
      .insert(customers)
      .values({ id: customerIds[i], shopId: id, name: `Customer ${i + 1} ${tag}` });
    await db()
      .insert(sites)
      .values({
        id: siteIds[i],
        shopId: id,
        customerId: customerIds[i]!,
        name: `Site ${i + 1}`,
        address: "1 Test Row",
        contactName: "Manager",
        contactEmail: "m@ashgrove.example",
      });
  }
  const units: Record<string, string> = {};
  for (const u of unitSpecs) {
    const unitId = crypto.randomUUID();
    await db()
      .insert(equipmentUnits)
      .values({
        id: unitId,
        shopId: id,
        siteId: siteIds[u.customer]!,
        category: u.category as never,
        make: u.make,
        model: u.model,
        serial: `S-${u.key}`,
        nameplate: {},
      });
    units[u.key] = unitId;
  }
  const trees: Shop["trees"] = {};
  for (const [key, file] of [
    ["rot", "rotisserie-uneven-heat.md"],
    ["grd", "griddle-section-no-heat.md"],
  ] as const) {
    trees[key] = await createPublishedTree(people.lead!, treeFile(file), "for the insights test");
  }
  return {
    id,
    owner: people.owner!,
    lead: people.lead!,
    tech1: people.tech1!,
    tech2: people.tech2!,
    trainer: people.trainer!,
    emails,
    units,
    trees,
    ...{ customers: customerIds, sites: siteIds },
  } as Shop & { customers: string[]; sites: string[] };
}

const at = (iso: string) => vi.setSystemTime(new Date(iso));
const plus = (iso: string, seconds: number) => new Date(Date.parse(iso) + seconds * 1000).toISOString();

type Entry = StepInput["entry"];
/** Posts each entry with the clock at start + 60 s, + 120 s, … (each step one minute after the last). */
async function steps(ctx: Ctx, runId: string, start: string, entries: Entry[], firstOffset = 60) {
  let t = firstOffset;
  for (const entry of entries) {
    at(plus(start, t));
    await postStep(ctx, runId, { key: crypto.randomUUID(), entry });
    t += 60;
  }
  return t - 60;
}

async function call(shop: Shop, unit: string, openedAt: string) {
  at(openedAt);
  const c = await createCall(shop.lead, {
    unitId: shop.units[unit]!,
    symptom: "test call",
    priority: "normal",
    assignedTo: null,
    notes: null,
  });
  return c.id;
}

async function start(ctx: Ctx, treeId: string, startedAt: string, callId?: string, practice = false) {
  at(startedAt);
  const r = await startRun(ctx, { treeId, callId, practice });
  return r.runId;
}

async function finish(ctx: Ctx, runId: string, when: string, input: OutcomeInput) {
  at(when);
  await recordOutcome(ctx, runId, input);
}

// Rotisserie paths (trees/rotisserie-uneven-heat.md).
const ack = (node: string): Entry => ({ type: "acknowledge", node });
const CAUTIONS: Entry[] = [ack("lockout"), ack("discharge-caps"), ack("live-test")];
const SUPPLY_OK: Entry = { type: "reading", node: "supply-voltage", reading: "208 V" };
const TO_CAP: Entry[] = [
  { type: "answer", node: "fans", answer: "one slow" },
  ack("cap-lockout"),
  { type: "nameplate", node: "cap-rating", value: "1.5 µF" },
];
// 1.5 µF ± 6 % → 1.41–1.59 µF (REFERENCES.md, motor-run capacitors: common practice); 1.30 µF is low.
const CAP_LOW: Entry = { type: "reading", node: "cap-measure", reading: "1.30 µF" };
const CAP_OK: Entry = { type: "reading", node: "cap-measure", reading: "1.47 µF" };
const capacitor = { partNumber: "RC-15", description: "Motor-run capacitor 1.5 µF 370 V", quantity: 1 };

const NOW = new Date("2026-11-30T18:00:00Z"); // Monday noon in Chicago (CST, UTC−6)

describe("the overview on a hand-built shop", () => {
  let shop: Shop & { customers: string[]; sites: string[] };
  const calls: Record<string, string> = {};

  beforeAll(async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    shop = (await makeShop(`Ashgrove Kitchen Service ${tag}`, [
      { key: "A", category: "rotisserie", make: "Vantor", model: "RCF-A", customer: 0 },
      { key: "B", category: "rotisserie", make: "Vantor", model: "RCF-B", customer: 0 },
      { key: "G", category: "griddle", make: "Hobbern", model: "FG-1", customer: 1 },
    ])) as typeof shop;
    const { rot, grd } = shop.trees;

    // R1 — unit A, call K1: capacitor low. Steps at +60…+480 s → diagnosed in 480 s = 8 min.
    calls.K1 = await call(shop, "A", "2026-11-02T14:00:00Z");
    const r1 = await start(shop.tech1, rot!.treeId, "2026-11-02T15:00:00Z", calls.K1);
    await steps(shop.tech1, r1, "2026-11-02T15:00:00Z", [...CAUTIONS, SUPPLY_OK, ...TO_CAP, CAP_LOW]);
    await finish(shop.tech1, r1, "2026-11-02T15:30:00Z", { action: "Replaced the capacitor", minutes: 45, parts: [capacitor] });

    // R2 — unit B, call K2: a mistyped 1.30 µF taken back, then 1.47 µF, then a seized shaft.
    // Steps at +60…+660 s (the undo is one of them) → 660 s = 11 min.
    calls.K2 = await call(shop, "B", "2026-11-10T14:00:00Z");
    const r2 = await start(shop.tech1, rot!.treeId, "2026-11-10T16:00:00Z", calls.K2);
    await steps(shop.tech1, r2, "2026-11-10T16:00:00Z", [
      ...CAUTIONS,
      SUPPLY_OK,
      ...TO_CAP,
      CAP_LOW,
      { type: "undo" },
      CAP_OK,
      { type: "answer", node: "shaft-free", answer: "stiff, gritty or seized" },
    ]);
    await finish(shop.tech1, r2, "2026-11-10T17:00:00Z", {
      action: "Replaced the motor and the wheel",
      minutes: 90,
      parts: [
        { partNumber: "FM-208", description: "Convection fan motor 208 V", quantity: 1 },
        { partNumber: "FW-1", description: "Fan wheel", quantity: 2 },
      ],
    });

    // R3 — unit A again, call K3 opened 18 days after K1 closed (so K1 was not fixed first time).
    // Supply reads 185 V (low, below 191 V: ANSI C84.1 utilisation range, from memory) → the tree
    // hands it to a lead; the lead takes over at +1800 s, undoes, and walks on to a low capacitor
    // at +2160 s → 2160 s = 36 min.
    calls.K3 = await call(shop, "A", "2026-11-20T14:00:00Z");
    const r3 = await start(shop.tech2, rot!.treeId, "2026-11-20T15:00:00Z", calls.K3);
    await steps(shop.tech2, r3, "2026-11-20T15:00:00Z", [...CAUTIONS, { type: "reading", node: "supply-voltage", reading: "185 V" }]);
    at(plus("2026-11-20T15:00:00Z", 300));
    expect(await changeRunStatus(shop.tech2, r3, { action: "escalate", reason: "Supply is low" })).toEqual({ status: "escalated" });
    at(plus("2026-11-20T15:00:00Z", 1800));
    expect(await changeRunStatus(shop.lead, r3, { action: "take-over" })).toEqual({ status: "active" });
    await steps(shop.lead, r3, "2026-11-20T15:00:00Z", [{ type: "undo" }, SUPPLY_OK, ...TO_CAP, CAP_LOW], 1860);
    await finish(shop.lead, r3, "2026-11-20T16:00:00Z", { action: "Replaced the capacitor", minutes: 120, parts: [capacitor] });

    // R4 — unit G, call K4 (October, daylight time): abandoned after one step; R5 on the same call
    // the next day: heat light off → thermostat, at +120 s = 2 min. A part typed as a formula.
    calls.K4 = await call(shop, "G", "2026-10-15T13:00:00Z");
    const r4 = await start(shop.tech2, grd!.treeId, "2026-10-15T14:00:00Z", calls.K4);
    await steps(shop.tech2, r4, "2026-10-15T14:00:00Z", [ack("hot-plate")]);
    at("2026-10-15T14:10:00Z");
    expect(await changeRunStatus(shop.tech2, r4, { action: "abandon", reason: "No access to the panel today" })).toEqual({
      status: "abandoned",
    });
    const r5 = await start(shop.tech2, grd!.treeId, "2026-10-16T14:00:00Z", calls.K4);
    await steps(shop.tech2, r5, "2026-10-16T14:00:00Z", [ack("hot-plate"), { type: "answer", node: "heat-light", answer: "no" }]);
    await finish(shop.tech2, r5, "2026-10-16T14:40:00Z", {
      action: "Thermostat replaced",
      minutes: 30,
      parts: [{ partNumber: "@A1", description: "=1+2 thermostat", quantity: 1 }],
    });

    // R6 — a practice run by the trainer's trainee (tech1): a capacitor too, never counted.
    const r6 = await start(shop.tech1, rot!.treeId, "2026-11-25T15:00:00Z", undefined, true);
    // In practice the trainee makes their own call on each reading, and the run is finished, not closed with an outcome.
    await steps(shop.tech1, r6, "2026-11-25T15:00:00Z", [
      ...CAUTIONS,
      { ...SUPPLY_OK, call: "within" },
      ...TO_CAP,
      { ...CAP_LOW, call: "low" },
    ] as Entry[]);
    at("2026-11-25T15:30:00Z");
    await finishPractice(shop.tech1, r6);
    vi.useRealTimers();
  });

  const year = parseFilters(new URLSearchParams("period=90")).filters;
  const get = async (query: string, ctx?: Ctx) => {
    return overview(ctx ?? shop.owner, parseFilters(new URLSearchParams(query)).filters, NOW);
  };

  it("the summary rows kept as runs ended equal a rebuild from the raw rows", async () => {
    const kept = await factsOf(shop.id);
    // Five real runs ended (R1–R5); the practice run R6 has no row.
    expect(kept.runs).toHaveLength(5);
    expect(kept.runs.filter((r) => r.status === "abandoned")).toHaveLength(1);
    await rebuildInsights({ shopId: shop.id });
    expect(await factsOf(shop.id)).toEqual(kept);
  });

  it("root causes: counts and shares of completed runs, practice and other shops left out", async () => {
    const o = await get("period=90");
    // R1 and R3 capacitor, R2 motor, R5 thermostat: 4 completed runs. The practice capacitor would make 3.
    expect(o.tables["root-causes"].rows).toEqual([
      { cause: "Failed run capacitor", runs: 2, share: 0.5 },
      { cause: "Failed fan motor — seized or dragging shaft", runs: 1, share: 0.25 },
      { cause: "Section thermostat not closing", runs: 1, share: 0.25 },
    ]);
    expect(o.totals).toEqual({ ended: 5, handed: 1, done: 4, diagnoseMedian: 9.5, calls: 4, fixed: 2 });
    // The demo shop's invented history (over a hundred runs) is in the same database: none of it leaked in.
  });

  it("first-time fixes by month and by equipment follow the stated definition", async () => {
    const o = await get("period=90");
    // 90 days to Mon 30 Nov in Chicago start on 2 Sep: September, October, November.
    // K4 (October) had an abandoned first run: not first time. November: K1 came back (K3 opened on
    // unit A 18 days after), K2 and K3 fixed first time → 2 of 3.
    expect(o.tables["first-time-fix-by-month"].rows).toEqual([
      { month: "Sep 2026", calls: 0, fixed: 0, rate: null },
      { month: "Oct 2026", calls: 1, fixed: 0, rate: 0 },
      { month: "Nov 2026", calls: 3, fixed: 2, rate: 2 / 3 },
    ]);
    expect(o.tables["first-time-fix-by-equipment"].rows).toEqual([
      { category: "rotisserie", equipment: "Vantor RCF-A", calls: 2, fixed: 1, rate: 0.5 },
      { category: "griddle", equipment: "Hobbern FG-1", calls: 1, fixed: 0, rate: 0 },
      { category: "rotisserie", equipment: "Vantor RCF-B", calls: 1, fixed: 1, rate: 1 },
    ]);
    expect(o.definition).toMatch(/first run started on it reached a root cause.*30 days after/);
  });

  it("time to diagnose and on the job: medians and 90th percentiles by tree and by equipment", async () => {
    const o = await get("period=90");
    // Diagnose minutes 2, 8, 11, 36; on the job 30, 45, 90, 120. Type-7 percentiles (PERCENTILE.INC):
    // median (8 + 11) / 2 = 9.5; p90 at rank 0.9 × 3 = 2.7 → 11 + 0.7 × 25 = 28.5; job median 67.5, p90 90 + 0.7 × 30 = 111.
    // Rotisserie 8, 11, 36 → median 11, p90 at 1.8 → 11 + 0.8 × 25 = 31; job 45, 90, 120 → 90 and 90 + 0.8 × 30 = 114.
    // Cross-checked with mathjs.quantileSeq (a general-purpose library, linear interpolation).
    expect(quantileSeq([2, 8, 11, 36], 0.9)).toBeCloseTo(28.5, 10);
    expect(quantileSeq([45, 90, 120], 0.9)).toBeCloseTo(114, 10);
    const rows = o.tables["time-by-tree"].rows;
    expect(rows[0]).toEqual({
      tree: "All trees",
      runs: 4,
      diagnoseMedian: 9.5,
      diagnoseP90: expect.closeTo(28.5, 9),
      jobMedian: 67.5,
      jobP90: expect.closeTo(111, 9),
    });
    expect(rows[1]).toEqual({
      tree: "Two-fan convection rotisserie heats unevenly",
      runs: 3,
      diagnoseMedian: 11,
      diagnoseP90: expect.closeTo(31, 9),
      jobMedian: 90,
      jobP90: expect.closeTo(114, 9),
    });
    expect(rows[2]).toEqual({
      tree: "Electric griddle section does not heat",
      runs: 1,
      diagnoseMedian: 2,
      diagnoseP90: 2,
      jobMedian: 30,
      jobP90: 30,
    });
    expect(o.tables["time-by-equipment"].rows).toEqual([
      {
        category: "rotisserie",
        equipment: "Vantor RCF-A",
        runs: 2,
        diagnoseMedian: 22,
        diagnoseP90: expect.closeTo(33.2, 9),
        jobMedian: 82.5,
        jobP90: expect.closeTo(112.5, 9),
      },
      { category: "griddle", equipment: "Hobbern FG-1", runs: 1, diagnoseMedian: 2, diagnoseP90: 2, jobMedian: 30, jobP90: 30 },
      { category: "rotisserie", equipment: "Vantor RCF-B", runs: 1, diagnoseMedian: 11, diagnoseP90: 11, jobMedian: 90, jobP90: 90 },
    ]);
  });

  it("parts by quantity and by make and model", async () => {
    const o = await get("period=90");
    expect(o.tables.parts.rows).toEqual([
      { partNumber: "FW-1", description: "Fan wheel", quantity: 2, runs: 1 },
      { partNumber: "RC-15", description: "Motor-run capacitor 1.5 µF 370 V", quantity: 2, runs: 2 },
      { partNumber: "@A1", description: "=1+2 thermostat", quantity: 1, runs: 1 },
      { partNumber: "FM-208", description: "Convection fan motor 208 V", quantity: 1, runs: 1 },
    ]);
    expect(o.tables["parts-by-model"].rows).toEqual([
      { equipment: "Vantor RCF-A", partNumber: "RC-15", description: "Motor-run capacitor 1.5 µF 370 V", quantity: 2, runs: 2 },
      { equipment: "Vantor RCF-B", partNumber: "FW-1", description: "Fan wheel", quantity: 2, runs: 1 },
      { equipment: "Hobbern FG-1", partNumber: "@A1", description: "=1+2 thermostat", quantity: 1, runs: 1 },
      { equipment: "Vantor RCF-B", partNumber: "FM-208", description: "Convection fan motor 208 V", quantity: 1, runs: 1 },
    ]);
  });

  it("measurement steps out of limits (the undone reading left out) and hand-offs to a lead", async () => {
    const o = await get("period=90");
    // cap-measure: R1 low, R2 within (its low was undone), R3 low → 2 of 3. The supply's one low
    // reading (R3's 185 V) was taken back by the lead's undo, so the supply step never read out of
    // limits and is not listed.
    expect(o.tables["readings-out-of-limits"].rows).toEqual([
      {
        step: "Run capacitor against its rating",
        tree: "Two-fan convection rotisserie heats unevenly",
        readings: 3,
        out: 2,
        share: 2 / 3,
        marginal: 0,
      },
    ]);
    expect(o.tables["hand-offs"].rows).toEqual([
      { tree: "Two-fan convection rotisserie heats unevenly", runs: 3, handed: 1, share: 1 / 3 },
      { tree: "Electric griddle section does not heat", runs: 2, handed: 0, share: 0 },
    ]);
  });

  it("filters: period (30 days), category, make and model, tree, customer, site and technician", async () => {
    // Last 30 days end Mon 30 Nov: from 1 Nov 00:00 in Chicago — October's K4 drops out.
    expect((await get("period=30")).totals).toEqual({ ended: 3, handed: 1, done: 3, diagnoseMedian: 11, calls: 3, fixed: 2 });
    expect((await get("period=90&category=griddle")).totals).toMatchObject({ ended: 2, done: 1, calls: 1, fixed: 0 });
    expect((await get("period=90&make=Vantor&model=RCF-B")).tables["root-causes"].rows).toEqual([
      { cause: "Failed fan motor — seized or dragging shaft", runs: 1, share: 1 },
    ]);
    expect((await get(`period=90&tree=${shop.trees.grd!.treeId}`)).totals.ended).toBe(2);
    expect((await get(`period=90&customer=${shop.customers[1]}`)).totals.ended).toBe(2);
    expect((await get(`period=90&customer=${shop.customers[0]}&site=${shop.sites[0]}`)).totals.ended).toBe(3);
    // R3 was started by tech2 and finished by the lead: it is tech2's run, handed to a lead.
    expect((await get(`period=90&technician=${shop.tech2.userId}`)).totals).toMatchObject({ ended: 3, handed: 1, done: 2 });
    // A date range in the shop's calendar: 16 October only.
    expect((await get("period=range&from=2026-10-16&to=2026-10-16")).totals).toMatchObject({ ended: 1, done: 1 });
    expect((await get("period=range&from=2026-10-15&to=2026-10-16")).totals).toMatchObject({ ended: 2, done: 1 });
  });

  it("is for owners and leads only; another shop's owner sees none of it", async () => {
    expect((await overview(shop.lead, year, NOW)).totals.ended).toBeGreaterThan(0);
    await expect(overview(shop.tech1, year, NOW)).rejects.toMatchObject({ kind: "forbidden", status: 403 });
    await expect(overview(shop.trainer, year, NOW)).rejects.toMatchObject({ kind: "forbidden", status: 403 });
    const demo = await overview(
      { shopId: stableId(DEMO_SHOP.key), userId: stableId("user:owner@tinderbox.example"), role: "owner" },
      year,
      NOW,
    );
    expect(demo.tables.parts.rows.map((r) => r.partNumber)).not.toContain("@A1");
    expect(demo.options.customers.map((c) => c.id)).not.toContain(shop.customers[0]);
  });

  it("the CSV holds exactly the rows shown, with formula-like cells neutralised (OWASP CSV injection)", async () => {
    const table = await overviewTable(shop.owner, year, "parts", NOW);
    const { cookie } = await cookieFor(shop.emails.owner!);
    // The route resolves "90 days" against today, so ask for the same range by dates.
    const res = await csvLoader(
      routeArgs(requestWith(cookie, "/api/insights/csv/parts?period=range&from=2026-09-02&to=2026-11-30"), { table: "parts" }),
    );
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(res.headers.get("content-disposition")).toBe('attachment; filename="parts_2026-09-02_2026-11-30.csv"');
    // A UTF-8 byte-order mark first (spreadsheet programs then read µ as µ), then the rows.
    const bytes = new Uint8Array(await res.arrayBuffer());
    expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    const text = new TextDecoder("utf-8", { ignoreBOM: true }).decode(bytes);
    // RFC 4180: CRLF line ends, a header row; OWASP: cells starting with = + - @ get a leading quote.
    expect(text).toBe(
      "\uFEFFPart number,Part,Quantity,Runs\r\n" +
        "FW-1,Fan wheel,2,1\r\n" +
        "RC-15,Motor-run capacitor 1.5 µF 370 V,2,2\r\n" +
        "'@A1,'=1+2 thermostat,1,1\r\n" +
        "FM-208,Convection fan motor 208 V,1,1\r\n",
    );
    expect(text.split("\r\n").length - 2).toBe(table.table.rows.length);
    // Filters apply to the CSV as to the page.
    const griddle = await csvLoader(
      routeArgs(requestWith(cookie, "/api/insights/csv/root-causes?period=range&from=2026-09-02&to=2026-11-30&category=griddle"), {
        table: "root-causes",
      }),
    );
    expect(await griddle.text()).toBe("Root cause,Runs,Share\r\nSection thermostat not closing,1,100.0 %\r\n");
    // Unknown table: a JSON 404; a technician: 403.
    const missing = await csvLoader(routeArgs(requestWith(cookie, "/api/insights/csv/salaries"), { table: "salaries" })).catch(
      (e: Response) => e,
    );
    expect(missing.status).toBe(404);
    expect(await missing.json()).toEqual({ error: "There is no such table on the overview." });
    const tech = await cookieFor(shop.emails.tech1!);
    const refused = await csvLoader(routeArgs(requestWith(tech.cookie, "/api/insights/csv/parts"), { table: "parts" })).catch(
      (e: Response) => e,
    );
    expect(refused.status).toBe(403);
  });

  it("filter values that don't fit get a message and are left out, never a failure", () => {
    const p = parseFilters(new URLSearchParams("period=7&category=toaster&tree=nope&from=2026-02-30&to=2026-01-01"));
    expect(p.filters).toEqual({ period: "90" });
    expect(p.errors.period).toBe("Choose a period of 30, 90 or 365 days, or a date range.");
    expect(p.errors.category).toBe("That is not an equipment category.");
    expect(p.errors.tree).toBe("Not understood; showing all.");
    expect(p.errors.from).toBe("That date does not exist.");
    const backwards = parseFilters(new URLSearchParams("period=range&from=2026-03-09&to=2026-03-01"));
    expect(backwards.errors.to).toBe("The last day comes before the first day.");
    expect(backwards.filters.period).toBe("90");
  });
});

describe("found here before", () => {
  let shop: Shop;
  const griddle = (s: Shop) => s.trees.grd!;

  /** One completed griddle run on `unit`; `path` picks the way through. */
  async function run(s: Shop, unit: string, path: "no" | "shorted" | "open", day: number, extra: Entry[] = []) {
    const t = `2026-11-${String(day).padStart(2, "0")}T15:00:00Z`;
    const k = await call(s, unit, `2026-11-${String(day).padStart(2, "0")}T14:00:00Z`);
    const r = await start(s.tech1, griddle(s).treeId, t, k);
    const entries: Entry[] =
      path === "no"
        ? [ack("hot-plate"), ...extra, { type: "answer", node: "heat-light", answer: "no" }]
        : [
            ack("hot-plate"),
            { type: "answer", node: "heat-light", answer: "yes" },
            { type: "answer", node: "contactor-pulls", answer: "no" },
            ack("lockout-coil"),
            // Coil limits 20 Ω to 2 kΩ (the tree's): 5 Ω is low (shorted), 3 kΩ high (open).
            { type: "reading", node: "coil-ohms", reading: path === "shorted" ? "5 Ω" : "3 kΩ" },
          ];
    await steps(s.tech1, r, t, entries);
    await finish(s.tech1, r, plus(t, 3600), { action: "Fixed", minutes: 60, parts: [] });
  }

  beforeAll(async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    shop = await makeShop(`Ashgrove Found Here ${tag}`, [
      { key: "H", category: "griddle", make: "Hobbern", model: "FG-48", customer: 0 },
      { key: "B", category: "griddle", make: "Brenmoor", model: "EG-36", customer: 1 },
    ]);
    // Nine on the Hobbern: 5 × heat light off (one with a mis-tap "yes" taken back), 3 × coil shorted, 1 × coil open.
    for (let i = 0; i < 4; i++) await run(shop, "H", "no", 1 + i);
    await run(shop, "H", "no", 5, [{ type: "answer", node: "heat-light", answer: "yes" }, { type: "undo" }]);
    for (let i = 0; i < 3; i++) await run(shop, "H", "shorted", 6 + i);
    await run(shop, "H", "open", 9);
    // A practice run and an abandoned run never count.
    const practice = await start(shop.tech1, griddle(shop).treeId, "2026-11-10T15:00:00Z", undefined, true);
    await steps(shop.tech1, practice, "2026-11-10T15:00:00Z", [ack("hot-plate"), { type: "answer", node: "heat-light", answer: "no" }]);
    at("2026-11-10T16:00:00Z");
    await finishPractice(shop.tech1, practice);
    const k = await call(shop, "H", "2026-11-11T14:00:00Z");
    const gone = await start(shop.tech1, griddle(shop).treeId, "2026-11-11T15:00:00Z", k);
    await steps(shop.tech1, gone, "2026-11-11T15:00:00Z", [ack("hot-plate"), { type: "answer", node: "heat-light", answer: "yes" }]);
    at("2026-11-11T16:00:00Z");
    await changeRunStatus(shop.tech1, gone, { action: "abandon", reason: "Customer closed early" });
    vi.useRealTimers();
  });

  it(`shows nothing below ${FOUND_HERE_MIN_RUNS} completed runs of the tree, then counts each run's last answer at every step`, async () => {
    const before = await foundHereBefore(shop.tech2, { versionId: griddle(shop).versionId, unitId: shop.units.H });
    expect(before).toMatchObject({
      threshold: 10,
      treeRuns: 9,
      shown: false,
      steps: [],
      causes: { make: "Hobbern", model: "FG-48", runs: 9, shown: false, outcomes: [] },
    });

    vi.useFakeTimers({ toFake: ["Date"] });
    await run(shop, "B", "no", 12);
    vi.useRealTimers();
    const ten = (await foundHereBefore(shop.tech2, { versionId: griddle(shop).versionId, unitId: shop.units.H }))!;
    expect(ten.treeRuns).toBe(10);
    expect(ten.shown).toBe(true);
    expect(ten.steps).toEqual([
      {
        node: "coil-ohms",
        runs: 4,
        branches: [
          { branch: "low", label: "low", runs: 3 },
          { branch: "high", label: "high", runs: 1 },
        ],
      },
      { node: "contactor-pulls", runs: 4, branches: [{ branch: "answer:no", label: "no", runs: 4 }] },
      {
        node: "heat-light",
        runs: 10,
        branches: [
          { branch: "answer:no", label: "no", runs: 6 },
          { branch: "answer:yes", label: "yes", runs: 4 },
        ],
      },
    ]);
    expect(stepSentence(ten.steps[2]!)).toBe("10 earlier runs at this step: 6 no · 4 yes");
    // Only 9 of them on this make and model: still below the threshold for causes.
    expect(ten.causes).toMatchObject({ runs: 9, shown: false });

    vi.useFakeTimers({ toFake: ["Date"] });
    await run(shop, "H", "no", 13);
    vi.useRealTimers();
    const eleven = (await foundHereBefore(shop.tech2, { versionId: griddle(shop).versionId, unitId: shop.units.H, node: "heat-light" }))!;
    expect(eleven.steps).toEqual([
      {
        node: "heat-light",
        runs: 11,
        branches: [
          { branch: "answer:no", label: "no", runs: 7 },
          { branch: "answer:yes", label: "yes", runs: 4 },
        ],
      },
    ]);
    expect(eleven.causes).toEqual({
      make: "Hobbern",
      model: "FG-48",
      runs: 10,
      shown: true,
      outcomes: [
        { node: "thermostat-failed", runs: 6 },
        { node: "coil-shorted", runs: 3 },
        { node: "coil-open", runs: 1 },
      ],
    });
    // The tallies kept as runs completed equal a recount from the raw rows.
    const kept = await factsOf(shop.id);
    await rebuildInsights({ shopId: shop.id });
    expect(await factsOf(shop.id)).toEqual(kept);
  });

  it("the JSON route: 400 for a malformed query, 404 for another shop's version, 200 with the figures", async () => {
    const { cookie } = await cookieFor(shop.emails.tech2!);
    const url = (q: string) => requestWith(cookie, `/api/insights/found-here${q}`);
    const bad = await foundHereLoader(routeArgs(url("?version=nope"))).catch((e: Response) => e);
    expect(bad.status).toBe(400);
    expect(await bad.json()).toEqual({ error: "Name the tree version with ?version=<its id>." });
    const foreign = await foundHereLoader(routeArgs(url(`?version=${stableId("tree-version:griddle-section-no-heat.md:1")}`))).catch(
      (e: Response) => e,
    );
    expect(foreign.status).toBe(404);
    const res = await foundHereLoader(routeArgs(url(`?version=${griddle(shop).versionId}&unit=${shop.units.B}&node=heat-light`)));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body).toMatchObject({
      threshold: 10,
      treeRuns: 11,
      shown: true,
      causes: { make: "Brenmoor", model: "EG-36", runs: 1, shown: false },
    });
    expect(body.steps[0].runs).toBe(11);
  });
});
