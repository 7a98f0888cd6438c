// Field runs against the real MariaDB (and the local S3 fake and SMTP catcher): the run lifecycle,
// the idempotent step POST, version pinning, shop isolation, upload refusals and the e-mailed report.
import { ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import { and, asc, count, eq, isNull } from "drizzle-orm";
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { escalations, meters, runNotes, runPhotos, runSteps, serviceCalls } from "../../db/schema";
import { DEMO_SHOP, OTHER_SHOP } from "../../db/demo";
import { stableId } from "../../db/seed";
import { parseTree } from "../../app/engine/markdown/parse";
import { replay } from "../../app/engine/traversal";
import type { Tree } from "../../app/engine/types";
import type { Ctx } from "../../app/lib/context";
import { closeDb, db } from "../../app/lib/db.server";
import { env } from "../../app/lib/env.server";
import { capturedMail } from "../../app/lib/mail.server";
import { reportMailHtml } from "../../app/components/report/reportMail";
import { reportNumber } from "../../app/lib/report-data";
import { logOf, type StepView } from "../../app/lib/run-log";
import { MAX_IMAGE_BYTES } from "../../app/lib/uploads";
import { createCall, getCall } from "../../app/models/calls.server";
import { changeRunStatus, recordOutcome } from "../../app/models/runs/lifecycle.server";
import { addNote } from "../../app/models/runs/notes.server";
import { addPhoto, getPhotoFile } from "../../app/models/runs/photos.server";
import { listOpenEscalations } from "../../app/models/runs/queries.server";
import { getReport, sendReport } from "../../app/models/runs/reports.server";
import { startRun } from "../../app/models/runs/start.server";
import { postStep, type StepInput } from "../../app/models/runs/steps.server";
import { getRunView } from "../../app/models/runs/view.server";
import { createPublishedTree, replaceDraftContent, startDraft } from "../../app/models/trees/drafts.server";
import { publishDraft } from "../../app/models/trees/publish.server";
import { loader as runApiLoader } from "../../app/routes/api.runs.$runId";
import { action as stepsAction } from "../../app/routes/api.runs.$runId.steps";
import { action as photosAction } from "../../app/routes/api.runs.$runId.photos";
import { loader as photoLoader } from "../../app/routes/api.photos.$photoId";
import { TINY_PNG } from "../support/photo";
import { cookieFor, requestWith, routeArgs } from "../support/session";

afterAll(() => closeDb());

const shopA = stableId(DEMO_SHOP.key);
const shopB = stableId(OTHER_SHOP.key);
const tech: Ctx = { shopId: shopA, userId: stableId("user:tech@tinderbox.example"), role: "technician" };
const lead: Ctx = { shopId: shopA, userId: stableId("user:lead@tinderbox.example"), role: "lead" };
const otherOwner: Ctx = { shopId: shopB, userId: stableId("user:owner@pellham.example"), role: "owner" };
const otherTech: Ctx = { shopId: shopB, userId: stableId("user:tech@pellham.example"), role: "technician" };
const rotisserie = stableId("unit:larkspur-rotisserie");
const rotisserieTree = stableId("tree:rotisserie-uneven-heat.md");
const voltMeter = stableId("meter:van1-volts");
const capMeter = stableId("meter:van1-cap");

async function newCall(symptom = "heats unevenly") {
  const made = await createCall(lead, { unitId: rotisserie, symptom, priority: "high", assignedTo: tech.userId, notes: null });
  return made.id;
}

async function newRun(treeId = rotisserieTree) {
  const callId = await newCall();
  const started = await startRun(tech, { treeId, callId });
  return { callId, runId: started.runId, versionId: started.versionId };
}

const step = (entry: StepInput["entry"], extra: Partial<StepInput> = {}): StepInput => ({ key: crypto.randomUUID(), entry, ...extra });

async function ok(ctx: Ctx, runId: string, input: StepInput): Promise<StepView> {
  return (await postStep(ctx, runId, input)).step;
}

/** The trip to the capacitor: cautions, the supply reading, the fans answer, the rating. */
async function walkToCapacitor(runId: string) {
  await ok(tech, runId, step({ type: "acknowledge", node: "lockout" }));
  await ok(tech, runId, step({ type: "acknowledge", node: "discharge-caps" }));
  await ok(tech, runId, step({ type: "acknowledge", node: "live-test" }));
  const supply = await ok(tech, runId, step({ type: "reading", node: "supply-voltage", reading: "208 V" }, { meterId: voltMeter }));
  await ok(tech, runId, step({ type: "answer", node: "fans", answer: "one slow" }));
  await ok(tech, runId, step({ type: "acknowledge", node: "cap-lockout" }));
  await ok(tech, runId, step({ type: "nameplate", node: "cap-rating", value: "1.5 µF" }));
  return supply;
}

async function stepCount(runId: string): Promise<number> {
  const [row] = await db().select({ n: count() }).from(runSteps).where(eq(runSteps.runId, runId));
  return row?.n ?? 0;
}

describe("run lifecycle", () => {
  it("walks the uneven-heating tree from the call to a recorded outcome and a report, with verdicts computed on the server", async () => {
    const { callId, runId } = await newRun();
    expect((await getCall(tech, callId))?.call.status).toBe("in_progress");

    const supply = await walkToCapacitor(runId);
    // 208 V across L1–L2 on a 191–218 V range (ANSI C84.1 utilisation range for 208 V, from memory; the tree's limits).
    expect(supply.verdict).toBe("within");
    expect(supply.message).toMatch(/^208(\.0)? V — within 191–218 V/);
    expect(supply.meterId).toBe(voltMeter);
    expect(supply.meter).toEqual({ percent: 1, counts: 3, resolution: 0.1, unit: "V", range: 600 });

    // Fan run capacitor rated 1.5 µF, ±6 % field rule (REFERENCES.md: common practice) → 1.41–1.59 µF.
    const first = await ok(tech, runId, step({ type: "reading", node: "cap-measure", reading: "1.47 µF" }, { meterId: capMeter }));
    expect(first.verdict).toBe("within");
    expect(first.limitsText).toBe("1.41–1.59 µF");
    expect(first.message).toContain("1.47 µF — within 1.41–1.59 µF");

    // Take it back and enter the same value in nanofarads: still within, stored in the step's unit and in SI.
    const undo = await ok(tech, runId, step({ type: "undo" }));
    expect(undo.undoesSeq).toBe(first.seq);
    const second = await ok(tech, runId, step({ type: "reading", node: "cap-measure", reading: "1470 nF" }, { meterId: capMeter }));
    expect(second.verdict).toBe("within");
    expect(second.value).toBeCloseTo(1.47, 10);
    expect(second.unit).toBe("µF");
    expect(second.si).toBeCloseTo(1.47e-6, 15);
    expect(second.typed).toBe("1470 nF");

    await addNote(tech, runId, { key: crypto.randomUUID(), node: "cap-measure", text: "Capacitor case slightly domed." });
    const last = await ok(tech, runId, step({ type: "answer", node: "shaft-free", answer: "stiff, gritty or seized" }));
    expect(last.to).toBe("motor-seized");

    // Pause and resume keep everything.
    expect(await changeRunStatus(tech, runId, { action: "pause" })).toEqual({ status: "paused" });
    expect((await getRunView(tech, runId))?.run.status).toBe("paused");
    expect(await changeRunStatus(tech, runId, { action: "resume" })).toEqual({ status: "active" });

    const view = (await getRunView(tech, runId))!;
    expect(view.run.endKind).toBe("outcome");
    const state = replay(view.tree, logOf(view.steps));
    expect(state.finished).toEqual({ kind: "outcome", node: "motor-seized" });
    expect(view.steps.find((s) => s.seq === first.seq)?.undone).toBe(true);
    expect(view.notes.map((n) => n.text)).toEqual(["Capacitor case slightly domed."]);

    const done = await recordOutcome(tech, runId, {
      action: "Fitted a new fan motor and run capacitor; both fans now run at the same speed.",
      minutes: 75,
      parts: [
        { partNumber: "FM-208-R", description: "Convection fan motor, 208 V", quantity: 1 },
        { partNumber: "RC-1.5-370", description: "Run capacitor 1.5 µF 370 V", quantity: 1 },
      ],
    });
    const again = await recordOutcome(tech, runId, { action: "twice", minutes: 1, parts: [] });
    expect(again).toEqual({ reportId: done.reportId, number: done.number });

    const after = (await getRunView(tech, runId))!;
    expect(after.run.status).toBe("done");
    expect(after.run.rootCause).toBe("Failed fan motor — seized or dragging shaft");
    expect(after.parts).toHaveLength(2);
    expect((await getCall(tech, callId))?.call.status).toBe("done");

    const report = await getReport(tech, done.reportId);
    expect(report.readings.map((r) => [r.title, r.verdict, r.limits])).toEqual([
      ["Supply voltage across L1–L2", "within", "191–218 V"],
      ["Run capacitor against its rating", "within", "1.41–1.59 µF"],
    ]);
    expect(report.readings[1]?.reading).toBe("1470 nF (1.47 µF)");
    expect(report.cautions.map((c) => c.hazard)).toEqual(["electrical", "stored-energy", "electrical", "stored-energy"]);
    expect(report.checks).toContainEqual({ title: expect.stringContaining("convection fans"), answer: "one slow" });

    await expect(postStep(tech, runId, step({ type: "undo" }))).rejects.toMatchObject({ kind: "conflict", status: 409, code: "closed" });
  });

  it("refuses what the engine refuses (unreadable reading, wrong step, wrong dimension) and stores nothing", async () => {
    const { runId } = await newRun();
    await expect(postStep(tech, runId, step({ type: "acknowledge", node: "fans" }))).rejects.toMatchObject({
      kind: "rejected",
      status: 422,
      code: "wrong-node",
    });
    await ok(tech, runId, step({ type: "acknowledge", node: "lockout" }));
    await ok(tech, runId, step({ type: "acknowledge", node: "discharge-caps" }));
    await ok(tech, runId, step({ type: "acknowledge", node: "live-test" }));
    await expect(
      postStep(tech, runId, step({ type: "reading", node: "supply-voltage", reading: "about two hundred" })),
    ).rejects.toMatchObject({ status: 422, code: "reading" });
    await expect(postStep(tech, runId, step({ type: "reading", node: "supply-voltage", reading: "208 µF" }))).rejects.toMatchObject({
      status: 422,
      code: "reading",
    });
    // A capacitance meter cannot judge a voltage.
    await expect(
      postStep(tech, runId, step({ type: "reading", node: "supply-voltage", reading: "208 V" }, { meterId: capMeter })),
    ).rejects.toMatchObject({ status: 422, code: "meter" });
    expect(await stepCount(runId)).toBe(3);
  });

  it("a marginal supply reading (within the meter's accuracy of a limit) sends the run to re-measure", async () => {
    const { runId } = await newRun();
    for (const node of ["lockout", "discharge-caps", "live-test"]) await ok(tech, runId, step({ type: "acknowledge", node }));
    // 217.0 V with ±(1 % + 3 counts) at 0.1 V → U = 2.47 V; guarded acceptance (ILAC-G8 §4.2.2) ends at 218 − 2.47 = 215.53 V.
    const s = await ok(tech, runId, step({ type: "reading", node: "supply-voltage", reading: "217.0 V" }, { meterId: voltMeter }));
    expect(s.verdict).toBe("marginal");
    expect(s.to).toBe("supply-recheck");
    expect(s.message).toMatch(/re-measure/);
  });
});

describe("idempotent step POST", () => {
  it("the same key twice stores one row and answers with the stored step; another payload under that key is a 422", async () => {
    const { runId } = await newRun();
    const key = crypto.randomUUID();
    const first = await postStep(tech, runId, { key, entry: { type: "acknowledge", node: "lockout" } });
    const second = await postStep(tech, runId, { key, entry: { type: "acknowledge", node: "lockout" } });
    expect(first.replayed).toBe(false);
    expect(second.replayed).toBe(true);
    expect(second.step).toEqual(first.step);
    expect(await stepCount(runId)).toBe(1);

    await expect(postStep(tech, runId, { key, entry: { type: "acknowledge", node: "discharge-caps" } })).rejects.toMatchObject({
      kind: "rejected",
      status: 422,
      code: "key-reused",
    });
    expect(await stepCount(runId)).toBe(1);
  });

  it("over HTTP: 201 then 200 with the same body, 422 for a changed payload, 403 cross-site, one row", async () => {
    const { runId } = await newRun();
    const { cookie } = await cookieFor("tech@tinderbox.example");
    const post = (body: unknown, origin = "http://localhost") =>
      stepsAction(
        routeArgs(
          requestWith(cookie, `/api/runs/${runId}/steps`, {
            method: "POST",
            headers: { origin, "content-type": "application/json" },
            body: JSON.stringify(body),
          }),
          { runId },
        ),
      ) as Promise<Response>;
    const key = crypto.randomUUID();
    const body = { key, entry: { type: "acknowledge", node: "lockout" }, at: new Date().toISOString() };
    const r1 = await post(body);
    const r2 = await post(body);
    expect(r1.status).toBe(201);
    expect(r2.status).toBe(200);
    const [j1, j2] = [await r1.json(), await r2.json()];
    expect(j2.replayed).toBe(true);
    expect(j2.step).toEqual(j1.step);
    const r3 = await post({ ...body, entry: { type: "continue", node: "lockout" } });
    expect(r3.status).toBe(422);
    expect((await r3.json()).error).toMatch(/already used/);
    const cross = await Promise.resolve(
      post({ key: crypto.randomUUID(), entry: { type: "acknowledge", node: "discharge-caps" } }, "https://elsewhere.example"),
    ).catch((e: Response) => e);
    expect(cross.status).toBe(403);
    expect(await stepCount(runId)).toBe(1);
  });

  it("two different steps posted at once are serialised: one applies, the other is judged against it", async () => {
    const { runId } = await newRun();
    const [a, b] = await Promise.allSettled([
      postStep(tech, runId, step({ type: "acknowledge", node: "lockout" })),
      postStep(tech, runId, step({ type: "acknowledge", node: "lockout" })),
    ]);
    expect([a.status, b.status].sort()).toEqual(["fulfilled", "rejected"]);
    expect([a, b].find((r) => r.status === "rejected")).toMatchObject({ reason: { kind: "rejected", status: 422 } });
    expect(await stepCount(runId)).toBe(1);
  });

  it("ten undos posted at once each judge the log as the previous one left it: four take back four different steps, six are refused", async () => {
    // Each step reads the run's log in the statement that locks the run; a log read from before the
    // lock was granted would let two undos take back the same step. The engine's own replay of the
    // stored log (traversal.ts) is the reference for what each row must say.
    const { runId } = await newRun();
    await ok(tech, runId, step({ type: "acknowledge", node: "lockout" }));
    await ok(tech, runId, step({ type: "acknowledge", node: "discharge-caps" }));
    await ok(tech, runId, step({ type: "acknowledge", node: "live-test" }));
    await ok(tech, runId, step({ type: "reading", node: "supply-voltage", reading: "208 V" }, { meterId: voltMeter }));
    const results = await Promise.allSettled(Array.from({ length: 10 }, () => postStep(tech, runId, step({ type: "undo" }))));
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(4);
    for (const r of results) if (r.status === "rejected") expect(r.reason).toMatchObject({ status: 422, code: "nothing-to-undo" });

    const view = await getRunView(tech, runId);
    expect(view.steps.map((s) => s.seq)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    const undos = view.steps.filter((s) => s.type === "undo");
    expect(undos.map((s) => s.undoesSeq)).toEqual([3, 2, 1, 0]);
    expect(view.steps.filter((s) => s.undone).map((s) => s.seq)).toEqual([0, 1, 2, 3]);
    const state = replay(view.tree, logOf(view.steps));
    expect(state.undone.sort()).toEqual([0, 1, 2, 3]);
    expect(view.run.currentNode).toBe(state.current);
    expect(view.run.stepCount).toBe(8);
  });
});

describe("the run view", () => {
  it("shows every step, note, photo, part, meter, the escalation and the report exactly as the tables hold them", async () => {
    // The view is read in one statement with JSON subqueries; the reference here is each table read
    // on its own through the ORM, as the view was read before (one query per list).
    const { runId, callId } = await newRun();
    await walkToCapacitor(runId);
    await ok(tech, runId, step({ type: "reading", node: "cap-measure", reading: "1.47 µF" }, { meterId: capMeter }));
    await ok(tech, runId, step({ type: "undo" }));
    await addNote(tech, runId, { key: crypto.randomUUID(), node: "cap-measure", text: "Case domed; see photo." });
    await addNote(tech, runId, { key: crypto.randomUUID(), node: "cap-measure", text: "Second note, with “quotes” and a \\ backslash." });
    await addPhoto(tech, runId, { key: crypto.randomUUID(), node: "cap-measure", bytes: TINY_PNG });
    await changeRunStatus(tech, runId, { action: "escalate", reason: "Want a second opinion on the capacitor." });
    await changeRunStatus(lead, runId, { action: "take-over" });
    // 1.2 µF is below 1.41–1.59 µF: the run ends at the failed-capacitor outcome.
    await ok(lead, runId, step({ type: "reading", node: "cap-measure", reading: "1.2 µF" }, { meterId: capMeter }));

    const view = await getRunView(lead, runId);
    const rows = await db().select().from(runSteps).where(eq(runSteps.runId, runId)).orderBy(asc(runSteps.seq));
    expect(view.steps).toEqual(
      rows.map((r) => ({
        seq: r.seq,
        key: r.idempotencyKey,
        type: r.type,
        node: r.nodeKey,
        kind: r.kind,
        answer: r.answer,
        typed: r.typed,
        value: r.value,
        unit: r.unit,
        si: r.siValue,
        siUnit: r.siUnit,
        verdict: r.verdict,
        call: r.call,
        message: r.message,
        limitsText: r.limits?.text ?? null,
        meterId: r.meterId,
        meter: r.meter,
        confirmed: r.confirmed,
        to: r.toNode,
        undone: r.undone,
        undoesSeq: r.undoesSeq,
        enteredBy: r.enteredBy,
        recordedAt: r.recordedAt.toISOString(),
      })),
    );
    expect(view.steps.some((s) => s.undone)).toBe(true);
    expect(view.steps.some((s) => s.limitsText === "1.41–1.59 µF")).toBe(true);

    const notes = await db().select().from(runNotes).where(eq(runNotes.runId, runId)).orderBy(asc(runNotes.createdAt));
    expect(view.notes).toEqual(
      notes.map((n) => ({
        id: n.id,
        key: n.idempotencyKey,
        node: n.nodeKey,
        text: n.text,
        author: "Priya Lindqvist",
        createdAt: n.createdAt.toISOString(),
      })),
    );
    const photos = await db().select().from(runPhotos).where(eq(runPhotos.runId, runId));
    expect(view.photos).toEqual(
      photos.map((p) => ({
        id: p.id,
        key: p.idempotencyKey,
        node: p.nodeKey,
        url: `/api/photos/${p.id}`,
        bytes: p.bytes,
        createdAt: p.createdAt.toISOString(),
      })),
    );
    const shopMeters = await db()
      .select()
      .from(meters)
      .where(and(eq(meters.shopId, shopA), isNull(meters.retiredAt)))
      .orderBy(asc(meters.name), asc(meters.id));
    expect(view.meters).toEqual(
      shopMeters.map((m) => ({
        id: m.id,
        name: m.name,
        quantity: m.quantity,
        unit: m.unit,
        rangeMax: m.rangeMax,
        resolution: m.resolution,
        percent: m.percent,
        counts: m.counts,
      })),
    );
    const [esc] = await db().select().from(escalations).where(eq(escalations.runId, runId));
    expect(view.escalation).toEqual({
      id: esc!.id,
      reason: "Want a second opinion on the capacitor.",
      raisedBy: "Priya Lindqvist",
      raisedAt: esc!.raisedAt.toISOString(),
      takenBy: "Teodor Vance",
      fromTree: false,
    });
    const [call] = await db().select().from(serviceCalls).where(eq(serviceCalls.id, callId));
    expect(view.call).toEqual({ id: callId, number: call!.number, symptom: call!.symptom, priority: call!.priority });
    expect(view.unit).toMatchObject({
      id: rotisserie,
      category: "rotisserie",
      nameplate: expect.any(Object),
      site: expect.any(String),
      customer: expect.any(String),
    });
    expect(view.run.technician.id).toBe(lead.userId);
    expect(view.run.startedBy.id).toBe(tech.userId);
    expect(view.timeZone).toMatch(/\//);
    expect(view.report).toBeNull();

    const done = await recordOutcome(lead, runId, {
      action: "Replaced the run capacitor.",
      minutes: 40,
      parts: [
        { partNumber: "RC-1.5-370", description: "Run capacitor 1.5 µF 370 V", quantity: 1 },
        { partNumber: "WN-12", description: "Wire nuts", quantity: 3 },
      ],
    });
    const after = await getRunView(lead, runId);
    expect(after.run.status).toBe("done");
    expect(after.parts).toEqual([
      { partNumber: "RC-1.5-370", description: "Run capacitor 1.5 µF 370 V", quantity: 1 },
      { partNumber: "WN-12", description: "Wire nuts", quantity: 3 },
    ]);
    expect(after.report).toEqual({ id: done.reportId, number: done.number, sentTo: null, sentAt: null });

    // Over HTTP the same view arrives, the second time with the version's part from its cache.
    const { cookie } = await cookieFor("lead@tinderbox.example");
    for (let i = 0; i < 2; i++) {
      const res = (await runApiLoader(routeArgs(requestWith(cookie, `/api/runs/${runId}`), { runId }))) as Response;
      expect(res.headers.get("content-type")).toMatch(/^application\/json/);
      expect(await res.json()).toEqual(JSON.parse(JSON.stringify(after)));
    }
  });
});

describe("version pinning", () => {
  /** Publishes the next version through the authoring model: draft from the latest, save, publish. */
  async function publishNextVersion(treeId: string, tree: Tree) {
    const draft = await startDraft(lead, treeId);
    const saved = await replaceDraftContent(lead, draft.versionId, tree, 1);
    const published = await publishDraft(lead, treeId, saved.revision, "test: a later version");
    return published.versionId;
  }

  it("a run keeps the version it started on when a new version is published mid-run; a new run gets the new one", async () => {
    const parsed = parseTree(readFileSync("trees/rotisserie-uneven-heat.md", "utf8"));
    if (!parsed.ok) throw new Error("starter tree does not parse");
    const v1 = { ...parsed.tree, title: `Pinning test ${crypto.randomUUID().slice(0, 8)}` };
    const { treeId } = await createPublishedTree(lead, v1, "test");
    const { runId, versionId } = await newRun(treeId);
    await ok(tech, runId, step({ type: "acknowledge", node: "lockout" }));

    // Version 2 tightens the supply range.
    const v2: Tree = {
      ...v1,
      nodes: v1.nodes.map((n) =>
        n.id === "supply-voltage" && n.kind === "measurement"
          ? { ...n, limits: { kind: "range", min: { value: 200 }, max: { value: 215 } } }
          : n,
      ),
    };
    const v2Id = await publishNextVersion(treeId, v2);

    const s = await ok(tech, runId, step({ type: "acknowledge", node: "discharge-caps" }));
    expect(s.to).toBe("live-test");
    await ok(tech, runId, step({ type: "acknowledge", node: "live-test" }));
    const reading = await ok(tech, runId, step({ type: "reading", node: "supply-voltage", reading: "195 V" }));
    expect(reading.limitsText).toBe("191–218 V");
    const view = (await getRunView(tech, runId))!;
    expect(view.version).toMatchObject({ id: versionId, number: 1 });
    expect(view.tree.nodes.find((n) => n.id === "supply-voltage")).toMatchObject({ limits: { kind: "range", min: { value: 191 } } });

    const later = await startRun(tech, { treeId, callId: await newCall() });
    expect(later.versionId).toBe(v2Id);
    const laterView = (await getRunView(tech, later.runId))!;
    expect(laterView.version.number).toBe(2);
    expect(laterView.tree.nodes.find((n) => n.id === "supply-voltage")).toMatchObject({
      limits: { kind: "range", min: { value: 200 }, max: { value: 215 } },
    });
  });
});

describe("escalation, take-over and abandoning", () => {
  it("a technician escalates with a reason; the lead sees it, reads the run and takes it over; the technician can no longer add steps", async () => {
    const { callId, runId } = await newRun();
    await ok(tech, runId, step({ type: "acknowledge", node: "lockout" }));
    expect(
      await changeRunStatus(tech, runId, { action: "escalate", reason: "Burnt smell at the terminal block; want a second opinion." }),
    ).toEqual({ status: "escalated" });
    expect((await getCall(tech, callId))?.call.status).toBe("escalated");
    await expect(postStep(tech, runId, step({ type: "acknowledge", node: "discharge-caps" }))).rejects.toMatchObject({
      kind: "conflict",
      status: 409,
    });

    const open = await listOpenEscalations(lead);
    const mine = open.find((e) => e.runId === runId);
    expect(mine?.reason).toMatch(/Burnt smell/);
    expect(mine?.nodeTitle).toBe("Discharge the fan-motor run capacitors with a rated tool");
    expect((await listOpenEscalations(otherOwner)).some((e) => e.runId === runId)).toBe(false);

    await expect(changeRunStatus(tech, runId, { action: "take-over" })).rejects.toMatchObject({ kind: "forbidden", status: 403 });
    expect(await changeRunStatus(lead, runId, { action: "take-over" })).toEqual({ status: "active" });
    expect((await listOpenEscalations(lead)).some((e) => e.runId === runId)).toBe(false);
    expect((await getRunView(lead, runId))?.viewer.holds).toBe(true);
    await expect(postStep(tech, runId, step({ type: "acknowledge", node: "discharge-caps" }))).rejects.toMatchObject({
      kind: "forbidden",
      status: 403,
    });
    await ok(lead, runId, step({ type: "acknowledge", node: "discharge-caps" }));
    expect((await getCall(tech, callId))?.call.status).toBe("in_progress");
  });

  it("abandoning needs a reason, closes the run and reopens the call for another run", async () => {
    const { callId, runId } = await newRun();
    await expect(startRun(tech, { treeId: rotisserieTree, callId })).rejects.toMatchObject({ kind: "conflict", details: { runId } });
    expect(await changeRunStatus(tech, runId, { action: "abandon", reason: "Customer cancelled; unit switched off for the day." })).toEqual(
      { status: "abandoned" },
    );
    expect((await getRunView(tech, runId))?.run.abandonReason).toMatch(/Customer cancelled/);
    expect((await getCall(tech, callId))?.call.status).toBe("open");
    expect((await startRun(tech, { treeId: rotisserieTree, callId })).runId).not.toBe(runId);
  });
});

describe("another shop's records are a 404", () => {
  it("run, step POST, photo, call and report of shop A are invisible to shop B, by model and over HTTP", async () => {
    const { callId, runId } = await walkToOutcomeWithPhoto();
    const notFound = { kind: "not-found", status: 404 };
    await expect(getRunView(otherOwner, runId)).rejects.toMatchObject(notFound);
    await expect(postStep(otherTech, runId, step({ type: "undo" }))).rejects.toMatchObject(notFound);
    await expect(getCall(otherOwner, callId)).rejects.toMatchObject(notFound);
    const view = await getRunView(tech, runId);
    const photoId = view.photos[0]!.id;
    await expect(getPhotoFile(otherOwner, photoId)).rejects.toMatchObject(notFound);
    await expect(getReport(otherOwner, view.report!.id)).rejects.toMatchObject(notFound);
    await expect(sendReport(otherOwner, view.report!.id, reportMailHtml)).rejects.toMatchObject(notFound);

    const b = await cookieFor("owner@pellham.example");
    const status = async (p: Promise<unknown>) => {
      try {
        const r = (await p) as Response;
        return r.status;
      } catch (e) {
        return (e as Response).status;
      }
    };
    expect(await status(Promise.resolve(runApiLoader(routeArgs(requestWith(b.cookie, `/api/runs/${runId}`), { runId }))))).toBe(404);
    expect(await status(Promise.resolve(photoLoader(routeArgs(requestWith(b.cookie, `/api/photos/${photoId}`), { photoId }))))).toBe(404);
    const a = await cookieFor("tech@tinderbox.example");
    const own = (await photoLoader(routeArgs(requestWith(a.cookie, `/api/photos/${photoId}`), { photoId }))) as Response;
    expect(own.status).toBe(200);
    expect(own.headers.get("content-type")).toBe("image/png");
    expect(own.headers.get("content-disposition")).toMatch(/^inline; filename="photo-[0-9a-f]{8}\.png"$/);
    expect(new Uint8Array(await own.arrayBuffer())).toEqual(TINY_PNG);
  });
});

async function walkToOutcomeWithPhoto() {
  const { callId, runId } = await newRun();
  await walkToCapacitor(runId);
  await ok(tech, runId, step({ type: "reading", node: "cap-measure", reading: "1.47 µF" }));
  const photo = await addPhoto(tech, runId, { key: crypto.randomUUID(), node: "cap-measure", bytes: TINY_PNG });
  expect(photo.replayed).toBe(false);
  await ok(tech, runId, step({ type: "answer", node: "shaft-free", answer: "spins freely and coasts" }));
  const done = await recordOutcome(tech, runId, {
    action: "Replaced the fan motor.",
    minutes: 60,
    parts: [{ partNumber: "FM-208-R", description: "Convection fan motor, 208 V", quantity: 1 }],
  });
  return { callId, runId, reportId: done.reportId };
}

describe("photo uploads", () => {
  const s3 = () =>
    new S3Client({
      endpoint: env().S3_ENDPOINT,
      region: env().S3_REGION,
      forcePathStyle: true,
      credentials: { accessKeyId: env().S3_ACCESS_KEY_ID, secretAccessKey: env().S3_SECRET_ACCESS_KEY },
    });
  async function objectsOfShop(): Promise<number> {
    const res = await s3().send(new ListObjectsV2Command({ Bucket: env().S3_BUCKET, Prefix: `${shopA}/run-photos/` }));
    return res.KeyCount ?? 0;
  }
  async function photoRows(runId: string) {
    const [row] = await db().select({ n: count() }).from(runPhotos).where(eq(runPhotos.runId, runId));
    return row?.n ?? 0;
  }
  let runId: string;
  beforeAll(async () => {
    ({ runId } = await newRun());
  });

  it("a PNG is stored under a server-made key that starts with the shop; the same key again adds nothing", async () => {
    const before = await objectsOfShop();
    const key = crypto.randomUUID();
    const r = await addPhoto(tech, runId, { key, node: "lockout", bytes: TINY_PNG });
    const [row] = await db().select().from(runPhotos).where(eq(runPhotos.id, r.photo.id));
    expect(row?.objectKey).toMatch(new RegExp(`^${shopA}/run-photos/[0-9a-f-]{36}\\.png$`));
    expect(row?.contentType).toBe("image/png");
    expect(await addPhoto(tech, runId, { key, node: "lockout", bytes: TINY_PNG })).toMatchObject({
      replayed: true,
      photo: { id: r.photo.id },
    });
    expect(await objectsOfShop()).toBe(before + 1);
  });

  it("a file whose magic number is not an image's is refused (415) even when named .png; nothing is stored", async () => {
    const before = [await objectsOfShop(), await photoRows(runId)];
    const fake = new TextEncoder().encode("just a text file pretending to be a photo");
    await expect(addPhoto(tech, runId, { key: crypto.randomUUID(), node: "lockout", bytes: fake })).rejects.toMatchObject({
      kind: "wrong-type",
      status: 415,
      message: expect.stringMatching(/not a photo Cluepath accepts/),
    });
    // A PNG signature with one byte changed is not a PNG.
    const broken = TINY_PNG.slice();
    broken[1] = 0x51;
    await expect(addPhoto(tech, runId, { key: crypto.randomUUID(), node: "lockout", bytes: broken })).rejects.toMatchObject({
      kind: "wrong-type",
      status: 415,
    });
    expect([await objectsOfShop(), await photoRows(runId)]).toEqual(before);
  });

  it("over the 10 MB cap is refused (413) by the model and by the route before parsing; nothing is stored", async () => {
    const before = [await objectsOfShop(), await photoRows(runId)];
    const big = new Uint8Array(MAX_IMAGE_BYTES + 1);
    big.set(TINY_PNG);
    await expect(addPhoto(tech, runId, { key: crypto.randomUUID(), node: "lockout", bytes: big })).rejects.toMatchObject({
      kind: "too-large",
      status: 413,
    });

    const { cookie } = await cookieFor("tech@tinderbox.example");
    const form = new FormData();
    form.set("key", crypto.randomUUID());
    form.set("node", "lockout");
    form.set("photo", new Blob([big], { type: "image/png" }), "big.png");
    const res = (await photosAction(
      routeArgs(requestWith(cookie, `/api/runs/${runId}/photos`, { method: "POST", headers: { origin: "http://localhost" }, body: form }), {
        runId,
      }),
    )) as Response;
    expect(res.status).toBe(413);
    expect((await res.json()).error).toMatch(/larger than 10 MB/);

    const wrong = new FormData();
    wrong.set("key", crypto.randomUUID());
    wrong.set("node", "lockout");
    wrong.set("photo", new Blob([new TextEncoder().encode("%PDF-1.7 not an image")], { type: "image/png" }), "scan.png");
    const res2 = (await photosAction(
      routeArgs(
        requestWith(cookie, `/api/runs/${runId}/photos`, { method: "POST", headers: { origin: "http://localhost" }, body: wrong }),
        { runId },
      ),
    )) as Response;
    expect(res2.status).toBe(415);
    expect([await objectsOfShop(), await photoRows(runId)]).toEqual(before);
  });
});

describe("the service report by e-mail", () => {
  it("is sent to the site contact through SMTP with the readings and the photo attached; the catcher has it for this shop only", async () => {
    const { reportId } = await walkToOutcomeWithPhoto();
    const sent = await sendReport(tech, reportId, reportMailHtml);
    expect(sent.to).toBe("deli@larkspur.example");
    const report = await getReport(tech, reportId);
    const subject = `Service report ${reportNumber(report.number)}`;
    let got;
    for (let i = 0; i < 20 && !got; i++) {
      got = (await capturedMail(shopA)).find((m) => m.subject.startsWith(subject));
      if (!got) await new Promise((r) => setTimeout(r, 100));
    }
    expect(got?.to).toEqual(["deli@larkspur.example"]);
    expect(got?.text).toContain("What we found: Failed fan motor — weak winding");
    expect(got?.text).toContain("Run capacitor against its rating: 1.47 µF — Within limits (limits 1.41–1.59 µF)");
    expect(got?.html).toContain("1.41–1.59 µF");
    expect(got?.attachments).toEqual([{ filename: "photo-1.png", contentType: "image/png", size: TINY_PNG.byteLength }]);
    expect((await capturedMail(shopB)).some((m) => m.subject.startsWith(subject))).toBe(false);
    expect((await getReport(tech, reportId))?.sentTo).toBe("deli@larkspur.example");
  });
});

describe("calls", () => {
  it("a call must name one of the shop's own units and people", async () => {
    const foreignUnit = stableId("unit:pellham-fryer");
    await expect(
      createCall(lead, { unitId: foreignUnit, symptom: "no heat", priority: "normal", assignedTo: null, notes: null }),
    ).rejects.toMatchObject({ kind: "invalid", fields: { unitId: "Choose one of your shop's units." } });
    await expect(
      createCall(lead, { unitId: rotisserie, symptom: "no heat", priority: "normal", assignedTo: otherTech.userId, notes: null }),
    ).rejects.toMatchObject({ kind: "invalid", fields: { assignedTo: "Choose a technician or lead of your shop." } });
    const made = await createCall(lead, { unitId: rotisserie, symptom: "no heat", priority: "normal", assignedTo: null, notes: null });
    expect(made.number).toBeGreaterThan(1000);
  });
});
