// Trees and their versions. Published and retired versions never change their content: every
// content write below goes through a draft, and the guard refuses the rest. The one change a
// published version may take is its retirement (published → retired), in retireVersion.
import { and, asc, desc, eq, inArray, max } from "drizzle-orm";
import { shops, treeBranches, treeImages, treeNodes, trees, treeVersions, users, type VersionState } from "../../db/schema";
import { errorsOf, validateTree } from "../engine/validate";
import { parseTree, type ParseError } from "../engine/markdown/parse";
import { serializeTree } from "../engine/markdown/serialize";
import type { EquipmentCategory, Finding, Tree } from "../engine/types";
import type { Ctx } from "../lib/context";
import { db, writeTx, type Db, type Tx } from "../lib/db.server";
import { checkImage, getObject, objectKey, putObject } from "../lib/storage.server";
import { diffTrees } from "./tree-diff";
import { rowsToTree, treeToRows } from "./tree-rows";


/** Where the editor's canvas shows each node, by node id. */
export type Layout = Record<string, { x: number; y: number }>;

export class VersionLockedError extends Error {
  constructor(public readonly state: VersionState) {
    super(`A ${state} version never changes. Start a new draft from it instead.`);
  }
}

/** The guard every write to a version's content goes through. */
export function assertDraft(version: { state: VersionState }): void {
  if (version.state !== "draft") throw new VersionLockedError(version.state);
}

async function writeContent(tx: Tx, shopId: string, versionId: string, tree: Tree, layout: Layout = {}) {
  const { nodes, branches } = treeToRows(tree);
  if (nodes.length) {
    await tx.insert(treeNodes).values(nodes.map((n) => ({ ...n, versionId, shopId, x: layout[n.nodeKey]?.x ?? null, y: layout[n.nodeKey]?.y ?? null })));
  }
  if (branches.length) await tx.insert(treeBranches).values(branches.map((b) => ({ ...b, versionId, shopId })));
}

async function readContent(tx: Tx | Db, version: typeof treeVersions.$inferSelect): Promise<{ tree: Tree; layout: Layout }> {
  const [nodes, branches] = await Promise.all([
    tx.select().from(treeNodes).where(eq(treeNodes.versionId, version.id)).orderBy(asc(treeNodes.position)),
    tx.select().from(treeBranches).where(eq(treeBranches.versionId, version.id)).orderBy(asc(treeBranches.fromKey), asc(treeBranches.position)),
  ]);
  const tree = rowsToTree(
    { title: version.title, category: version.category, symptom: version.symptom, equipment: version.equipment ?? undefined, description: version.description ?? undefined, start: version.startKey },
    nodes,
    branches,
  );
  const layout: Layout = {};
  for (const n of nodes) if (n.x !== null && n.y !== null) layout[n.nodeKey] = { x: n.x, y: n.y };
  return { tree, layout };
}

function versionColumns(tree: Tree) {
  const { version } = treeToRows(tree);
  return {
    title: version.title,
    category: version.category,
    symptom: version.symptom,
    equipment: version.equipment ?? null,
    description: version.description ?? null,
    startKey: version.start,
  };
}

type VersionInsert = typeof treeVersions.$inferInsert;

/** Inserts a version of `treeId` with its content; `fields` say what kind (draft or published). */
async function insertVersion(tx: Tx, ctx: Ctx, treeId: string, content: Tree, fields: Partial<VersionInsert> & Pick<VersionInsert, "state">, layout: Layout = {}) {
  const id = fields.id ?? crypto.randomUUID();
  await tx.insert(treeVersions).values({
    treeId,
    shopId: ctx.shopId,
    ...versionColumns(content),
    authorId: ctx.userId,
    updatedBy: ctx.userId,
    updatedAt: new Date(),
    ...fields,
    id,
  });
  await writeContent(tx, ctx.shopId, id, content, layout);
  return id;
}

/** A new open draft of `treeId` (the unique index refuses a second one). */
function insertDraft(tx: Tx, ctx: Ctx, treeId: string, content: Tree, basedOnId: string | null, layout: Layout = {}) {
  return insertVersion(tx, ctx, treeId, content, { state: "draft", number: null, basedOnId, openDraftOf: treeId }, layout);
}

async function insertTree(tx: Tx, ctx: Ctx, tree: Tree, id: string = crypto.randomUUID()) {
  await tx.insert(trees).values({ id, shopId: ctx.shopId, title: tree.title, category: tree.category, symptom: tree.symptom, createdBy: ctx.userId, updatedAt: new Date() });
  return id;
}

async function lockTree(tx: Tx, ctx: Ctx, treeId: string) {
  const [row] = await tx
    .select()
    .from(trees)
    .where(and(eq(trees.id, treeId), eq(trees.shopId, ctx.shopId)))
    .for("update");
  return row ?? null;
}

// --- creating -----------------------------------------------------------------------------------

/**
 * Creates a tree with its first version published (the seed's starter trees). Returns the ids.
 */
export async function createPublishedTree(ctx: Ctx, tree: Tree, changeNote: string, ids: { treeId?: string; versionId?: string } = {}) {
  return writeTx(async (tx) => {
    const treeId = await insertTree(tx, ctx, tree, ids.treeId);
    const now = new Date();
    const versionId = await insertVersion(tx, ctx, treeId, tree, { id: ids.versionId, state: "published", number: 1, changeNote, publishedBy: ctx.userId, publishedAt: now, updatedAt: now });
    return { treeId, versionId };
  });
}

/** What a new tree starts from: its identity and no steps yet (the editor adds the first). */
export function emptyTree(fields: Pick<Tree, "title" | "category" | "symptom">): Tree {
  return { ...fields, start: "start", nodes: [] };
}

/** A new tree whose only version is a draft (a tree made in the editor, or an imported file). */
export async function createDraftTree(ctx: Ctx, tree: Tree, layout: Layout = {}) {
  return writeTx(async (tx) => {
    const treeId = await insertTree(tx, ctx, tree);
    const versionId = await insertDraft(tx, ctx, treeId, tree, null, layout);
    return { treeId, versionId };
  });
}

export type StartDraft =
  | { ok: true; versionId: string; existing: boolean }
  | { ok: false; reason: "not-found" };

/**
 * Opens the tree's draft: the one already open, or a new one copied from version `fromNumber`
 * (default: the newest numbered version). Published versions are copied, never touched.
 */
export async function startDraft(ctx: Ctx, treeId: string, fromNumber?: number): Promise<StartDraft> {
  return writeTx(async (tx) => {
    const tree = await lockTree(tx, ctx, treeId);
    if (!tree) return { ok: false, reason: "not-found" };
    const versions = await tx.select().from(treeVersions).where(and(eq(treeVersions.treeId, treeId), eq(treeVersions.shopId, ctx.shopId)));
    const open = versions.find((v) => v.state === "draft");
    if (open) return { ok: true, versionId: open.id, existing: true };
    const numbered = versions.filter((v) => v.number !== null).sort((a, z) => z.number! - a.number!);
    const from = fromNumber === undefined ? numbered[0] : numbered.find((v) => v.number === fromNumber);
    if (!from) return { ok: false, reason: "not-found" };
    const { tree: content, layout } = await readContent(tx, from);
    const versionId = await insertDraft(tx, ctx, treeId, content, from.id, layout);
    await tx.update(trees).set({ updatedAt: new Date() }).where(eq(trees.id, treeId));
    return { ok: true, versionId, existing: false };
  });
}

// --- reading ------------------------------------------------------------------------------------

export async function getVersionRow(ctx: Ctx, versionId: string) {
  const [row] = await db()
    .select()
    .from(treeVersions)
    .where(and(eq(treeVersions.id, versionId), eq(treeVersions.shopId, ctx.shopId)))
    .limit(1);
  return row ?? null;
}

/** A version with its content as the engine's Tree, or null (unknown, or another shop's). */
export async function loadVersion(ctx: Ctx, versionId: string) {
  const version = await getVersionRow(ctx, versionId);
  if (!version) return null;
  return { version, ...(await readContent(db(), version)) };
}

/** "draft" or a version number, as the routes and the API name a version. */
export type VersionRef = number | "draft";

/** The tree's open draft or its version number `n`, with content; null when there is none. */
export async function loadTreeVersion(ctx: Ctx, treeId: string, ref: VersionRef) {
  const [version] = await db()
    .select()
    .from(treeVersions)
    .where(and(eq(treeVersions.treeId, treeId), eq(treeVersions.shopId, ctx.shopId), ref === "draft" ? eq(treeVersions.state, "draft") : eq(treeVersions.number, ref)))
    .limit(1);
  if (!version) return null;
  return { version, ...(await readContent(db(), version)) };
}

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

async function summaries(ctx: Ctx, treeIds: string[]): Promise<(VersionSummary & { treeId: string; category: EquipmentCategory; symptom: string; equipment: string | null })[]> {
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

/** The tree's identity and all its versions (oldest first, the open draft last), or null. */
export async function getTree(ctx: Ctx, treeId: string) {
  const [tree] = await db()
    .select()
    .from(trees)
    .where(and(eq(trees.id, treeId), eq(trees.shopId, ctx.shopId)))
    .limit(1);
  if (!tree) return null;
  const versions = await summaries(ctx, [treeId]);
  return { tree, versions, ...standing(versions) };
}

/** Which version new runs start on (the newest published one), and the open draft. */
function standing<V extends { state: VersionState; number: number | null }>(versions: V[]) {
  const live = versions.filter((v) => v.state === "published").sort((a, z) => z.number! - a.number!);
  return { current: live[0] ?? null, draft: versions.find((v) => v.state === "draft") ?? null };
}

// --- the library --------------------------------------------------------------------------------

export const LIBRARY_STATES = ["published", "draft", "retired"] as const;
export const LIBRARY_SORTS = ["title", "category", "symptom", "changed", "version"] as const;
export type LibraryQuery = {
  search?: string;
  category?: EquipmentCategory;
  /** published: new runs can start on it; draft: has an open draft; retired: every version retired. */
  state?: (typeof LIBRARY_STATES)[number];
  sort?: (typeof LIBRARY_SORTS)[number];
  dir?: "asc" | "desc";
};

export type LibraryRow = {
  treeId: string;
  title: string;
  category: EquipmentCategory;
  symptom: string;
  equipment: string | null;
  /** The version new runs start on, or null (never published, or all retired). */
  current: { number: number; versionId: string; publishedAt: Date | null } | null;
  draft: { versionId: string; updatedAt: Date; revision: number } | null;
  retired: boolean;
  lastChange: Date;
  /** Who made the last change (saved the draft, or published). */
  lastAuthor: string;
  versions: number;
};

/**
 * The shop's trees for the library table. Each row shows the current published version's title,
 * category and symptom (or the draft's, for a tree never published). Filtered and sorted here:
 * a shop has tens to hundreds of trees, read in one query.
 */
export async function listLibrary(ctx: Ctx, q: LibraryQuery = {}): Promise<LibraryRow[]> {
  const ids = (await db().select({ id: trees.id }).from(trees).where(eq(trees.shopId, ctx.shopId))).map((r) => r.id);
  const all = await summaries(ctx, ids);
  const byTree = new Map<string, typeof all>();
  for (const v of all) byTree.set(v.treeId, [...(byTree.get(v.treeId) ?? []), v]);
  const rows: LibraryRow[] = [];
  for (const [treeId, versions] of byTree) {
    const { current, draft } = standing(versions);
    const numbered = versions.filter((v) => v.number !== null).sort((a, z) => z.number! - a.number!);
    const shown = current ?? numbered[0] ?? draft!;
    const latest = [...versions].sort((a, z) => z.updatedAt.getTime() - a.updatedAt.getTime())[0]!;
    const lastChange = new Date(Math.max(...versions.map((v) => Math.max(v.updatedAt.getTime(), v.retiredAt?.getTime() ?? 0))));
    rows.push({
      treeId,
      title: shown.title,
      category: shown.category,
      symptom: shown.symptom,
      equipment: shown.equipment,
      current: current ? { number: current.number!, versionId: current.id, publishedAt: current.publishedAt } : null,
      draft: draft ? { versionId: draft.id, updatedAt: draft.updatedAt, revision: draft.revision } : null,
      retired: !current && numbered.length > 0,
      lastChange,
      lastAuthor: latest.updatedByName ?? latest.authorName,
      versions: numbered.length,
    });
  }
  const needle = q.search?.trim().toLowerCase();
  // A tree never published is the authors' business: technicians and trainers don't see it.
  const authoring = ctx.role === "lead" || ctx.role === "owner";
  const kept = rows.filter(
    (r) =>
      (authoring || r.versions > 0) &&
      (!needle || [r.title, r.symptom, r.equipment ?? "", r.category].some((s) => s.toLowerCase().includes(needle))) &&
      (!q.category || r.category === q.category) &&
      (!q.state || (q.state === "published" ? r.current !== null : q.state === "draft" ? r.draft !== null : r.retired)),
  );
  const sort = q.sort ?? "title";
  const sign = (q.dir ?? (sort === "changed" ? "desc" : "asc")) === "asc" ? 1 : -1;
  const key = (r: LibraryRow): string | number =>
    sort === "changed" ? r.lastChange.getTime() : sort === "version" ? (r.current?.number ?? 0) : r[sort].toLowerCase();
  return kept.sort((a, z) => {
    const x = key(a);
    const y = key(z);
    return (x < y ? -1 : x > y ? 1 : a.title.localeCompare(z.title)) * sign;
  });
}

export type PublishedTreeSummary = {
  treeId: string;
  versionId: string;
  number: number;
  title: string;
  category: EquipmentCategory;
  symptom: string;
  publishedAt: Date | null;
};

/** The current published version of each of the shop's trees (retired ones excluded). */
export async function listPublished(ctx: Ctx, filter: { category?: EquipmentCategory } = {}): Promise<PublishedTreeSummary[]> {
  const latest = db()
    .select({ treeId: treeVersions.treeId, n: max(treeVersions.number).as("n") })
    .from(treeVersions)
    .where(and(eq(treeVersions.shopId, ctx.shopId), eq(treeVersions.state, "published")))
    .groupBy(treeVersions.treeId)
    .as("latest");
  const rows = await db()
    .select({
      treeId: treeVersions.treeId,
      versionId: treeVersions.id,
      number: treeVersions.number,
      title: treeVersions.title,
      category: treeVersions.category,
      symptom: treeVersions.symptom,
      publishedAt: treeVersions.publishedAt,
    })
    .from(treeVersions)
    .innerJoin(latest, and(eq(latest.treeId, treeVersions.treeId), eq(latest.n, treeVersions.number)))
    .where(and(eq(treeVersions.shopId, ctx.shopId), filter.category ? eq(treeVersions.category, filter.category) : undefined))
    .orderBy(asc(treeVersions.title));
  return rows.map((r) => ({ ...r, number: r.number ?? 0 }));
}

export async function treeIdsOf(ctx: Ctx): Promise<string[]> {
  const rows = await db().select({ id: trees.id }).from(trees).where(eq(trees.shopId, ctx.shopId)).orderBy(desc(trees.updatedAt));
  return rows.map((r) => r.id);
}

export async function versionsOfTrees(ctx: Ctx, treeIds: string[]) {
  if (!treeIds.length) return [];
  return db()
    .select()
    .from(treeVersions)
    .where(and(eq(treeVersions.shopId, ctx.shopId), inArray(treeVersions.treeId, treeIds)))
    .orderBy(asc(treeVersions.treeId), asc(treeVersions.number));
}

// --- saving, publishing, retiring ---------------------------------------------------------------

export type SaveResult =
  | { ok: true; revision: number; updatedAt: Date }
  | { ok: false; reason: "not-found" }
  | { ok: false; reason: "conflict"; revision: number; updatedByName: string | null; updatedAt: Date };

/**
 * Replaces a draft's content (the editor's autosave). Optimistic concurrency: the save names the
 * revision it was based on; if another save came first, nothing is written and the caller gets
 * the newer revision and who saved it. Refused (VersionLockedError) for published and retired versions.
 */
export async function replaceDraftContent(ctx: Ctx, versionId: string, tree: Tree, expectedRevision: number, layout: Layout = {}): Promise<SaveResult> {
  return writeTx(async (tx) => {
    const [version] = await tx
      .select()
      .from(treeVersions)
      .where(and(eq(treeVersions.id, versionId), eq(treeVersions.shopId, ctx.shopId)))
      .for("update");
    if (!version) return { ok: false, reason: "not-found" };
    assertDraft(version);
    if (version.revision !== expectedRevision) {
      const [who] = version.updatedBy ? await tx.select({ name: users.name }).from(users).where(eq(users.id, version.updatedBy)) : [];
      return { ok: false, reason: "conflict", revision: version.revision, updatedByName: who?.name ?? null, updatedAt: version.updatedAt };
    }
    await tx.delete(treeBranches).where(eq(treeBranches.versionId, versionId));
    await tx.delete(treeNodes).where(eq(treeNodes.versionId, versionId));
    await writeContent(tx, ctx.shopId, versionId, tree, layout);
    const now = new Date();
    await tx
      .update(treeVersions)
      .set({ ...versionColumns(tree), revision: version.revision + 1, updatedAt: now, updatedBy: ctx.userId })
      .where(eq(treeVersions.id, versionId));
    await tx.update(trees).set({ updatedAt: now }).where(eq(trees.id, version.treeId));
    return { ok: true, revision: version.revision + 1, updatedAt: now };
  });
}

/**
 * True when the draft says exactly what the published version it started from says: publishing
 * it would only repeat that version. (A draft of a retired version may be published unchanged:
 * that is how a retired procedure comes back.)
 */
async function repeatsItsBase(tx: Tx | Db, draft: typeof treeVersions.$inferSelect, content: Tree): Promise<number | null> {
  if (!draft.basedOnId) return null;
  const [base] = await tx.select().from(treeVersions).where(eq(treeVersions.id, draft.basedOnId)).limit(1);
  if (!base || base.state !== "published") return null;
  return diffTrees((await readContent(tx, base)).tree, content).same ? base.number : null;
}

/** The tree's draft judged by the engine, as the publish gate sees it. */
export async function validateDraft(ctx: Ctx, treeId: string) {
  const draft = await loadTreeVersion(ctx, treeId, "draft");
  if (!draft) return null;
  const sameAs = await repeatsItsBase(db(), draft.version, draft.tree);
  return { versionId: draft.version.id, revision: draft.version.revision, sameAs, ...validateTree(draft.tree) };
}

export type PublishResult =
  | { ok: true; number: number; versionId: string }
  | { ok: false; reason: "not-found" | "no-draft" | "no-note" }
  | { ok: false; reason: "conflict"; revision: number }
  | { ok: false; reason: "unchanged"; sameAs: number }
  | { ok: false; reason: "invalid"; findings: Finding[] };

/**
 * Publishes the tree's open draft as its next version number, with a change note. Refused when
 * the draft moved on since the caller saw it (`expectedRevision`), when the engine finds any
 * error in it, or when it only repeats the published version it started from. From then on the
 * version never changes.
 */
export async function publishDraft(ctx: Ctx, treeId: string, expectedRevision: number, changeNote: string): Promise<PublishResult> {
  const note = changeNote.trim();
  if (!note) return { ok: false, reason: "no-note" };
  return writeTx(async (tx) => {
    const tree = await lockTree(tx, ctx, treeId);
    if (!tree) return { ok: false, reason: "not-found" };
    const [draft] = await tx
      .select()
      .from(treeVersions)
      .where(and(eq(treeVersions.treeId, treeId), eq(treeVersions.state, "draft")))
      .for("update");
    if (!draft) return { ok: false, reason: "no-draft" };
    assertDraft(draft);
    if (draft.revision !== expectedRevision) return { ok: false, reason: "conflict", revision: draft.revision };
    const { tree: content } = await readContent(tx, draft);
    const errors = errorsOf(validateTree(content).findings);
    if (errors.length) return { ok: false, reason: "invalid", findings: errors };
    const sameAs = await repeatsItsBase(tx, draft, content);
    if (sameAs !== null) return { ok: false, reason: "unchanged", sameAs };
    const [top] = await tx.select({ n: max(treeVersions.number) }).from(treeVersions).where(eq(treeVersions.treeId, treeId));
    const number = (top?.n ?? 0) + 1;
    const now = new Date();
    await tx
      .update(treeVersions)
      .set({ state: "published", number, changeNote: note.slice(0, 500), publishedAt: now, publishedBy: ctx.userId, openDraftOf: null, updatedAt: now })
      .where(eq(treeVersions.id, draft.id));
    await tx.update(trees).set({ title: content.title, category: content.category, symptom: content.symptom, updatedAt: now }).where(eq(trees.id, treeId));
    return { ok: true, number, versionId: draft.id };
  });
}

export type RetireResult = { ok: true } | { ok: false; reason: "not-found" | "not-published" };

/**
 * Retires a published version: new runs can't start on it; runs that used it keep it (the rows
 * stay, untouched). The only state change a published version can take.
 */
export async function retireVersion(ctx: Ctx, treeId: string, number: number): Promise<RetireResult> {
  return writeTx(async (tx) => {
    const tree = await lockTree(tx, ctx, treeId);
    if (!tree) return { ok: false, reason: "not-found" };
    const [v] = await tx
      .select()
      .from(treeVersions)
      .where(and(eq(treeVersions.treeId, treeId), eq(treeVersions.number, number)))
      .for("update");
    if (!v) return { ok: false, reason: "not-found" };
    if (v.state !== "published") return { ok: false, reason: "not-published" };
    const now = new Date();
    await tx.update(treeVersions).set({ state: "retired", retiredAt: now }).where(and(eq(treeVersions.id, v.id), eq(treeVersions.state, "published")));
    await tx.update(trees).set({ updatedAt: now }).where(eq(trees.id, treeId));
    return { ok: true };
  });
}

export type DiscardResult = { ok: true; treeDeleted: boolean } | { ok: false; reason: "not-found" };

/** Throws away the tree's open draft. A tree that never had a published version goes with it. */
export async function discardDraft(ctx: Ctx, treeId: string): Promise<DiscardResult> {
  return writeTx(async (tx) => {
    const tree = await lockTree(tx, ctx, treeId);
    if (!tree) return { ok: false, reason: "not-found" };
    const versions = await tx.select().from(treeVersions).where(eq(treeVersions.treeId, treeId));
    const draft = versions.find((v) => v.state === "draft");
    if (!draft) return { ok: false, reason: "not-found" };
    assertDraft(draft);
    await tx.delete(treeBranches).where(eq(treeBranches.versionId, draft.id));
    await tx.delete(treeNodes).where(eq(treeNodes.versionId, draft.id));
    await tx.delete(treeVersions).where(and(eq(treeVersions.id, draft.id), eq(treeVersions.state, "draft")));
    const treeDeleted = versions.length === 1;
    if (treeDeleted) {
      await tx.delete(treeImages).where(eq(treeImages.treeId, treeId));
      await tx.delete(trees).where(eq(trees.id, treeId));
    }
    return { ok: true, treeDeleted };
  });
}

// --- diff, import, export -----------------------------------------------------------------------

/** The difference between two versions of a tree (numbers, or "draft"), or null if either is missing. */
export async function diffVersions(ctx: Ctx, treeId: string, from: VersionRef, to: VersionRef) {
  const [a, b] = await Promise.all([loadTreeVersion(ctx, treeId, from), loadTreeVersion(ctx, treeId, to)]);
  if (!a || !b) return null;
  return { from: a.version.number ?? ("draft" as const), to: b.version.number ?? ("draft" as const), diff: diffTrees(a.tree, b.tree) };
}

export type ImportResult =
  | { ok: true; treeId: string; versionId: string }
  | { ok: false; reason: "parse"; errors: ParseError[] }
  | { ok: false; reason: "not-found" }
  | { ok: false; reason: "draft-open" };

/**
 * A tree file (the engine's Markdown format) becomes a draft: of a new tree, or of the tree
 * `intoTreeId` (which must have no open draft). A file that doesn't parse saves nothing.
 * Validation findings don't block an import; they block publishing, as for any draft.
 */
export async function importTree(ctx: Ctx, source: string, intoTreeId?: string): Promise<ImportResult> {
  const parsed = parseTree(source);
  if (!parsed.ok) return { ok: false, reason: "parse", errors: parsed.errors };
  if (!intoTreeId) return { ok: true, ...(await createDraftTree(ctx, parsed.tree)) };
  return writeTx(async (tx) => {
    const tree = await lockTree(tx, ctx, intoTreeId);
    if (!tree) return { ok: false, reason: "not-found" };
    const versions = await tx.select().from(treeVersions).where(eq(treeVersions.treeId, intoTreeId));
    if (versions.some((v) => v.state === "draft")) return { ok: false, reason: "draft-open" };
    const latest = versions.filter((v) => v.number !== null).sort((a, z) => z.number! - a.number!)[0];
    const versionId = await insertDraft(tx, ctx, intoTreeId, parsed.tree, latest?.id ?? null);
    await tx.update(trees).set({ updatedAt: new Date() }).where(eq(trees.id, intoTreeId));
    return { ok: true, treeId: intoTreeId, versionId };
  });
}

/** A version as a tree file in the engine's canonical form, with a download name. */
export async function exportVersion(ctx: Ctx, treeId: string, ref: VersionRef) {
  const v = await loadTreeVersion(ctx, treeId, ref);
  if (!v) return null;
  const slug =
    v.tree.title
      .toLowerCase()
      .normalize("NFKD")
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-+|-+$/g, "")
      .slice(0, 60) || "tree";
  return { filename: `${slug}-${ref === "draft" ? "draft" : `v${ref}`}.md`, text: serializeTree(v.tree) };
}

// --- images -------------------------------------------------------------------------------------

export type ImageUpload =
  | { ok: true; id: string; url: string; filename: string }
  | { ok: false; status: 400 | 404 | 413 | 415; message: string };

export function treeImageUrl(treeId: string, imageId: string): string {
  return `/trees/${treeId}/images/${imageId}`;
}

/** Stores an image for a tree's step bodies: checked by content, kept under a server-made key. */
export async function addTreeImage(ctx: Ctx, treeId: string, bytes: Uint8Array, filename: string): Promise<ImageUpload> {
  const [tree] = await db()
    .select({ id: trees.id })
    .from(trees)
    .where(and(eq(trees.id, treeId), eq(trees.shopId, ctx.shopId)))
    .limit(1);
  if (!tree) return { ok: false, status: 404, message: "That tree was not found." };
  const check = await checkImage(bytes);
  if (!check.ok) return { ok: false, status: check.status, message: check.message };
  const key = objectKey(ctx.shopId, "tree-images", check.ext);
  await putObject(key, bytes, check.mime);
  const id = crypto.randomUUID();
  const name = filename.replace(/[^\w .()-]+/g, "_").slice(0, 200) || `image.${check.ext}`;
  await db().insert(treeImages).values({ id, shopId: ctx.shopId, treeId, objectKey: key, mime: check.mime, bytes: bytes.byteLength, filename: name, createdBy: ctx.userId });
  return { ok: true, id, url: treeImageUrl(treeId, id), filename: name };
}

/** An image of one of the shop's trees, with its bytes; null for unknown or another shop's. */
export async function getTreeImage(ctx: Ctx, treeId: string, imageId: string) {
  const [row] = await db()
    .select()
    .from(treeImages)
    .where(and(eq(treeImages.id, imageId), eq(treeImages.treeId, treeId), eq(treeImages.shopId, ctx.shopId)))
    .limit(1);
  if (!row) return null;
  const object = await getObject(row.objectKey);
  if (!object) return null;
  return { body: object.body, mime: row.mime, filename: row.filename };
}

/** The shop's time zone, for showing when versions changed. */
export async function shopTimeZone(ctx: Ctx): Promise<string> {
  const [row] = await db().select({ settings: shops.settings }).from(shops).where(eq(shops.id, ctx.shopId)).limit(1);
  return row?.settings.timeZone || "UTC";
}
