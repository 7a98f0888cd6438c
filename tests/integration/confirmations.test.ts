// Readings the engine asks about, and the shop meter's range, through POST /api/runs/:id/steps on
// the real MariaDB: the refusal carries the question, a confirmed reading is stored as such (the
// run_steps.confirmed column) and shown so in the report, a confirmation changes the payload an
// idempotency key stands for, and a reading over the chosen meter's range is refused.
import { and, eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { runSteps } from "../../db/schema";
import { DEMO_SHOP } from "../../db/demo";
import { stableId } from "../../db/seed";
import { reportMailHtml } from "../../app/components/report/reportMail";
import type { Ctx } from "../../app/lib/context";
import { closeDb, db } from "../../app/lib/db.server";
import { createCall } from "../../app/models/calls.server";
import { createMeter } from "../../app/models/meters.server";
import { recordOutcome } from "../../app/models/runs/lifecycle.server";
import { getReport } from "../../app/models/runs/reports.server";
import { startRun } from "../../app/models/runs/start.server";
import { postStep, type StepInput } from "../../app/models/runs/steps.server";
import { action as stepsAction } from "../../app/routes/api.runs.$runId.steps";
import { cookieFor, requestWith, routeArgs } from "../support/session";

afterAll(() => closeDb());

const shop = stableId(DEMO_SHOP.key);
const tech: Ctx = { shopId: shop, userId: stableId("user:tech@tinderbox.example"), role: "technician" };
const lead: Ctx = { shopId: shop, userId: stableId("user:lead@tinderbox.example"), role: "lead" };
// The demo van's multimeter on AC volts: a real meter row with a 600 V range (db/demo.ts).
const voltMeter = stableId("meter:van1-volts");

async function runAtSupply(): Promise<string> {
  const call = await createCall(lead, {
    unitId: stableId("unit:larkspur-rotisserie"),
    symptom: "heats unevenly",
    priority: "normal",
    assignedTo: tech.userId,
    notes: null,
  });
  const { runId } = await startRun(tech, { treeId: stableId("tree:rotisserie-uneven-heat.md"), callId: call.id });
  for (const node of ["lockout", "discharge-caps", "live-test"])
    await postStep(tech, runId, { key: crypto.randomUUID(), entry: { type: "acknowledge", node } });
  return runId;
}

async function poster(runId: string) {
  const { cookie } = await cookieFor("tech@tinderbox.example");
  return async (body: { key: string; entry: StepInput["entry"]; meterId?: string | null }) => {
    const init = {
      method: "POST",
      headers: { origin: "http://localhost", "content-type": "application/json" },
      body: JSON.stringify(body),
    };
    const res = (await Promise.resolve(stepsAction(routeArgs(requestWith(cookie, `/api/runs/${runId}/steps`, init), { runId }))).catch(
      (e: Response) => e,
    )) as Response;
    return { status: res.status, json: (await res.json()) as Record<string, unknown> & { step?: Record<string, unknown> } };
  };
}

async function storedConfirmed(runId: string, key: string) {
  const [row] = await db()
    .select({ confirmed: runSteps.confirmed })
    .from(runSteps)
    .where(and(eq(runSteps.runId, runId), eq(runSteps.idempotencyKey, key)));
  return row?.confirmed;
}

describe("an implausible reading is asked about, then stored as confirmed", () => {
  // 208 typed on the mV button is 0.208 V on a 191–218 V supply step (the tree's limits; 208 V
  // nominal, ANSI C84.1, from memory): SI prefix milli = 10⁻³ (BIPM SI Brochure, table 7).
  const slip = { type: "reading" as const, node: "supply-voltage", reading: "208 mV" };

  it("over HTTP: 422 with code needs-confirmation and the question; confirmed:true stores it; the key then stands for the confirmed payload", async () => {
    const runId = await runAtSupply();
    const post = await poster(runId);
    const key = crypto.randomUUID();

    const asked = await post({ key, entry: slip, meterId: voltMeter });
    expect(asked.status).toBe(422);
    expect(asked.json).toMatchObject({
      error: "That is 0.208 V — did you mean 208 V?",
      code: "needs-confirmation",
      confirm: { reason: "unit-slip", message: "That is 0.208 V — did you mean 208 V?", suggestion: "208 V" },
    });
    expect(await storedConfirmed(runId, key)).toBeUndefined();

    // confirmed:false is no confirmation.
    expect((await post({ key, entry: { ...slip, confirmed: false }, meterId: voltMeter })).json.code).toBe("needs-confirmation");

    const yes = await post({ key, entry: { ...slip, confirmed: true }, meterId: voltMeter });
    expect(yes.status).toBe(201);
    expect(yes.json.step).toMatchObject({ confirmed: true, verdict: "low", typed: "208 mV" });
    expect(await storedConfirmed(runId, key)).toBe(true);

    // The same key: with confirmed:true it is the same step again; without, another payload.
    const again = await post({ key, entry: { ...slip, confirmed: true }, meterId: voltMeter });
    expect(again.status).toBe(200);
    expect(again.json.replayed).toBe(true);
    const other = await post({ key, entry: slip, meterId: voltMeter });
    expect(other.status).toBe(422);
    expect(other.json.code).toBe("key-reused");
  });

  it("a plausible reading is never asked about, and is stored unconfirmed even when sent with confirmed:true", async () => {
    const runId = await runAtSupply();
    const key = crypto.randomUUID();
    const plain = await postStep(tech, runId, {
      key,
      entry: { type: "reading", node: "supply-voltage", reading: "208 V", confirmed: true },
      meterId: voltMeter,
    });
    expect(plain.step).toMatchObject({ confirmed: false, verdict: "within" });
    expect(await storedConfirmed(runId, key)).toBe(false);
  });

  it("the report shows a confirmed reading as confirmed, on the page and in the e-mail", async () => {
    const runId = await runAtSupply();
    const step = (entry: StepInput["entry"], meterId: string | null = null) =>
      postStep(tech, runId, { key: crypto.randomUUID(), entry, meterId });
    await step({ type: "reading", node: "supply-voltage", reading: "208 V" }, voltMeter);
    await step({ type: "answer", node: "fans", answer: "one slow" });
    await step({ type: "acknowledge", node: "cap-lockout" });
    await step({ type: "nameplate", node: "cap-rating", value: "1.5 µF" });
    // A bare 1470 on the µF step is 1470 µF; 1470 nF = 1.47 µF is inside 1.5 µF ± 6 %
    // (REFERENCES.md: motor-run capacitors, common practice), so the engine asks.
    await expect(step({ type: "reading", node: "cap-measure", reading: "1470" })).rejects.toMatchObject({
      status: 422,
      code: "needs-confirmation",
      details: { confirm: { suggestion: "1470 nF" } },
    });
    const cap = await step({ type: "reading", node: "cap-measure", reading: "1470", confirmed: true });
    expect(cap.step).toMatchObject({ confirmed: true, verdict: "high", to: "cap-failed" });
    const done = await recordOutcome(tech, runId, { action: "Replaced the run capacitor.", minutes: 30, parts: [] });

    const report = await getReport(tech, done.reportId);
    expect(report.readings.map((r) => [r.title, r.confirmed])).toEqual([
      ["Supply voltage across L1–L2", false],
      ["Run capacitor against its rating", true],
    ]);
    const html = reportMailHtml(report, () => "", null);
    expect(html.match(/confirmed as read/g)).toHaveLength(1);
  });
});

describe("the chosen shop meter's range", () => {
  it("a reading above the van voltmeter's 600 V range is refused and stores nothing; OL on it counts as high", async () => {
    const runId = await runAtSupply();
    const over = await postStep(tech, runId, {
      key: crypto.randomUUID(),
      entry: { type: "reading", node: "supply-voltage", reading: "700 V" },
      meterId: voltMeter,
    }).catch((e) => e);
    expect(over).toMatchObject({ status: 422, code: "reading" });
    expect(over.message).toMatch(/above the top of this meter's 600 V range/);

    // A meter shows overload above its selected range (meter makers' manuals; common practice):
    // with 600 V at the top and 218 V the step's upper limit, OL is high.
    const ol = await postStep(tech, runId, {
      key: crypto.randomUUID(),
      entry: { type: "reading", node: "supply-voltage", reading: "OL" },
      meterId: voltMeter,
    });
    expect(ol.step).toMatchObject({ verdict: "high", typed: "OL", to: "high-supply" });
    expect(ol.step.message).toMatch(/overload \(above its 600 V range\)/);
    expect(ol.step.meter).toMatchObject({ range: 600 });
  });

  it("on a meter added to the shop with a 200 V range, OL can't say whether 191–218 V holds: switch range", async () => {
    const small = await createMeter(lead, {
      name: `Clamp meter 200 V ${crypto.randomUUID().slice(0, 4)}`,
      quantity: "voltage",
      unit: "V",
      rangeMax: 200,
      resolution: 0.1,
      percent: 1.5,
      counts: 5,
    });
    const runId = await runAtSupply();
    const ol = await postStep(tech, runId, {
      key: crypto.randomUUID(),
      entry: { type: "reading", node: "supply-voltage", reading: "OL" },
      meterId: small,
    }).catch((e) => e);
    expect(ol).toMatchObject({ status: 422 });
    expect(ol.message).toMatch(/above its 200 V range.*switch to a higher range/);
    // 205 V is above that meter's range too: it can't have shown it.
    await expect(
      postStep(tech, runId, {
        key: crypto.randomUUID(),
        entry: { type: "reading", node: "supply-voltage", reading: "205 V" },
        meterId: small,
      }),
    ).rejects.toThrow(/200 V range/);
  });
});
