// The demo shop's training (invented, like the rest of the demo): three practice scenarios on the
// starter trees, assigned to the demo technician, two practice runs walked on the phone's clock
// over the last weeks — one reviewed with the trainer's comments and note, one with a misjudged
// reading still waiting for review — and one practice still to do. Built through the training
// models and the runner's step model, as a trainer and a technician would; only the times are
// moved back afterwards, since the models stamp "now". Added once per scenario, then left alone.
import { and, eq, isNull } from "drizzle-orm";
import { runs, runSteps, trainingAssignments, trainingComments, trainingReviews, trainingScenarios } from "./schema";
import type { World } from "../app/engine/training/script";
import type { VerdictKind } from "../app/engine/types";
import type { Ctx } from "../app/lib/context";
import { db } from "../app/lib/db.server";
import { worldToForm } from "../app/lib/training";
import { postStep, type StepInput } from "../app/models/runs/steps.server";
import { assignScenario, finishPractice, startPractice } from "../app/models/training/practice.server";
import { addComment, saveReview } from "../app/models/training/reviews.server";
import { createScenario, scenarioForm } from "../app/models/training/scenarios.server";

/** One step the trainee takes, and the seconds since the previous one by the phone's clock. */
type Walk = { after: number; entry: StepInput["entry"] };

const ack = (node: string, after: number): Walk => ({ after, entry: { type: "acknowledge", node } });
const answer = (node: string, value: string, after: number): Walk => ({ after, entry: { type: "answer", node, answer: value } });
const rating = (node: string, value: string, after: number): Walk => ({ after, entry: { type: "nameplate", node, value } });
const reading = (node: string, value: string, call: VerdictKind, after: number): Walk => ({
  after,
  entry: { type: "reading", node, reading: value, call },
});
const next = (node: string, after: number): Walk => ({ after, entry: { type: "continue", node } });

export type DemoPractice = {
  /** Days before the seed runs: when it was assigned, and when the practice was taken. */
  assignedDaysAgo: number;
  /** Due this many days after it was assigned; none when absent. */
  dueAfterDays?: number;
  taken?: {
    daysAgo: number;
    /** Hour of the day (UTC) the practice started. */
    hour: number;
    steps: Walk[];
    /** The trainer's review, a day later: comments on steps (by seq) and the overall note. */
    review?: { comments: { seq: number; text: string }[]; note: string };
  };
};

export type DemoScenario = {
  tree: string;
  name: string;
  complaint: string;
  unitText: string;
  fault: string;
  world: World;
  practice: DemoPractice;
};

export const DEMO_SCENARIOS: DemoScenario[] = [
  {
    // Reviewed: the heater is good and the control never switches it on (a few volts across it
    // where 120 V +5 % / −10 % is expected). The trainee reads everything right.
    tree: "hot-holding-below-safe-temp.md",
    name: "Holding cabinet running cool",
    complaint: "By two o'clock the chicken in the holding cabinet is only warm, and nobody has touched the dial.",
    unitText: "Insulated holding cabinet on the serving line, 120 V, 1320 W heater, circulation fan and humidity pan",
    fault: "control-not-switching",
    world: {
      "food-temp": { kind: "measurement", shows: "126 °F" },
      "set-point": { kind: "nameplate", label: "160 °F" },
      "set-point-ok": {
        kind: "question",
        observation: "The dial points at 160 °F, the mark the kitchen always uses for holding.",
        answer: "yes",
      },
      "cabinet-air": { kind: "measurement", shows: "128 °F" },
      "door-seal": {
        kind: "question",
        observation: "The paper strip drags at every point round the door, and the latch pulls the door in tight.",
        answer: "yes",
      },
      "water-pan": {
        kind: "question",
        observation: "Warm water stands at the fill line, and the fan hums with air moving past the rack.",
        answer: "yes",
      },
      "element-watts": { kind: "nameplate", label: "1320 W" },
      "element-volts": { kind: "nameplate", label: "120 V" },
      "element-ohms": { kind: "measurement", shows: "11.1 Ω" },
      "heater-supply": { kind: "measurement", shows: "3.8 V" },
    },
    practice: {
      assignedDaysAgo: 23,
      taken: {
        daysAgo: 20,
        hour: 15,
        steps: [
          ack("hot-surfaces", 40),
          reading("food-temp", "126 °F", "low", 95),
          next("tell-person-in-charge", 70),
          rating("set-point", "160 °F", 35),
          answer("set-point-ok", "yes", 20),
          reading("cabinet-air", "128 °F", "low", 960),
          answer("door-seal", "yes", 150),
          answer("water-pan", "yes", 60),
          ack("unplug", 45),
          rating("element-watts", "1320 W", 140),
          rating("element-volts", "120 V", 25),
          reading("element-ohms", "11.1 Ω", "within", 210),
          ack("live-check", 50),
          reading("heater-supply", "3.8 V", "low", 130),
        ],
        review: {
          comments: [
            {
              seq: 2,
              text: "Right first move: the food was below 135 °F, so the person in charge hears it before anything else.",
            },
            {
              seq: 11,
              text: "11.1 Ω against 10.9 Ω expected (120² / 1320): a good heater, so the fault is upstream. Well reasoned.",
            },
          ],
          note: "Safe, tidy work and the right fault. You waited the full 15 minutes for the air reading — that is what made it trustworthy. Next, practise on the rotisserie.",
        },
      },
    },
  },
  {
    // Waiting for review: the run capacitor reads 1.34 µF on a 1.5 µF rating, below the ±6 % field
    // rule's 1.41 µF (REFERENCES.md: motor-run capacitors, common practice). The trainee calls it
    // within, walks on to the motor and ends at the wrong cause.
    tree: "rotisserie-uneven-heat.md",
    name: "Pale birds on the left spits",
    complaint: "The chickens on the left-hand spits come out pale, and the lunch batch ran twenty-five minutes over.",
    unitText: "Two-fan convection rotisserie on a supermarket deli counter, 208 V single phase, about five years old",
    fault: "cap-failed",
    world: {
      "supply-voltage": { kind: "measurement", shows: "207.4 V" },
      fans: {
        kind: "question",
        observation: "The left fan turns noticeably slower than the right; its note is lower and the air at the left vents is weak.",
        answer: "one slow",
      },
      "cap-rating": { kind: "nameplate", label: "1.5 µF" },
      "cap-measure": { kind: "measurement", shows: "1.34 µF" },
      // Off the way to the fault: what a trainee who takes the wrong branch at the capacitor finds.
      "shaft-free": {
        kind: "question",
        observation: "The fan wheel turns smoothly by hand and carries on for a moment after you let go.",
        answer: "spins freely and coasts",
      },
    },
    practice: {
      assignedDaysAgo: 9,
      dueAfterDays: 10,
      taken: {
        daysAgo: 2,
        hour: 14,
        steps: [
          ack("lockout", 55),
          ack("discharge-caps", 80),
          ack("live-test", 30),
          reading("supply-voltage", "207.4 V", "within", 115),
          answer("fans", "one slow", 75),
          ack("cap-lockout", 140),
          rating("cap-rating", "1.5 µF", 65),
          reading("cap-measure", "1.34 µF", "within", 105),
          answer("shaft-free", "spins freely and coasts", 90),
        ],
      },
    },
  },
  {
    // Still to do: the heat light comes on, the contactor does not pull in, and its coil reads good
    // with full voltage across it — a contactor stuck open.
    tree: "griddle-section-no-heat.md",
    name: "Right griddle section stays cold",
    complaint: "The right-hand end of the griddle never gets hot; the other two sections are fine.",
    unitText: "Electric griddle on a bistro cook line, 36 in, three sections, 208 V",
    fault: "contactor-stuck",
    world: {
      "heat-light": {
        kind: "question",
        observation: "With the right thermostat turned to maximum, its amber lamp lights at once.",
        answer: "yes",
      },
      "contactor-pulls": {
        kind: "question",
        observation: "With the lamp lit there is no click from the right-hand contactor, and its armature stays up.",
        answer: "no",
      },
      "coil-ohms": { kind: "measurement", shows: "540 Ω" },
      "coil-volts": { kind: "measurement", shows: "206.8 V" },
    },
    practice: { assignedDaysAgo: 1, dueAfterDays: 9 },
  },
];

const DAY = 86_400_000;
const isoDate = (d: Date) => d.toISOString().slice(0, 10);

/** The demo shop's training, added once per scenario (by its name). `treeIdOf` names the seeded starter tree of a file. */
export async function seedDemoTraining(shopId: string, ids: { trainer: string; technician: string; treeIdOf: (file: string) => string }) {
  const trainer: Ctx = { shopId, userId: ids.trainer, role: "trainer" };
  const tech: Ctx = { shopId, userId: ids.technician, role: "technician" };
  const now = Date.now();
  for (const s of DEMO_SCENARIOS) {
    const [exists] = await db()
      .select({ id: trainingScenarios.id })
      .from(trainingScenarios)
      .where(and(eq(trainingScenarios.shopId, shopId), eq(trainingScenarios.name, s.name), isNull(trainingScenarios.retiredAt)))
      .limit(1);
    if (exists) continue;
    const input = scenarioForm.parse({
      name: s.name,
      complaint: s.complaint,
      unitText: s.unitText,
      fault: s.fault,
      ...worldToForm(s.world),
    });
    const made = await createScenario(trainer, ids.treeIdOf(s.tree), input);
    if (!made.ok) throw new Error(`The demo scenario "${s.name}" does not pass its check.`);
    const p = s.practice;
    const assignedAt = new Date(now - p.assignedDaysAgo * DAY);
    const dueOn = p.dueAfterDays === undefined ? null : isoDate(new Date(assignedAt.getTime() + p.dueAfterDays * DAY));
    await assignScenario(trainer, made.id, { trainees: [tech.userId], dueOn });
    await db().update(trainingScenarios).set({ createdAt: assignedAt, updatedAt: assignedAt }).where(eq(trainingScenarios.id, made.id));
    const [assignment] = await db()
      .select({ id: trainingAssignments.id })
      .from(trainingAssignments)
      .where(eq(trainingAssignments.scenarioId, made.id));
    await db().update(trainingAssignments).set({ createdAt: assignedAt }).where(eq(trainingAssignments.id, assignment!.id));
    if (!p.taken) continue;

    // The practice on the phone, each step stamped by the phone's clock.
    const { runId } = await startPractice(tech, assignment!.id);
    const day = new Date(now - p.taken.daysAgo * DAY);
    const startedAt = new Date(Date.UTC(day.getUTCFullYear(), day.getUTCMonth(), day.getUTCDate(), p.taken.hour, 12));
    let at = startedAt.getTime();
    for (const w of p.taken.steps) {
      at += w.after * 1000;
      const step = await postStep(tech, runId, { key: crypto.randomUUID(), entry: w.entry, at: new Date(at).toISOString() });
      // Sent as taken: the server's time a second after the phone's.
      await db()
        .update(runSteps)
        .set({ recordedAt: new Date(at + 1000) })
        .where(and(eq(runSteps.runId, runId), eq(runSteps.seq, step.step.seq)));
    }
    await finishPractice(tech, runId);
    const completedAt = new Date(at + 20_000);
    await db().update(runs).set({ startedAt, completedAt, updatedAt: completedAt }).where(eq(runs.id, runId));

    const review = p.taken.review;
    if (!review) continue;
    const reviewedAt = new Date(completedAt.getTime() + DAY - 3 * 3_600_000);
    for (const c of review.comments) await addComment(trainer, runId, c);
    await saveReview(trainer, runId, { note: review.note });
    await db().update(trainingComments).set({ createdAt: reviewedAt }).where(eq(trainingComments.runId, runId));
    await db().update(trainingReviews).set({ reviewedAt }).where(eq(trainingReviews.runId, runId));
  }
}
