// The demo shop's training as the seed leaves it (db/demo-training.ts): what a trainer and the
// demo technician see on a fresh demo, read through the same models their pages call, and a second
// seeding that adds nothing. The figures are checked against the trade's values, not the seed's:
// - 1.34 µF on a 1.5 µF run capacitor is below the ±6 % field rule's 1.41 µF: low (REFERENCES.md,
//   motor-run capacitors — trade practice, common practice);
// - a 1320 W heater at 120 V should read V²/P = 10.9 Ω, so 11.1 Ω is within ±10 % (REFERENCES.md,
//   element resistance — physics);
// - food at 126 °F is below the 135 °F hot-holding minimum (FDA Food Code 2022 §3-501.16(A)).
import { and, count, eq, isNotNull } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { runs, runSteps, trainingAssignments, trainingComments, trainingReviews, trainingScenarios } from "../../db/schema";
import { DEMO_SHOP } from "../../db/demo";
import { seedDemoTraining } from "../../db/demo-training";
import { stableId } from "../../db/seed";
import type { Ctx } from "../../app/lib/context";
import { closeDb, db } from "../../app/lib/db.server";
import { myPractice } from "../../app/models/training/practice.server";
import { getPracticeReview } from "../../app/models/training/reviews.server";
import { getScenario, listScenarios } from "../../app/models/training/scenarios.server";
import { trainingBoard, traineeProgress } from "../../app/models/training/summary.server";

afterAll(() => closeDb());

const shopId = stableId(DEMO_SHOP.key);
const trainer: Ctx = { shopId, userId: stableId("user:trainer@tinderbox.example"), role: "trainer" };
const tech: Ctx = { shopId, userId: stableId("user:tech@tinderbox.example"), role: "technician" };
const DAY = 86_400_000;

describe("the demo shop's training", () => {
  it("the trainer's home lists scenarios whose check passes, an open assignment with a due date, and a run waiting for review", async () => {
    const scenarios = await listScenarios(trainer);
    expect(scenarios.length).toBeGreaterThanOrEqual(2);
    for (const s of scenarios) {
      expect(s.checkStatus).toBe("ready");
      // Checked again now, not only as stored.
      expect((await getScenario(trainer, s.id)).check.ok).toBe(true);
    }
    const board = await trainingBoard(trainer);
    expect(board.assignments.some((a) => a.state === "to do" && a.dueOn !== null)).toBe(true);
    expect(board.waiting).toHaveLength(1);
    expect(board.waiting[0]).toMatchObject({ trainee: "Priya Lindqvist", right: false, reached: "Failed fan motor — weak winding" });
  });

  it("the run waiting for review has one misjudged reading: 1.34 µF called within where the engine says low, down the wrong branch", async () => {
    const { waiting } = await trainingBoard(trainer);
    const r = await getPracticeReview(trainer, waiting[0]!.runId);
    expect(r.review.misjudged).toHaveLength(1);
    expect(r.review.misjudged[0]).toMatchObject({ node: "cap-measure", call: "within", undone: false });
    expect(r.review.misjudged[0]!.verdict).toMatchObject({ verdict: "low", limits: { text: "1.41–1.59 µF" } });
    expect(r.review.firstWrongTurn).toMatchObject({ node: "cap-measure", trainee: "within", reference: "low", referenceTo: "cap-failed" });
    expect(r.review.rightFault).toBe(false);
    // The phone's clock: the run took minutes, in the last weeks, and every step has its time.
    expect(r.run.startedAt.getTime()).toBeLessThan(Date.now() - DAY);
    expect(r.run.startedAt.getTime()).toBeGreaterThan(Date.now() - 42 * DAY);
    expect(r.review.totalMs).toBeGreaterThan(5 * 60_000);
    expect(r.review.totalMs).toBeLessThan(60 * 60_000);
    expect(r.comments).toEqual([]);
    expect(r.note).toBeNull();
  });

  it("the technician's practice: one to do, one finished, and one reviewed with the trainer's comments and note", async () => {
    const { items } = await myPractice(tech);
    expect(items.map((i) => i.state).sort()).toEqual(["finished", "reviewed", "to do"]);
    const reviewed = items.find((i) => i.state === "reviewed")!;
    expect(reviewed.result).toMatchObject({ right: true, reached: "Control not switching the heater on" });
    expect(reviewed.review?.reviewer).toBe("Ines Calloway");
    expect(reviewed.review?.note.length).toBeGreaterThan(20);
    expect(reviewed.comments.map((c) => c.step)).toContain("Heater resistance against V²/P");
    // The reviewed run's readings: the food below 135 °F and a heater close to V²/P, each judged as the trainee called it.
    const r = await getPracticeReview(trainer, reviewed.runId!);
    expect(r.review.misjudged).toEqual([]);
    const judged = Object.fromEntries(
      r.review.rows.flatMap((row) => (row.trainee?.verdict ? [[row.node, row.trainee.verdict.verdict]] : [])),
    );
    expect(judged).toMatchObject({ "food-temp": "low", "element-ohms": "within" });
    // The review came after the run was finished.
    expect(r.note!.reviewedAt.getTime()).toBeGreaterThan(r.run.completedAt!.getTime());
  });

  it("the trainer's figures cover the trainee's two finished runs: one at the right fault, one misjudged reading between them", async () => {
    const me = (await traineeProgress(trainer)).find((p) => p.id === tech.userId)!;
    expect(me.all).toMatchObject({ runs: 2, rightShare: 0.5, misjudgedPerRun: 0.5 });
    expect(me.all.medianToCauseMs).toBeGreaterThan(0);
  });

  it("seeding again adds nothing", async () => {
    const rows = async () =>
      Promise.all(
        [trainingScenarios, trainingAssignments, runs, runSteps, trainingComments, trainingReviews].map(
          async (t) => (await db().select({ n: count() }).from(t))[0]!.n,
        ),
      );
    const before = await rows();
    await seedDemoTraining(shopId, {
      trainer: trainer.userId,
      technician: tech.userId,
      treeIdOf: (file) => stableId(`tree:${file}`),
    });
    expect(await rows()).toEqual(before);
    // The invented history has practice runs of its own, without a scenario: the demo's are the two with one.
    const [practice] = await db()
      .select({ n: count() })
      .from(runs)
      .where(and(eq(runs.shopId, shopId), eq(runs.practice, true), isNotNull(runs.scenarioId)));
    expect(practice!.n).toBe(2);
  });
});
