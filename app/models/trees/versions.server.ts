// Reading trees and their versions: one version's content, a tree with its version history, and the
// difference between two versions. Everyone reads published and retired versions; drafts are the
// authors' (leads and owners).
import { and, eq } from "drizzle-orm";
import { trees, treeVersions, type VersionState } from "../../../db/schema";
import type { Ctx } from "../../lib/context";
import { db } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { notFound } from "../../lib/refusal";
import { diffTrees } from "../../lib/tree-diff";
import type { VersionRef } from "../../lib/tree-library";
import { readContent, versionById, type VersionRow } from "./_content.server";
import { standing, summaries } from "./_summaries.server";

/** Reading a draft is for its authors; every other version is for everyone in the shop. */
function authorizeRead(ctx: Ctx, version: { state: VersionState } | VersionRef) {
  authorize(ctx, "trees.view");
  if (version === "draft" || (typeof version === "object" && version.state === "draft")) authorize(ctx, "trees.author");
}

/** A version by id with its content as the engine's Tree (runs name their version by id). */
export async function loadVersion(ctx: Ctx, versionId: string) {
  authorize(ctx, "trees.view");
  const found = (await versionById(ctx, versionId)) ?? notFound("That version");
  authorizeRead(ctx, found.version);
  return found;
}

async function treeVersionRow(ctx: Ctx, treeId: string, ref: VersionRef): Promise<VersionRow | null> {
  const [version] = await db()
    .select()
    .from(treeVersions)
    .where(and(eq(treeVersions.treeId, treeId), eq(treeVersions.shopId, ctx.shopId), ref === "draft" ? eq(treeVersions.state, "draft") : eq(treeVersions.number, ref)))
    .limit(1);
  return version ?? null;
}

/** The tree's open draft or its version number `n`, with content and canvas layout. */
export async function loadTreeVersion(ctx: Ctx, treeId: string, ref: VersionRef) {
  authorizeRead(ctx, ref);
  const version = (await treeVersionRow(ctx, treeId, ref)) ?? notFound("That version");
  return { version, ...(await readContent(db(), version)) };
}

/** The tree's identity and all its versions (oldest first, the open draft last). */
export async function getTree(ctx: Ctx, treeId: string) {
  authorize(ctx, "trees.view");
  const [tree] = await db()
    .select()
    .from(trees)
    .where(and(eq(trees.id, treeId), eq(trees.shopId, ctx.shopId)))
    .limit(1);
  if (!tree) notFound("That tree");
  const versions = await summaries(ctx, [treeId]);
  return { tree, versions, ...standing(versions) };
}

/** The difference between two versions of a tree (numbers, or "draft"). */
export async function diffVersions(ctx: Ctx, treeId: string, from: VersionRef, to: VersionRef) {
  authorizeRead(ctx, from);
  authorizeRead(ctx, to);
  const [a, b] = await Promise.all([treeVersionRow(ctx, treeId, from), treeVersionRow(ctx, treeId, to)]);
  if (!a || !b) notFound("One of those versions");
  const [ac, bc] = await Promise.all([readContent(db(), a), readContent(db(), b)]);
  return { from: a.number ?? ("draft" as const), to: b.number ?? ("draft" as const), diff: diffTrees(ac.tree, bc.tree) };
}
