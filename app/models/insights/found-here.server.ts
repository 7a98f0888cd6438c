// "Found here before": how the shop's past completed real runs of the same tree went at a step,
// and how often a root cause was found on the same make and model. Two small lookups in the
// tallies kept when runs complete (db/schema/insights.ts), so it stays well under 20 ms.
import { and, asc, eq } from "drizzle-orm";
import { equipmentUnits, insightCauseTallies, insightStepTallies, treeVersions } from "../../../db/schema";
import type { Ctx } from "../../lib/context";
import { db } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { notFound } from "../../lib/refusal";
import { branchLabel, FOUND_HERE_MIN_RUNS, type FoundHere, type FoundHereStep } from "../../lib/insights/found-here";

const BRANCH_ORDER = ["low", "within", "high", "marginal"];

/**
 * For a version of one of the shop's trees (any version counts toward its tree), optionally one
 * step of it and the unit being worked on. Another shop's version or unit is not found.
 */
export async function foundHereBefore(
  ctx: Ctx,
  input: { versionId: string; unitId?: string | null; node?: string | null },
): Promise<FoundHere> {
  authorize(ctx, "runs.view");
  const d = db();
  const [[version], unit] = await Promise.all([
    d
      .select({ treeId: treeVersions.treeId })
      .from(treeVersions)
      .where(and(eq(treeVersions.id, input.versionId), eq(treeVersions.shopId, ctx.shopId)))
      .limit(1),
    input.unitId
      ? d
          .select({ make: equipmentUnits.make, model: equipmentUnits.model })
          .from(equipmentUnits)
          .where(and(eq(equipmentUnits.id, input.unitId), eq(equipmentUnits.shopId, ctx.shopId)))
          .limit(1)
          .then((r) => r[0] ?? null)
      : Promise.resolve(undefined),
  ]);
  if (!version || unit === null) notFound("That tree version or unit");
  const tree = and(eq(insightStepTallies.shopId, ctx.shopId), eq(insightStepTallies.treeId, version.treeId));
  const [stepRows, causeRows] = await Promise.all([
    d
      .select({ node: insightStepTallies.nodeKey, branch: insightStepTallies.branch, runs: insightStepTallies.runs })
      .from(insightStepTallies)
      .where(input.node ? and(tree, eq(insightStepTallies.nodeKey, input.node)) : tree)
      .orderBy(asc(insightStepTallies.nodeKey)),
    d
      .select({
        make: insightCauseTallies.make,
        model: insightCauseTallies.model,
        node: insightCauseTallies.endNode,
        runs: insightCauseTallies.runs,
      })
      .from(insightCauseTallies)
      .where(and(eq(insightCauseTallies.shopId, ctx.shopId), eq(insightCauseTallies.treeId, version.treeId))),
  ]);
  const treeRuns = causeRows.reduce((n, r) => n + r.runs, 0);
  const shown = treeRuns >= FOUND_HERE_MIN_RUNS;
  const steps = new Map<string, FoundHereStep>();
  if (shown) {
    for (const r of stepRows) {
      const s = steps.get(r.node) ?? { node: r.node, runs: 0, branches: [] };
      s.runs += r.runs;
      s.branches.push({ branch: r.branch, label: branchLabel(r.branch), runs: r.runs });
      steps.set(r.node, s);
    }
    const rank = (b: string) => (BRANCH_ORDER.includes(b) ? BRANCH_ORDER.indexOf(b) : -1);
    for (const s of steps.values())
      s.branches.sort((a, b) => b.runs - a.runs || rank(a.branch) - rank(b.branch) || a.label.localeCompare(b.label));
  }
  let causes: FoundHere["causes"] = null;
  if (unit) {
    const same = causeRows.filter((r) => r.make === unit.make && r.model === unit.model);
    const runs = same.reduce((n, r) => n + r.runs, 0);
    const causesShown = runs >= FOUND_HERE_MIN_RUNS;
    causes = {
      make: unit.make,
      model: unit.model,
      runs,
      shown: causesShown,
      outcomes: causesShown
        ? same.map((r) => ({ node: r.node, runs: r.runs })).sort((a, b) => b.runs - a.runs || a.node.localeCompare(b.node))
        : [],
    };
  }
  return { threshold: FOUND_HERE_MIN_RUNS, treeRuns, shown, steps: [...steps.values()], causes };
}
