// Practice scenarios: a hidden fault on one published tree version and the world the trainee meets.
// Trainers and leads write them; the engine checks each script (app/engine/training/script.ts) and
// the check is stored with it. A scenario never changes under a practice run: once one has been
// taken it is locked, and a copy (onto the tree's newest published version) carries the changes.
import { and, asc, count, desc, eq, inArray, isNull } from "drizzle-orm";
import { z } from "zod";
import { memberships, runs, trainingAssignments, trainingReviews, trainingScenarios, treeVersions, users } from "../../../db/schema";
import { checkScript, type World } from "../../engine/training/script";
import type { Tree } from "../../engine/types";
import type { Ctx } from "../../lib/context";
import { db, writeTx, type Tx } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { notFound, Refusal } from "../../lib/refusal";
import { assignmentState, worldFromForm } from "../../lib/training";
import { currentPublished, nodeOf, versionContent } from "../runs/_version.server";
import { shopTimeZone } from "../shop.server";
import { listPublished } from "../trees/library.server";
import { scenarioRow, scriptOf } from "./_scenario.server";

/** The scenario form: its fields, and the world from the fields named world.<node>.<part>. */
export const scenarioForm = z
  .object({
    name: z.string().trim().min(3, "Give the scenario a name a trainee will recognise.").max(120, "Keep the name under 120 characters."),
    complaint: z.string().trim().min(3, "Say what the customer reports, in their words.").max(500, "Keep it under 500 characters."),
    unitText: z.string().trim().min(3, "Describe the unit the trainee finds.").max(300, "Keep it under 300 characters."),
    fault: z.string().trim().min(1, "Choose the hidden fault.").max(64),
  })
  .catchall(z.string().max(500, "Keep each scripted value under 500 characters."))
  .transform((v) => ({
    name: v.name,
    complaint: v.complaint,
    unitText: v.unitText,
    fault: v.fault,
    world: worldFromForm(v as Record<string, string>),
  }));
export type ScenarioInput = z.output<typeof scenarioForm>;

/**
 * The scenario's script checked on a version: only the steps of the version that the script can
 * speak for, and only their own kind, then the engine's check. The columns a scenario row keeps of it.
 */
function checkedOn(tree: Tree, fault: string, script: World) {
  const world: World = {};
  for (const [id, s] of Object.entries(script)) {
    const n = nodeOf(tree, id);
    if (n && n.kind === s.kind) world[id] = s;
  }
  const check = checkScript(tree, { fault, world });
  return {
    ok: check.ok,
    row: { faultNode: fault, world, checkStatus: check.ok ? ("ready" as const) : ("failing" as const), findings: check.findings },
  };
}

async function hasRuns(tx: Tx, scenarioId: string): Promise<boolean> {
  const [row] = await tx.select({ n: count() }).from(runs).where(eq(runs.scenarioId, scenarioId));
  return (row?.n ?? 0) > 0;
}

/** What the new-scenario form offers: the shop's published trees and, for the one chosen, its version's steps. */
export async function scenarioFormChoices(ctx: Ctx, treeId?: string | null) {
  authorize(ctx, "training.write");
  const trees = await listPublished(ctx);
  if (!treeId) return { trees, version: null };
  const v = await currentPublished(ctx, treeId);
  if (!v) throw new Refusal("not-found", "That tree has no published version to practise on.");
  const content = await versionContent(ctx, v.id);
  return { trees, version: { treeId, versionId: v.id, number: v.number, title: content.title, tree: content.tree } };
}

/** A new scenario on the tree's newest published version; saved whatever its check says (findings with it). */
export async function createScenario(ctx: Ctx, treeId: string, input: ScenarioInput): Promise<{ id: string; ok: boolean }> {
  authorize(ctx, "training.write");
  return writeTx(async (tx) => {
    const v = await currentPublished(ctx, treeId, tx);
    if (!v) throw new Refusal("not-found", "That tree has no published version to practise on.");
    const content = await versionContent(ctx, v.id, tx);
    const check = checkedOn(content.tree, input.fault, input.world);
    const id = crypto.randomUUID();
    const now = new Date();
    await tx.insert(trainingScenarios).values({
      id,
      shopId: ctx.shopId,
      treeId,
      versionId: v.id,
      name: input.name,
      complaint: input.complaint,
      unitText: input.unitText,
      ...check.row,
      createdBy: ctx.userId,
      createdAt: now,
      updatedAt: now,
    });
    return { id, ok: check.ok };
  });
}

/** Changes a scenario no practice run has used yet, and checks it again. */
export async function updateScenario(ctx: Ctx, id: string, input: ScenarioInput): Promise<{ id: string; ok: boolean }> {
  authorize(ctx, "training.write");
  return writeTx(async (tx) => {
    const s = (await scenarioRow(ctx, id, tx, true)) ?? notFound("That scenario");
    if (s.retiredAt)
      throw new Refusal("conflict", "This scenario has been replaced by a copy on a newer version: change the copy.", { code: "retired" });
    if (await hasRuns(tx, id))
      throw new Refusal("conflict", "Practice runs have used this scenario, so it stays as they saw it. Copy it to make a changed one.", {
        code: "locked",
      });
    const content = await versionContent(ctx, s.versionId, tx);
    const check = checkedOn(content.tree, input.fault, input.world);
    await tx
      .update(trainingScenarios)
      .set({
        name: input.name,
        complaint: input.complaint,
        unitText: input.unitText,
        ...check.row,
        updatedAt: new Date(),
      })
      .where(eq(trainingScenarios.id, id));
    return { id, ok: check.ok };
  });
}

/**
 * Copies a scenario onto its tree's newest published version (the steps that are still there keep
 * their script) and checks it there. The copy takes the original's place: the original takes no
 * new assignments, and runs already taken keep it.
 */
export async function copyScenario(ctx: Ctx, id: string): Promise<{ id: string; ok: boolean }> {
  authorize(ctx, "training.write");
  return writeTx(async (tx) => {
    const s = (await scenarioRow(ctx, id, tx, true)) ?? notFound("That scenario");
    if (s.retiredAt) throw new Refusal("conflict", "This scenario has already been copied onto a newer version.", { code: "retired" });
    const v = await currentPublished(ctx, s.treeId, tx);
    if (!v) throw new Refusal("conflict", "The tree has no published version now.", { code: "unpublished" });
    if (v.id === s.versionId)
      throw new Refusal("conflict", "This scenario is on the newest published version already.", { code: "newest" });
    const content = await versionContent(ctx, v.id, tx);
    const check = checkedOn(content.tree, s.faultNode, s.world);
    const copy = crypto.randomUUID();
    const now = new Date();
    await tx.insert(trainingScenarios).values({
      id: copy,
      shopId: ctx.shopId,
      treeId: s.treeId,
      versionId: v.id,
      name: s.name,
      complaint: s.complaint,
      unitText: s.unitText,
      ...check.row,
      copiedFrom: s.id,
      createdBy: ctx.userId,
      createdAt: now,
      updatedAt: now,
    });
    await tx.update(trainingScenarios).set({ retiredAt: now, updatedAt: now }).where(eq(trainingScenarios.id, s.id));
    return { id: copy, ok: check.ok };
  });
}

/** One scenario with its check (run again now), its reference walk, its assignments, and the technicians it can go to. */
export async function getScenario(ctx: Ctx, id: string) {
  authorize(ctx, "training.write");
  const s = (await scenarioRow(ctx, id)) ?? notFound("That scenario");
  const content = await versionContent(ctx, s.versionId);
  const check = checkScript(content.tree, scriptOf(s));
  const trainee = users;
  const [newest, assignments, technicians, used, timeZone] = await Promise.all([
    currentPublished(ctx, s.treeId),
    db()
      .select({
        id: trainingAssignments.id,
        trainee: trainee.name,
        traineeId: trainingAssignments.traineeId,
        dueOn: trainingAssignments.dueOn,
        createdAt: trainingAssignments.createdAt,
        withdrawnAt: trainingAssignments.withdrawnAt,
        runId: trainingAssignments.runId,
        runStatus: runs.status,
        completedAt: runs.completedAt,
        endNode: runs.endNode,
        reviewedAt: trainingReviews.reviewedAt,
      })
      .from(trainingAssignments)
      .innerJoin(trainee, eq(trainee.id, trainingAssignments.traineeId))
      .leftJoin(runs, eq(runs.id, trainingAssignments.runId))
      .leftJoin(trainingReviews, eq(trainingReviews.runId, trainingAssignments.runId))
      .where(and(eq(trainingAssignments.shopId, ctx.shopId), eq(trainingAssignments.scenarioId, id)))
      .orderBy(desc(trainingAssignments.createdAt)),
    techniciansOf(ctx),
    db()
      .select({ n: count() })
      .from(runs)
      .where(and(eq(runs.shopId, ctx.shopId), eq(runs.scenarioId, id))),
    shopTimeZone(ctx),
  ]);
  return {
    scenario: {
      id: s.id,
      name: s.name,
      complaint: s.complaint,
      unitText: s.unitText,
      fault: s.faultNode,
      faultTitle: nodeOf(content.tree, s.faultNode)?.title ?? s.faultNode,
      world: s.world,
      treeId: s.treeId,
      versionId: s.versionId,
      versionNumber: content.number,
      treeTitle: content.title,
      copiedFrom: s.copiedFrom,
      retiredAt: s.retiredAt,
      createdAt: s.createdAt,
      updatedAt: s.updatedAt,
    },
    tree: content.tree,
    check,
    newer: newest && newest.id !== s.versionId ? { number: newest.number } : null,
    locked: (used[0]?.n ?? 0) > 0,
    assignments: assignments.map((a) => ({
      ...a,
      state: assignmentState(a),
      rightFault: a.runStatus === "done" ? a.endNode === s.faultNode : null,
    })),
    technicians,
    timeZone,
  };
}

/** The shop's technicians, who take practice. */
async function techniciansOf(ctx: Ctx) {
  return db()
    .select({ id: users.id, name: users.name })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.shopId, ctx.shopId), eq(memberships.role, "technician")))
    .orderBy(asc(users.name));
}

/** The shop's scenarios in use (not replaced by a copy), newest first, with counts of assignments. */
export async function listScenarios(ctx: Ctx) {
  authorize(ctx, "training.summary");
  const rows = await db()
    .select({
      id: trainingScenarios.id,
      name: trainingScenarios.name,
      checkStatus: trainingScenarios.checkStatus,
      findings: trainingScenarios.findings,
      versionId: trainingScenarios.versionId,
      treeTitle: treeVersions.title,
      versionNumber: treeVersions.number,
      updatedAt: trainingScenarios.updatedAt,
    })
    .from(trainingScenarios)
    .innerJoin(treeVersions, eq(treeVersions.id, trainingScenarios.versionId))
    .where(and(eq(trainingScenarios.shopId, ctx.shopId), isNull(trainingScenarios.retiredAt)))
    .orderBy(desc(trainingScenarios.updatedAt));
  const ids = rows.map((r) => r.id);
  const counts = ids.length
    ? await db()
        .select({ scenarioId: trainingAssignments.scenarioId, n: count() })
        .from(trainingAssignments)
        .where(and(inArray(trainingAssignments.scenarioId, ids), isNull(trainingAssignments.withdrawnAt)))
        .groupBy(trainingAssignments.scenarioId)
    : [];
  const byId = new Map(counts.map((c) => [c.scenarioId, c.n]));
  return rows.map(({ findings, ...r }) => ({
    ...r,
    errors: findings.filter((f) => f.severity === "error").length,
    assigned: byId.get(r.id) ?? 0,
  }));
}
