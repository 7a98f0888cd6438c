// The training models' own helpers: a scenario row of the caller's shop (read or locked), its
// script, and what the phone is told about a practice run. No authorisation here: the caller has
// decided. Used by the training models and by the run view.
import { and, eq } from "drizzle-orm";
import { trainingScenarios, type runs } from "../../../db/schema";
import type { Script } from "../../engine/training/script";
import type { Ctx } from "../../lib/context";
import { db, type Db, type Tx } from "../../lib/db.server";
import { worldForTrainee, type PracticeView } from "../../lib/training";
import { nodeOf, versionContent } from "../runs/_version.server";

export type ScenarioRow = typeof trainingScenarios.$inferSelect;

/** One of the shop's scenarios (locked for the transaction when `lock`), or null. */
export async function scenarioRow(ctx: Ctx, id: string, q: Tx | Db = db(), lock = false): Promise<ScenarioRow | null> {
  const query = q
    .select()
    .from(trainingScenarios)
    .where(and(eq(trainingScenarios.id, id), eq(trainingScenarios.shopId, ctx.shopId)));
  const [row] = lock ? await query.for("update") : await query;
  return row ?? null;
}

export const scriptOf = (s: Pick<ScenarioRow, "faultNode" | "world">): Script => ({ fault: s.faultNode, world: s.world });

/** The scenario as the trainee may see it on the phone: the hidden fault only once the run is finished. */
export async function practiceViewOf(
  ctx: Ctx,
  run: Pick<typeof runs.$inferSelect, "scenarioId" | "status" | "versionId">,
): Promise<PracticeView | null> {
  if (!run.scenarioId) return null;
  const s = await scenarioRow(ctx, run.scenarioId);
  if (!s) return null;
  const content = await versionContent(ctx, run.versionId);
  const fault = nodeOf(content.tree, s.faultNode);
  return {
    scenario: { id: s.id, name: s.name, complaint: s.complaint, unitText: s.unitText },
    world: worldForTrainee(s.world),
    fault: run.status === "done" ? { node: s.faultNode, title: fault?.title ?? s.faultNode } : null,
  };
}
