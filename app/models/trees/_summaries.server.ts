// A tree's versions as lists (who wrote each, what it was based on) and which of them stands now.
// Used by the tree models only.
import { and, eq, inArray } from "drizzle-orm";
import { treeVersions, users, type VersionState } from "../../../db/schema";
import type { EquipmentCategory } from "../../engine/types";
import type { Ctx } from "../../lib/context";
import { db } from "../../lib/db.server";

export type VersionSummary = {
  id: string;
  number: number | null;
  state: VersionState;
  title: string;
  changeNote: string | null;
  revision: number;
  authorName: string;
  updatedByName: string | null;
  createdAt: Date;
  updatedAt: Date;
  publishedAt: Date | null;
  retiredAt: Date | null;
  basedOnNumber: number | null;
};

export type VersionListing = VersionSummary & { treeId: string; category: EquipmentCategory; symptom: string; equipment: string | null };

/** Every version of the given trees with who wrote it, oldest number first (drafts last). */
export async function summaries(ctx: Ctx, treeIds: string[]): Promise<VersionListing[]> {
  if (!treeIds.length) return [];
  const rows = await db()
    .select({ v: treeVersions, authorName: users.name })
    .from(treeVersions)
    .innerJoin(users, eq(users.id, treeVersions.authorId))
    .where(and(eq(treeVersions.shopId, ctx.shopId), inArray(treeVersions.treeId, treeIds)));
  const names = new Map<string, string>();
  const ids = [...new Set(rows.map((r) => r.v.updatedBy).filter((x): x is string => Boolean(x)))];
  if (ids.length) for (const u of await db().select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids))) names.set(u.id, u.name);
  const byId = new Map(rows.map((r) => [r.v.id, r.v]));
  return rows
    .map(({ v, authorName }) => ({
      id: v.id,
      treeId: v.treeId,
      number: v.number,
      state: v.state,
      title: v.title,
      category: v.category,
      symptom: v.symptom,
      equipment: v.equipment,
      changeNote: v.changeNote,
      revision: v.revision,
      authorName,
      updatedByName: v.updatedBy ? (names.get(v.updatedBy) ?? null) : null,
      createdAt: v.createdAt,
      updatedAt: v.updatedAt,
      publishedAt: v.publishedAt,
      retiredAt: v.retiredAt,
      basedOnNumber: v.basedOnId ? (byId.get(v.basedOnId)?.number ?? null) : null,
    }))
    .sort((a, z) => (a.number ?? Infinity) - (z.number ?? Infinity));
}

/** Which version new runs start on (the newest published one), and the open draft. */
export function standing<V extends { state: VersionState; number: number | null }>(versions: V[]) {
  const live = versions.filter((v) => v.state === "published").sort((a, z) => z.number! - a.number!);
  return { current: live[0] ?? null, draft: versions.find((v) => v.state === "draft") ?? null };
}

