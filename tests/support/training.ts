// Practice fixtures for the integration tests: scenarios on the small tree and on the two-fan
// rotisserie (a weak run capacitor: 1.31 µF on a 1.5 µF rating, below the ±6 % field rule's
// 1.41 µF — REFERENCES.md, trade practice / common practice), and practice runs walked to an end.
import { and, desc, eq } from "drizzle-orm";
import { trainingAssignments } from "../../db/schema";
import type { Ctx } from "../../app/lib/context";
import { db } from "../../app/lib/db.server";
import { worldToForm } from "../../app/lib/training";
import type { World } from "../../app/engine/training/script";
import { postStep, type StepInput } from "../../app/models/runs/steps.server";
import { assignScenario, startPractice } from "../../app/models/training/practice.server";
import { createScenario, scenarioForm } from "../../app/models/training/scenarios.server";

/** The weak-capacitor world on trees/rotisserie-uneven-heat.md. */
export const WEAK_CAP_WORLD: World = {
  "supply-voltage": { kind: "measurement", shows: "208 V" },
  fans: { kind: "question", observation: "The left fan turns slower than the right and its note is lower.", answer: "one slow" },
  "cap-rating": { kind: "nameplate", label: "1.5 µF" },
  "cap-measure": { kind: "measurement", shows: "1.31 µF" },
  "shaft-free": {
    kind: "question",
    observation: "The fan wheel turns smoothly by hand and coasts for a moment.",
    answer: "spins freely and coasts",
  },
};

/** The small tree (tests/support/trees.ts): a domed capacitor means the failed-capacitor outcome. */
export const SMALL_WORLD: World = {
  "cap-look": { kind: "question", observation: "The capacitor's top is domed and oily.", answer: "yes" },
};

/** A scenario through the form's own schema, as the page submits it. */
export function scenarioFields(name: string, fault: string, world: World) {
  return scenarioForm.parse({
    name,
    complaint: "The fan hums and the birds come out pale on one side.",
    unitText: "Two-fan rotisserie at the deli counter",
    fault,
    ...worldToForm(world),
  });
}

export async function newScenario(
  ctx: Ctx,
  treeId: string,
  fault: string,
  world: World,
  name = `Practice ${crypto.randomUUID().slice(0, 6)}`,
) {
  return (await createScenario(ctx, treeId, scenarioFields(name, fault, world))).id;
}

/** A scenario assigned to `trainee`: the assignment's id. */
export async function assigned(by: Ctx, trainee: Ctx, scenarioId: string): Promise<string> {
  await assignScenario(by, scenarioId, { trainees: [trainee.userId], dueOn: null });
  const [row] = await db()
    .select({ id: trainingAssignments.id })
    .from(trainingAssignments)
    .where(and(eq(trainingAssignments.scenarioId, scenarioId), eq(trainingAssignments.traineeId, trainee.userId)))
    .orderBy(desc(trainingAssignments.createdAt))
    .limit(1);
  return row!.id;
}

export const practiceStep = (entry: StepInput["entry"]): StepInput => ({ key: crypto.randomUUID(), entry, at: new Date().toISOString() });

/** A practice run on the small tree, answered to its end (not finished yet). */
export async function smallPracticeAtEnd(by: Ctx, trainee: Ctx, treeId: string) {
  const scenarioId = await newScenario(by, treeId, "cap-failed", SMALL_WORLD);
  const assignmentId = await assigned(by, trainee, scenarioId);
  const { runId } = await startPractice(trainee, assignmentId);
  await postStep(trainee, runId, practiceStep({ type: "answer", node: "cap-look", answer: "yes" }));
  return { scenarioId, assignmentId, runId };
}
