// Training against the real MariaDB: the scenario check as a gate, practice runs that follow the
// trainee's call, the review, practice kept out of everything a customer or the owner's figures
// read, and shops kept apart. The rotisserie scenario hides a weak run capacitor: 1.31 µF on a
// 1.5 µF rating, below the ±6 % field rule's 1.41 µF (REFERENCES.md: fan-motor run capacitor,
// motor-run capacitor field rule — trade practice, common practice).
import { and, count, eq, isNull } from "drizzle-orm";
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { escalations, reports, runParts, runs, runSteps, trainingScenarios } from "../../db/schema";
import { DEMO_SHOP, OTHER_SHOP } from "../../db/demo";
import { stableId } from "../../db/seed";
import { parseTree } from "../../app/engine/markdown/parse";
import type { Tree } from "../../app/engine/types";
import type { Ctx } from "../../app/lib/context";
import { closeDb, db } from "../../app/lib/db.server";
import { myCalls, recentlyDone } from "../../app/models/calls.server";
import { shopCounts } from "../../app/models/equipment.server";
import { changeRunStatus, recordOutcome } from "../../app/models/runs/lifecycle.server";
import { countOpenEscalations, historyOfUnit, listOpenEscalations } from "../../app/models/runs/queries.server";
import { startRun } from "../../app/models/runs/start.server";
import { postStep } from "../../app/models/runs/steps.server";
import { getRunView } from "../../app/models/runs/view.server";
import { createPublishedTree, replaceDraftContent, startDraft } from "../../app/models/trees/drafts.server";
import { publishDraft } from "../../app/models/trees/publish.server";
import { assignScenario, finishPractice, myPractice, startPractice, withdrawAssignment } from "../../app/models/training/practice.server";
import { addComment, getPracticeReview, saveReview } from "../../app/models/training/reviews.server";
import { copyScenario, createScenario, getScenario, listScenarios, updateScenario } from "../../app/models/training/scenarios.server";
import { trainingBoard, traineeProgress } from "../../app/models/training/summary.server";
import { assigned, newScenario, practiceStep, scenarioFields, WEAK_CAP_WORLD } from "../support/training";

afterAll(() => closeDb());

const shopA = stableId(DEMO_SHOP.key);
const shopB = stableId(OTHER_SHOP.key);
const as = (shopId: string, email: string, role: Ctx["role"]): Ctx => ({ shopId, userId: stableId(`user:${email}`), role });
const tech = as(shopA, "tech@tinderbox.example", "technician");
const lead = as(shopA, "lead@tinderbox.example", "lead");
const trainer = as(shopA, "trainer@tinderbox.example", "trainer");
const owner = as(shopA, "owner@tinderbox.example", "owner");
const otherOwner = as(shopB, "owner@pellham.example", "owner");
const otherTech = as(shopB, "tech@pellham.example", "technician");
const unitA = stableId("unit:larkspur-rotisserie");

const rotisserie: Tree = (() => {
  const r = parseTree(readFileSync(new URL("../../trees/rotisserie-uneven-heat.md", import.meta.url), "utf8"));
  if (!r.ok) throw new Error("rotisserie tree");
  return r.tree;
})();

let treeId: string;
beforeAll(async () => {
  // A copy of the starter tree of our own, so other test files' publishing never moves it.
  ({ treeId } = await createPublishedTree(
    lead,
    { ...rotisserie, title: `Training rotisserie ${crypto.randomUUID().slice(0, 6)}` },
    "For the training tests",
  ));
});

/** Cautions, 208 V, one fan slow, the rating: the walk to the capacitor as practice steps. */
async function walkToCapacitor(ctx: Ctx, runId: string) {
  for (const node of ["lockout", "discharge-caps", "live-test"]) await postStep(ctx, runId, practiceStep({ type: "acknowledge", node }));
  await postStep(ctx, runId, practiceStep({ type: "reading", node: "supply-voltage", reading: "208 V", call: "within" }));
  await postStep(ctx, runId, practiceStep({ type: "answer", node: "fans", answer: "one slow" }));
  await postStep(ctx, runId, practiceStep({ type: "acknowledge", node: "cap-lockout" }));
  await postStep(ctx, runId, practiceStep({ type: "nameplate", node: "cap-rating", value: "1.5 µF" }));
}

/** Row counts of what customers and the owner's figures read. */
async function customerFacing() {
  const n = async (q: Promise<{ n: number }[]>) => (await q)[0]!.n;
  return {
    reports: await n(db().select({ n: count() }).from(reports).where(eq(reports.shopId, shopA))),
    escalations: await n(db().select({ n: count() }).from(escalations).where(eq(escalations.shopId, shopA))),
    parts: await n(db().select({ n: count() }).from(runParts).where(eq(runParts.shopId, shopA))),
    unitRuns: (await historyOfUnit(owner, unitA)).runs.length,
    openEscalations: await countOpenEscalations(owner),
    myCalls: (await myCalls(tech)).length,
    recentlyDone: (await recentlyDone(tech)).length,
    counts: await shopCounts(owner),
  };
}

describe("the scenario check is the gate", () => {
  it("a scenario whose script does not reach its fault is saved with its findings and refused for assignment, naming the step", async () => {
    const world = { ...WEAK_CAP_WORLD, "cap-measure": { kind: "measurement" as const, shows: "1.47 µF" } };
    const made = await createScenario(trainer, treeId, scenarioFields("Good capacitor, wrong fault", "cap-failed", world));
    expect(made.ok).toBe(false);
    const s = await getScenario(trainer, made.id);
    expect(s.check.ok).toBe(false);
    expect(s.check.findings[0]).toMatchObject({ code: "script-leads-elsewhere", nodeId: "cap-measure" });
    expect(s.check.findings[0]!.message).toMatch(
      /^At Measurement ‘Run capacitor against its rating’ the scripted reading 1\.47 µF is within 1\.41–1\.59 µF, which leads to Question ‘With power locked out, does the slow fan's shaft spin freely by hand\?’/,
    );
    const [stored] = await db().select().from(trainingScenarios).where(eq(trainingScenarios.id, made.id));
    expect(stored!.checkStatus).toBe("failing");
    await expect(assignScenario(trainer, made.id, { trainees: [tech.userId], dueOn: null })).rejects.toMatchObject({
      kind: "rejected",
      status: 422,
      code: "script",
      message: expect.stringMatching(
        /^This scenario can't be assigned until its check passes\. At Measurement ‘Run capacitor against its rating’/,
      ),
    });
    // Fixed (the meter shows 1.31 µF), it passes and can be assigned.
    await updateScenario(trainer, made.id, scenarioFields("Weak capacitor", "cap-failed", WEAK_CAP_WORLD));
    expect((await getScenario(trainer, made.id)).check.ok).toBe(true);
    await expect(assignScenario(trainer, made.id, { trainees: [tech.userId], dueOn: "2026-12-20" })).resolves.toEqual({
      assigned: 1,
      already: 0,
    });
    await expect(assignScenario(trainer, made.id, { trainees: [tech.userId], dueOn: null })).resolves.toEqual({ assigned: 0, already: 1 });
  });

  it("a step on the way with nothing scripted is named; a value that does not read names its step", async () => {
    const { "cap-rating": _, ...missing } = WEAK_CAP_WORLD;
    const a = await getScenario(trainer, await newScenario(trainer, treeId, "cap-failed", missing));
    expect(a.check.findings.map((f) => [f.code, f.nodeId])).toEqual([["script-missing", "cap-rating"]]);
    const b = await getScenario(
      trainer,
      await newScenario(trainer, treeId, "cap-failed", { ...WEAK_CAP_WORLD, "supply-voltage": { kind: "measurement", shows: "208 ohms" } }),
    );
    expect(b.check.findings.map((f) => [f.code, f.nodeId])).toContainEqual(["script-value", "supply-voltage"]);
  });

  it("only technicians of the shop are assigned; only untaken assignments are withdrawn", async () => {
    const id = await newScenario(trainer, treeId, "cap-failed", WEAK_CAP_WORLD);
    await expect(assignScenario(trainer, id, { trainees: [lead.userId], dueOn: null })).rejects.toMatchObject({
      kind: "invalid",
      fields: { trainees: "Choose technicians of your shop." },
    });
    await expect(assignScenario(trainer, id, { trainees: [otherTech.userId], dueOn: null })).rejects.toMatchObject({ kind: "invalid" });
    const assignmentId = await assigned(trainer, tech, id);
    await startPractice(tech, assignmentId);
    await expect(withdrawAssignment(trainer, assignmentId)).rejects.toMatchObject({ kind: "conflict", code: "started" });
  });
});

describe("a practice run follows the trainee's call", () => {
  it("1.31 µF judged ‘within’ leads to the wrong cause; the review shows the capacitor as the first wrong turn and the misjudged reading; the trainee reads the trainer's comment", async () => {
    const scenarioId = await newScenario(trainer, treeId, "cap-failed", WEAK_CAP_WORLD, "Weak run capacitor");
    const assignmentId = await assigned(trainer, tech, scenarioId);
    const before = await customerFacing();
    const { runId } = await startPractice(tech, assignmentId);
    // Starting again carries on with the same run.
    expect((await startPractice(tech, assignmentId)).runId).toBe(runId);
    const [run] = await db().select().from(runs).where(eq(runs.id, runId));
    expect(run).toMatchObject({ practice: true, scenarioId, callId: null, unitId: null, technicianId: tech.userId });

    // The phone is told what the trainee meets, never the answer an observation means, nor the fault.
    const view = await getRunView(tech, runId);
    expect(view.practice?.world.fans).toEqual({ observation: "The left fan turns slower than the right and its note is lower." });
    expect(view.practice?.world["cap-measure"]).toEqual({ shows: "1.31 µF" });
    expect(view.practice?.fault).toBeNull();
    expect(JSON.stringify(view.practice)).not.toContain("one slow");

    await walkToCapacitor(tech, runId);
    // A reading without the trainee's call is refused and stores nothing.
    await expect(postStep(tech, runId, practiceStep({ type: "reading", node: "cap-measure", reading: "1.31 µF" }))).rejects.toMatchObject({
      kind: "rejected",
      status: 422,
      code: "wrong-entry",
    });
    const wrong = await postStep(tech, runId, practiceStep({ type: "reading", node: "cap-measure", reading: "1.31 µF", call: "within" }));
    expect(wrong.step).toMatchObject({ verdict: "low", call: "within", to: "shaft-free" });
    expect(wrong.run.currentNode).toBe("shaft-free");
    const [row] = await db()
      .select()
      .from(runSteps)
      .where(and(eq(runSteps.runId, runId), eq(runSteps.seq, wrong.step.seq)));
    expect(row).toMatchObject({ verdict: "low", call: "within", branch: "within", limitsLo: 1.41, limitsHi: 1.59 });
    const end = await postStep(tech, runId, practiceStep({ type: "answer", node: "shaft-free", answer: "spins freely and coasts" }));
    expect(end.run).toMatchObject({ endKind: "outcome", currentNode: null });

    // No report and no lead for a practice run.
    await expect(
      recordOutcome(tech, runId, {
        action: "Replaced the motor.",
        minutes: 30,
        parts: [{ partNumber: "", description: "Fan motor", quantity: 1 }],
      }),
    ).rejects.toMatchObject({ kind: "conflict", code: "practice" });
    await expect(changeRunStatus(tech, runId, { action: "escalate", reason: "Not sure about the motor." })).rejects.toMatchObject({
      kind: "conflict",
      code: "practice",
    });
    await expect(changeRunStatus(lead, runId, { action: "take-over" })).rejects.toMatchObject({ kind: "conflict", code: "practice" });

    await expect(finishPractice(tech, runId)).resolves.toEqual({ status: "done" });
    await expect(finishPractice(tech, runId)).resolves.toEqual({ status: "done" });
    const done = await getRunView(tech, runId);
    expect(done.practice?.fault).toEqual({ node: "cap-failed", title: "Failed run capacitor" });
    // Where it ended is the end node's; no root cause goes on the run (root causes are the owner's figures).
    expect(done.run.rootCause).toBeNull();
    expect(done.run.endKind).toBe("outcome");

    // The review.
    const r = await getPracticeReview(trainer, runId);
    expect(r.review.firstWrongTurn).toMatchObject({
      node: "cap-measure",
      index: 7,
      trainee: "within",
      reference: "low",
      traineeTo: "shaft-free",
      referenceTo: "cap-failed",
    });
    expect(r.review.misjudged).toHaveLength(1);
    expect(r.confirmed).toEqual([]);
    expect(r.review.misjudged[0]).toMatchObject({ node: "cap-measure", call: "within", undone: false });
    expect(r.review.misjudged[0]!.verdict).toMatchObject({ verdict: "low", limits: { text: "1.41–1.59 µF" } });
    expect(r.review.rows.filter((x) => x.kind === "trainee-only").map((x) => x.node)).toEqual(["shaft-free"]);
    expect(r.review.end).toEqual({ kind: "outcome", node: "motor-winding" });
    expect(r.review.rightFault).toBe(false);
    expect(r.review.totalMs).toBeGreaterThanOrEqual(0);

    const board = await trainingBoard(trainer);
    expect(board.waiting.map((w) => w.runId)).toContain(runId);
    await addComment(trainer, runId, { seq: 7, text: "1.31 µF is under 1.41 µF: that is low. Replace the capacitor." });
    await expect(addComment(trainer, runId, { seq: 99, text: "Nowhere" })).rejects.toMatchObject({ kind: "invalid" });
    await saveReview(trainer, runId, { note: "Check the reading against the limits before you call it." });
    expect((await trainingBoard(trainer)).waiting.map((w) => w.runId)).not.toContain(runId);

    const mine = (await myPractice(tech)).items.find((i) => i.runId === runId)!;
    expect(mine.state).toBe("reviewed");
    expect(mine.result).toEqual({
      reached: "Failed fan motor — weak winding",
      endKind: "outcome",
      fault: "Failed run capacitor",
      right: false,
    });
    expect(mine.review?.note).toBe("Check the reading against the limits before you call it.");
    expect(mine.comments.map((c) => [c.step, c.text])).toEqual([
      ["Run capacitor against its rating", "1.31 µF is under 1.41 µF: that is low. Replace the capacitor."],
    ]);

    // The trainee's figures: one run, not at the right fault, one misjudged reading.
    const me = (await traineeProgress(owner)).find((p) => p.id === tech.userId)!;
    expect(me.all.runs).toBeGreaterThanOrEqual(1);
    expect(me.all.misjudgedPerRun).toBeGreaterThan(0);

    // Nothing a customer or the owner's figures read has changed.
    expect(await customerFacing()).toEqual(before);
    expect((await listOpenEscalations(owner)).map((e) => e.runId)).not.toContain(runId);
    const [reportRows] = await db().select({ n: count() }).from(reports).where(eq(reports.runId, runId));
    expect(reportRows!.n).toBe(0);
  });

  it("a reading the trainee confirmed when asked is marked confirmed on the review; the others are not", async () => {
    const scenarioId = await newScenario(trainer, treeId, "cap-failed", WEAK_CAP_WORLD, "Weak run capacitor, a bare number");
    const { runId } = await startPractice(tech, await assigned(trainer, tech, scenarioId));
    await walkToCapacitor(tech, runId);
    // A bare 1470 on the µF step is 1470 µF; 1470 nF = 1.47 µF is inside 1.5 µF ± 6 % (REFERENCES.md:
    // motor-run capacitors, common practice), so the engine asks whether it was read right.
    await expect(
      postStep(tech, runId, practiceStep({ type: "reading", node: "cap-measure", reading: "1470", call: "low" })),
    ).rejects.toMatchObject({ status: 422, code: "needs-confirmation" });
    const yes = await postStep(
      tech,
      runId,
      practiceStep({ type: "reading", node: "cap-measure", reading: "1470", call: "high", confirmed: true }),
    );
    expect(yes.step).toMatchObject({ confirmed: true, verdict: "high" });
    const r = await getPracticeReview(trainer, runId);
    expect(r.confirmed).toEqual([yes.step.seq]);
    expect(r.typed[yes.step.seq]).toBe("1470");
  });

  it("a call on a real run's reading is refused, and a real run is not a practice one", async () => {
    const { runId } = await startRun(tech, { treeId });
    for (const node of ["lockout", "discharge-caps", "live-test"]) await postStep(tech, runId, practiceStep({ type: "acknowledge", node }));
    await expect(
      postStep(tech, runId, practiceStep({ type: "reading", node: "supply-voltage", reading: "208 V", call: "within" })),
    ).rejects.toMatchObject({ kind: "rejected", code: "not-practice" });
    await expect(getPracticeReview(trainer, runId)).rejects.toMatchObject({ kind: "not-found", status: 404 });
    await expect(finishPractice(tech, runId)).rejects.toMatchObject({ kind: "conflict", code: "not-practice" });
  });
});

describe("a scenario never changes under a practice run", () => {
  it("once taken it is locked; a copy onto the newer version carries on, checked again, and the original takes no new assignments", async () => {
    const id = await newScenario(trainer, treeId, "cap-failed", WEAK_CAP_WORLD);
    const assignmentId = await assigned(trainer, tech, id);
    await startPractice(tech, assignmentId);
    await expect(updateScenario(trainer, id, scenarioFields("Changed", "cap-failed", WEAK_CAP_WORLD))).rejects.toMatchObject({
      kind: "conflict",
      code: "locked",
    });
    await expect(copyScenario(trainer, id)).rejects.toMatchObject({ kind: "conflict", code: "newest" });

    const draft = await startDraft(lead, treeId);
    const changed = {
      ...rotisserie,
      title: "Training rotisserie, v2",
      nodes: rotisserie.nodes.map((n) => (n.id === "fan-direction" ? { ...n, title: "Do both fans turn the marked way?" } : n)),
    };
    const { revision } = await replaceDraftContent(lead, draft.versionId, changed, 1);
    await publishDraft(lead, treeId, revision, "Shorter question");
    const copy = await copyScenario(trainer, id);
    expect(copy.ok).toBe(true);
    const s = await getScenario(trainer, copy.id);
    expect(s.scenario.copiedFrom).toBe(id);
    expect(s.scenario.versionNumber).toBe(2);
    expect(s.scenario.world).toEqual(WEAK_CAP_WORLD);
    const listed = (await listScenarios(trainer)).map((x) => x.id);
    expect(listed).toContain(copy.id);
    expect(listed).not.toContain(id);
    await expect(assignScenario(trainer, id, { trainees: [tech.userId], dueOn: null })).rejects.toMatchObject({
      kind: "conflict",
      code: "retired",
    });
    // The run already taken stays on the original and its version.
    const original = await db()
      .select()
      .from(trainingScenarios)
      .where(and(eq(trainingScenarios.id, id), isNull(trainingScenarios.retiredAt)));
    expect(original).toEqual([]);
  });
});

describe("shops are kept apart", () => {
  it("another shop's scenario, assignment and practice run are not found; its lists do not show them", async () => {
    const scenarioId = await newScenario(trainer, treeId, "cap-failed", WEAK_CAP_WORLD);
    const assignmentId = await assigned(trainer, tech, scenarioId);
    const { runId } = await startPractice(tech, assignmentId);
    const notFound = { kind: "not-found", status: 404 };
    await expect(getScenario(otherOwner, scenarioId)).rejects.toMatchObject(notFound);
    await expect(updateScenario(otherOwner, scenarioId, scenarioFields("Theirs", "cap-failed", WEAK_CAP_WORLD))).rejects.toMatchObject(
      notFound,
    );
    await expect(copyScenario(otherOwner, scenarioId)).rejects.toMatchObject(notFound);
    await expect(assignScenario(otherOwner, scenarioId, { trainees: [otherTech.userId], dueOn: null })).rejects.toMatchObject(notFound);
    await expect(withdrawAssignment(otherOwner, assignmentId)).rejects.toMatchObject(notFound);
    await expect(startPractice(otherTech, assignmentId)).rejects.toMatchObject(notFound);
    await expect(getPracticeReview(otherOwner, runId)).rejects.toMatchObject(notFound);
    await expect(addComment(otherOwner, runId, { seq: 0, text: "Not ours" })).rejects.toMatchObject(notFound);
    await expect(finishPractice(otherTech, runId)).rejects.toMatchObject(notFound);
    await expect(getRunView(otherTech, runId)).rejects.toMatchObject(notFound);
    await expect(createScenario(otherOwner, treeId, scenarioFields("On their tree", "cap-failed", WEAK_CAP_WORLD))).rejects.toMatchObject(
      notFound,
    );
    expect((await listScenarios(otherOwner)).map((s) => s.id)).not.toContain(scenarioId);
    const board = await trainingBoard(otherOwner);
    expect(board.assignments.map((a) => a.id)).not.toContain(assignmentId);
    expect((await traineeProgress(otherOwner)).map((p) => p.id)).not.toContain(tech.userId);
    expect((await myPractice(otherTech)).items).toEqual([]);
  });

  it("a technician cannot start another technician's practice", async () => {
    const scenarioId = await newScenario(trainer, treeId, "cap-failed", WEAK_CAP_WORLD);
    const assignmentId = await assigned(trainer, tech, scenarioId);
    const second: Ctx = { ...tech, userId: stableId("user:nobody-else@tinderbox.example") };
    await expect(startPractice(second, assignmentId)).rejects.toMatchObject({ kind: "not-found" });
  });
});
