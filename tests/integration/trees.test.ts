// Authoring on a real MariaDB: drafts, publishing, immutability of published versions, autosave
// conflicts, import/export, retire, diff, images, the library, and shop isolation on every route.
import { readFileSync } from "node:fs";
import { and, count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { treeBranches, treeNodes, trees, treeVersions } from "../../db/schema";
import { stableId } from "../../db/seed";
import { parseTree } from "../../app/engine/markdown/parse";
import { serializeTree } from "../../app/engine/markdown/serialize";
import type { Finding, Tree } from "../../app/engine/types";
import { validateTree } from "../../app/engine/validate";
import type { Ctx } from "../../app/lib/context";
import type { Refusal } from "../../app/lib/refusal";
import { closeDb, db } from "../../app/lib/db.server";
import { startRun } from "../../app/models/runs/start.server";
import { getRunView } from "../../app/models/runs/view.server";
import { assertDraft } from "../../app/models/trees/_content.server";
import { createDraftTree, discardDraft, replaceDraftContent, startDraft } from "../../app/models/trees/drafts.server";
import { addTreeImage } from "../../app/models/trees/images.server";
import { listLibrary, listPublished } from "../../app/models/trees/library.server";
import { publishDraft, retireVersion, validateDraft } from "../../app/models/trees/publish.server";
import { exportVersion, importTree } from "../../app/models/trees/transfer.server";
import { diffVersions, getTree, loadTreeVersion, loadVersion } from "../../app/models/trees/versions.server";
import * as apiTree from "../../app/routes/api.trees.$treeId";
import * as apiTreeDiff from "../../app/routes/api.trees.$treeId.diff";
import * as apiTreeDraft from "../../app/routes/api.trees.$treeId.draft";
import * as apiTreeImages from "../../app/routes/api.trees.$treeId.images";
import * as apiTrees from "../../app/routes/api.trees";
import * as apiTreeValidation from "../../app/routes/api.trees.$treeId.validation";
import * as apiTreeVersion from "../../app/routes/api.trees.$treeId.versions.$ref";
import * as treePage from "../../app/routes/trees.$treeId";
import * as treeDiffPage from "../../app/routes/trees.$treeId.diff";
import * as treeEdit from "../../app/routes/trees.$treeId.edit";
import * as treeExport from "../../app/routes/trees.$treeId.versions.$ref.export";
import * as treeImage from "../../app/routes/trees.$treeId.images.$imageId";
import * as treeImport from "../../app/routes/trees.import";
import * as treeNew from "../../app/routes/trees.new";
import * as treeVersionPage from "../../app/routes/trees.$treeId.versions.$ref";
import * as library from "../../app/routes/trees._index";
import { cookieFor, requestWith, routeArgs } from "../support/session";
import { smallTree as baseTree } from "../support/trees";

afterAll(() => closeDb());

const lead: Ctx = { shopId: stableId("shop:tinderbox"), userId: stableId("user:lead@tinderbox.example"), role: "lead" };
const owner: Ctx = { shopId: stableId("shop:tinderbox"), userId: stableId("user:owner@tinderbox.example"), role: "owner" };
const otherShop: Ctx = { shopId: stableId("shop:pellham"), userId: stableId("user:owner@pellham.example"), role: "owner" };

const fresh = () => `Fan hums, won't turn ${crypto.randomUUID().slice(0, 6)}`;
const smallTree = (title = fresh()) => baseTree(title);

async function publishedTree(ctx = lead, tree = smallTree()) {
  const { treeId, versionId } = await createDraftTree(ctx, tree);
  await publishDraft(ctx, treeId, 1, "First version");
  return { treeId, versionId, tree };
}

async function contentRows(versionId: string) {
  const [[n], [b], [v]] = await Promise.all([
    db().select({ n: count() }).from(treeNodes).where(eq(treeNodes.versionId, versionId)),
    db().select({ n: count() }).from(treeBranches).where(eq(treeBranches.versionId, versionId)),
    db().select().from(treeVersions).where(eq(treeVersions.id, versionId)),
  ]);
  return { nodes: n!.n, branches: b!.n, version: v! };
}

async function thrown(p: unknown): Promise<Response> {
  try {
    await p;
  } catch (e) {
    if (e instanceof Response) return e;
    throw e;
  }
  throw new Error("expected a thrown Response");
}

/** A route's answer, whether returned or thrown. */
async function answer(p: unknown): Promise<Response | unknown> {
  try {
    return await p;
  } catch (e) {
    return e;
  }
}

describe("drafts and publishing", () => {
  it("the small test tree is valid by the engine", () => {
    expect(validateTree(smallTree()).ok).toBe(true);
  });

  it("publishing turns the draft into version 1 with its change note; a published version is then refused every write", async () => {
    const { treeId, versionId } = await createDraftTree(lead, smallTree());
    const r = await publishDraft(lead, treeId, 1, "  First version for the deli rotisseries  ");
    expect(r).toEqual({ number: 1, versionId });
    const before = await contentRows(versionId);
    expect(before.version).toMatchObject({
      state: "published",
      number: 1,
      changeNote: "First version for the deli rotisseries",
      openDraftOf: null,
      publishedBy: lead.userId,
    });
    expect(before.nodes).toBe(4);

    expect(() => assertDraft(before.version)).toThrow(expect.objectContaining({ kind: "gone" }));
    const changed = { ...smallTree("Changed title"), nodes: [] };
    await expect(replaceDraftContent(lead, versionId, changed, before.version.revision)).rejects.toMatchObject({
      kind: "gone",
      status: 410,
    });
    const after = await contentRows(versionId);
    expect(after).toEqual(before);
  });

  it("the autosave API refuses to write into a published version (410) and changes nothing", async () => {
    const { treeId, versionId, tree } = await publishedTree();
    const before = await contentRows(versionId);
    const { cookie } = await cookieFor("lead@tinderbox.example");
    const res = (await apiTreeDraft.action(
      routeArgs(
        requestWith(cookie, `/api/trees/${treeId}/draft`, {
          method: "POST",
          headers: { origin: "http://localhost", "content-type": "application/json" },
          body: JSON.stringify({ versionId, revision: before.version.revision, tree: { ...tree, title: "Sneaky change" }, layout: {} }),
        }),
        { treeId },
      ),
    )) as Response;
    expect(res.status).toBe(410);
    expect(((await res.json()) as { error: string }).error).toMatch(/published/);
    expect(await contentRows(versionId)).toEqual(before);
  });

  it("editing a published tree starts a new draft copied from it; the published version stays as it was", async () => {
    const { treeId, versionId, tree } = await publishedTree();
    const d = await startDraft(lead, treeId);
    expect(d.existing).toBe(false);
    expect(d.versionId).not.toBe(versionId);
    const draft = await loadVersion(lead, d.versionId);
    expect(draft.tree).toEqual(tree);
    expect(draft.version).toMatchObject({ state: "draft", number: null, basedOnId: versionId, openDraftOf: treeId });
    // A second "edit" opens the same draft rather than making another.
    expect(await startDraft(lead, treeId)).toEqual({ versionId: d.versionId, existing: true });
    // Unchanged, it would only repeat version 1: the gate says so.
    expect((await validateDraft(lead, treeId)).sameAs).toBe(1);
    await expect(publishDraft(lead, treeId, 1, "Nothing new")).rejects.toMatchObject({
      kind: "conflict",
      code: "unchanged",
      details: { sameAs: 1 },
    });

    const edited: Tree = {
      ...tree,
      nodes: tree.nodes.map((n) => (n.id === "motor-failed" ? { ...n, title: "Failed fan motor windings" } : n)),
    };
    expect(await replaceDraftContent(lead, d.versionId, edited, 1)).toMatchObject({ revision: 2 });
    expect((await loadVersion(lead, versionId)).tree).toEqual(tree);
    const p = await publishDraft(lead, treeId, 2, "Name the windings");
    expect(p).toMatchObject({ number: 2 });
    const t = await getTree(lead, treeId);
    expect(t.current?.number).toBe(2);
    expect(t.draft).toBeNull();
    expect(t.versions.map((v) => [v.number, v.state])).toEqual([
      [1, "published"],
      [2, "published"],
    ]);
  });

  it("two editors clicking Edit at once still get one open draft", async () => {
    const { treeId } = await publishedTree();
    const [a, b] = await Promise.all([startDraft(lead, treeId), startDraft(owner, treeId)]);
    expect(a.versionId).toBe(b.versionId);
    expect([a.existing, b.existing].sort()).toEqual([false, true]);
    const [drafts] = await db()
      .select({ n: count() })
      .from(treeVersions)
      .where(and(eq(treeVersions.treeId, treeId), eq(treeVersions.state, "draft")));
    expect(drafts!.n).toBe(1);
  });

  it("publish is refused while the engine finds an error, and when the draft moved on since it was checked", async () => {
    const broken = smallTree();
    broken.nodes = broken.nodes.map((n) => (n.kind === "measurement" ? { ...n, branches: { within: { to: "motor-failed" } } } : n));
    expect(validateTree(broken).ok).toBe(false);
    const { treeId, versionId } = await createDraftTree(lead, broken);
    const r = await publishDraft(lead, treeId, 1, "Should not publish").then(
      () => null,
      (e: Refusal) => e,
    );
    expect(r).toMatchObject({ kind: "rejected", status: 422, code: "invalid" });
    const findings = r!.details!.findings as Finding[];
    expect(findings.some((f) => f.code === "missing-branch" && f.nodeId === "cap-measure")).toBe(true);
    expect((await contentRows(versionId)).version.state).toBe("draft");

    expect(await replaceDraftContent(lead, versionId, smallTree(broken.title), 1)).toMatchObject({ revision: 2 });
    await expect(publishDraft(lead, treeId, 1, "Stale")).rejects.toMatchObject({
      kind: "conflict",
      code: "stale",
      details: { revision: 2 },
    });
    await expect(publishDraft(lead, treeId, 2, "   ")).rejects.toMatchObject({
      kind: "invalid",
      fields: { changeNote: expect.any(String) },
    });
    expect(await publishDraft(lead, treeId, 2, "Fixed")).toMatchObject({ number: 1 });
  });

  it("the editor's publish action answers 422 with the errors, then redirects once they are fixed", async () => {
    const broken = smallTree();
    broken.nodes = broken.nodes.filter((n) => n.id !== "motor-failed");
    const { treeId, versionId } = await createDraftTree(lead, broken);
    const { cookie } = await cookieFor("lead@tinderbox.example");
    const post = (revision: number) =>
      treeEdit.action(
        routeArgs(
          requestWith(cookie, `/trees/${treeId}/edit`, {
            method: "POST",
            body: new URLSearchParams({ intent: "publish", revision: String(revision), changeNote: "First" }),
          }),
          { treeId },
        ),
      );
    const refused = (await post(1)) as unknown as {
      data: { message: string; details: { findings: { message: string }[] } };
      init: { status: number };
    };
    expect(refused.init.status).toBe(422);
    expect(refused.data.details.findings.some((f) => f.message.includes("motor-failed"))).toBe(true);
    await replaceDraftContent(lead, versionId, smallTree(broken.title), 1);
    const ok = (await answer(post(2))) as Response;
    expect(ok.status).toBe(302);
    expect(ok.headers.get("location")).toBe(`/trees/${treeId}?published=1`);
  });
});

describe("a new tree", () => {
  it("the form checks title and symptom with the engine's rules, then makes a tree whose only version is an empty draft", async () => {
    const { cookie } = await cookieFor("lead@tinderbox.example");
    const post = (fields: Record<string, string>) =>
      answer(treeNew.action(routeArgs(requestWith(cookie, "/trees/new", { method: "POST", body: new URLSearchParams(fields) }))));
    const bad = (await post({ title: "  ", category: "fryer", symptom: "Two\nlines" })) as {
      data: { errors: Record<string, string> };
      init: { status: number };
    };
    expect(bad.init.status).toBe(400);
    expect(bad.data.errors.title).toMatch(/Give the tree a title/);
    expect(bad.data.errors.symptom).toMatch(/one line/);
    const ok = (await post({ title: "Fryer won't light", category: "fryer", symptom: "The pilot won't stay lit" })) as Response;
    expect(ok.status).toBe(302);
    const treeId = /^\/trees\/([0-9a-f-]{36})\/edit$/.exec(ok.headers.get("location") ?? "")?.[1];
    expect(treeId).toBeDefined();
    const draft = await loadTreeVersion(lead, treeId!, "draft");
    expect(draft.tree).toEqual({
      title: "Fryer won't light",
      category: "fryer",
      symptom: "The pilot won't stay lit",
      start: "start",
      nodes: [],
    });
    expect((await getTree(lead, treeId!)).versions.map((v) => v.state)).toEqual(["draft"]);
    // A technician can't make one.
    const tech = (await cookieFor("tech@tinderbox.example")).cookie;
    const refused = (await answer(
      treeNew.action(
        routeArgs(
          requestWith(tech, "/trees/new", { method: "POST", body: new URLSearchParams({ title: "x", category: "fryer", symptom: "y" }) }),
        ),
      ),
    )) as Response;
    expect(refused.status).toBe(403);
  });
});

describe("autosave with optimistic concurrency", () => {
  it("two concurrent saves of one draft: one wins, the other gets the conflict and writes nothing", async () => {
    const { treeId, versionId } = await createDraftTree(lead, smallTree());
    const mine = smallTree("Version from the lead");
    const theirs = smallTree("Version from the owner");
    const [a, b] = await Promise.allSettled([
      replaceDraftContent(lead, versionId, mine, 1),
      replaceDraftContent(owner, versionId, theirs, 1),
    ]);
    const results = [a, b];
    const won = results.filter((r) => r.status === "fulfilled");
    const lost = results.filter((r) => r.status === "rejected");
    expect(won).toHaveLength(1);
    expect(lost).toHaveLength(1);
    expect(lost[0]).toMatchObject({ reason: { kind: "conflict", status: 409, details: { conflict: { revision: 2 } } } });
    const winnerTitle = a.status === "fulfilled" ? mine.title : theirs.title;
    const saved = await loadTreeVersion(lead, treeId, "draft");
    expect(saved.tree.title).toBe(winnerTitle);
    expect(saved.version.revision).toBe(2);
  });

  it("through the API: the stale save is a 409 naming who saved and the revision to build on; the draft holds the winner's content", async () => {
    const { treeId, versionId } = await createDraftTree(lead, smallTree());
    const leadCookie = (await cookieFor("lead@tinderbox.example")).cookie;
    const ownerCookie = (await cookieFor("owner@tinderbox.example")).cookie;
    const save = (cookie: string, title: string, revision: number) =>
      apiTreeDraft.action(
        routeArgs(
          requestWith(cookie, `/api/trees/${treeId}/draft`, {
            method: "POST",
            headers: { origin: "http://localhost", "content-type": "application/json" },
            body: JSON.stringify({ versionId, revision, tree: smallTree(title), layout: { "cap-look": { x: 10, y: 20 } } }),
          }),
          { treeId },
        ),
      ) as Promise<Response>;
    const first = await save(ownerCookie, "Saved first by the owner", 1);
    expect(first.status).toBe(200);
    expect(await first.json()).toMatchObject({ revision: 2 });
    const stale = await save(leadCookie, "Stale save by the lead", 1);
    expect(stale.status).toBe(409);
    const body = (await stale.json()) as { error: string; conflict: { revision: number; updatedByName: string } };
    expect(body.conflict).toMatchObject({ revision: 2, updatedByName: "Maren Holt" });
    expect(body.error).toMatch(/Nothing was saved/);
    const now = await loadTreeVersion(lead, treeId, "draft");
    expect(now?.tree.title).toBe("Saved first by the owner");
    expect(now?.layout).toEqual({ "cap-look": { x: 10, y: 20 } });
    // The lead re-applies on top of the newer revision, which is accepted.
    expect((await save(leadCookie, "Lead's changes re-applied", 2)).status).toBe(200);
  });

  it("the autosave API refuses cross-site requests, technicians, and trees the schema rejects", async () => {
    const { treeId, versionId } = await createDraftTree(lead, smallTree());
    const { cookie } = await cookieFor("lead@tinderbox.example");
    const tech = (await cookieFor("tech@tinderbox.example")).cookie;
    const body = (tree: unknown) => JSON.stringify({ versionId, revision: 1, tree, layout: {} });
    const post = (c: string, headers: Record<string, string>, b: string) =>
      answer(
        apiTreeDraft.action(
          routeArgs(
            requestWith(c, `/api/trees/${treeId}/draft`, {
              method: "POST",
              headers: { "content-type": "application/json", ...headers },
              body: b,
            }),
            { treeId },
          ),
        ),
      );
    expect(((await post(cookie, { origin: "https://elsewhere.example" }, body(smallTree()))) as Response).status).toBe(403);
    expect(((await post(tech, { origin: "http://localhost" }, body(smallTree()))) as Response).status).toBe(403);
    const bad = (await post(
      cookie,
      { origin: "http://localhost" },
      body({ ...smallTree(), nodes: [{ id: "Not An Id", kind: "step", title: "x" }] }),
    )) as Response;
    expect(bad.status).toBe(400);
    expect((await loadTreeVersion(lead, treeId, "draft"))?.version.revision).toBe(1);
  });
});

describe("retire, discard, diff", () => {
  it("a retired version can't start new runs but keeps its content; a draft can't be retired", async () => {
    const { treeId, versionId, tree } = await publishedTree();
    expect((await listPublished(lead)).some((p) => p.versionId === versionId)).toBe(true);
    await retireVersion(lead, treeId, 1);
    await expect(retireVersion(lead, treeId, 1)).rejects.toMatchObject({ kind: "conflict", code: "not-published" });
    expect((await listPublished(lead)).some((p) => p.treeId === treeId)).toBe(false);
    const v = await loadVersion(lead, versionId);
    expect(v.version.state).toBe("retired");
    expect(v.tree).toEqual(tree);
    expect((await getTree(lead, treeId)).current).toBeNull();
    await expect(replaceDraftContent(lead, versionId, tree, v.version.revision)).rejects.toMatchObject({ kind: "gone" });
    const row = (await listLibrary(lead, { state: "retired" })).find((r) => r.treeId === treeId);
    expect(row).toMatchObject({ retired: true, current: null });
    // Bringing it back: a draft of the retired version may be published as it is, as version 2.
    await startDraft(lead, treeId, 1);
    expect((await validateDraft(lead, treeId)).sameAs).toBeNull();
    expect(await publishDraft(lead, treeId, 1, "Back in use")).toMatchObject({ number: 2 });
    expect((await getTree(lead, treeId))?.current?.number).toBe(2);
  });

  it("retiring: a run already on the version keeps it; new runs start on the newest published version, or not at all", async () => {
    const tech: Ctx = { shopId: lead.shopId, userId: stableId("user:tech@tinderbox.example"), role: "technician" };
    const { treeId, versionId: v1 } = await publishedTree();
    const first = await startRun(tech, { treeId });
    expect(first.versionId).toBe(v1);
    const d = await startDraft(lead, treeId);
    const tree = (await loadVersion(lead, v1)).tree;
    await replaceDraftContent(lead, d.versionId, { ...tree, symptom: "The fan hums and does not turn, or turns slowly" }, 1);
    expect(await publishDraft(lead, treeId, 2, "Slow fans too")).toMatchObject({ number: 2 });
    await retireVersion(lead, treeId, 2);
    const second = await startRun(tech, { treeId });
    expect(second.versionId).toBe(v1); // version 2 retired: back to version 1
    await retireVersion(lead, treeId, 1);
    await expect(startRun(tech, { treeId })).rejects.toMatchObject({ kind: "conflict", code: "unpublished" });
    // The first run still has its version, now retired, unchanged.
    const view = await getRunView(tech, first.runId);
    expect(view.version).toMatchObject({ id: v1, number: 1 });
    expect(view.tree).toEqual(tree);
  });

  it("discarding a draft leaves the published versions; discarding a never-published tree removes it", async () => {
    const { treeId, versionId } = await publishedTree();
    await startDraft(lead, treeId);
    expect(await discardDraft(lead, treeId)).toEqual({ treeDeleted: false });
    expect((await loadVersion(lead, versionId)).version.state).toBe("published");
    await expect(discardDraft(lead, treeId)).rejects.toMatchObject({ kind: "not-found" });

    const fresh = await createDraftTree(lead, smallTree());
    expect(await discardDraft(lead, fresh.treeId)).toEqual({ treeDeleted: true });
    await expect(getTree(lead, fresh.treeId)).rejects.toMatchObject({ kind: "not-found" });
  });

  it("the diff names nodes added, removed and changed, with the changed fields as written in the tree file", async () => {
    const { treeId, tree } = await publishedTree();
    const d = await startDraft(lead, treeId);
    const next: Tree = {
      ...tree,
      symptom: "The fan hums and won't turn, or turns slowly",
      nodes: [
        ...tree.nodes
          .filter((n) => n.id !== "motor-failed")
          .map((n) =>
            n.kind === "measurement"
              ? {
                  ...n,
                  limits: { kind: "range" as const, min: { value: 1.41 }, max: { value: 1.59 } },
                  branches: { ...n.branches, within: { to: "motor-worn" } },
                }
              : n,
          ),
        { id: "motor-worn", kind: "outcome", title: "Worn fan motor bearings", remedy: "Replace the motor.", parts: ["Fan motor"] },
      ],
    };
    await replaceDraftContent(lead, d.versionId, next, 1);
    const r = await diffVersions(lead, treeId, 1, "draft");
    expect(r.to).toBe("draft");
    const diff = r.diff;
    expect(diff.tree).toEqual([{ field: "symptom", label: "Symptom", before: tree.symptom, after: next.symptom }]);
    expect(diff.added.map((n) => n.id)).toEqual(["motor-worn"]);
    expect(diff.removed.map((n) => n.id)).toEqual(["motor-failed"]);
    expect(diff.changed.map((c) => c.id)).toEqual(["cap-measure"]);
    expect(diff.changed[0]!.fields).toEqual([
      { field: "limits", label: "Limits", before: "1.41–1.59 µF (1.5 µF ± 6 %)", after: "1.41–1.59 µF" },
      { field: "branch:within", label: "On within", before: "within → motor-failed", after: "within → motor-worn" },
    ]);
    expect(diff.unchanged).toBe(2);
  });
});

describe("import and export", () => {
  const starter = readFileSync("trees/rotisserie-uneven-heat.md", "utf8");

  it("a file that doesn't parse saves nothing, and the errors carry line numbers", async () => {
    const broken = starter
      .replace("- category: rotisserie", "- category: toaster")
      .replace("- limits: 191 V to 218 V", "- limits: somewhere near 208");
    const counts = async () => {
      const [[t], [v], [n]] = await Promise.all([
        db().select({ n: count() }).from(trees),
        db().select({ n: count() }).from(treeVersions),
        db().select({ n: count() }).from(treeNodes),
      ]);
      return [t!.n, v!.n, n!.n];
    };
    const before = await counts();
    const r = await importTree(lead, broken).then(
      () => null,
      (e: Refusal) => e,
    );
    expect(r).toMatchObject({ kind: "rejected", status: 422, code: "parse" });
    const lines = broken.split("\n");
    const categoryLine = lines.findIndex((l) => l.includes("toaster")) + 1;
    const limitsLine = lines.findIndex((l) => l.includes("somewhere near")) + 1;
    expect((r!.details!.parseErrors as { line: number }[]).map((e) => e.line)).toEqual(expect.arrayContaining([categoryLine, limitsLine]));
    expect(await counts()).toEqual(before);

    // The same through the import page: 422, each error with its line and the line's text.
    const { cookie } = await cookieFor("lead@tinderbox.example");
    const form = new FormData();
    form.append("file", new File([broken], "broken.md", { type: "text/markdown" }));
    form.append("into", "");
    const res = (await treeImport.action(routeArgs(requestWith(cookie, "/trees/import", { method: "POST", body: form })))) as unknown as {
      data: { message: string; details: { parseErrors: { line: number; source: string }[] } };
      init: { status: number };
    };
    expect(res.init.status).toBe(422);
    expect(res.data.message).toMatch(/^broken\.md can't be read as a tree, so nothing was saved/);
    expect(res.data.details.parseErrors.find((e) => e.line === limitsLine)?.source).toBe("- limits: somewhere near 208");
    expect(await counts()).toEqual(before);
  });

  it("a good file becomes a new draft, or the next draft of an existing tree (not while one is open)", async () => {
    const r = await importTree(lead, starter);
    const draft = await loadTreeVersion(lead, r.treeId, "draft");
    const parsed = parseTree(starter);
    expect(parsed.ok && draft.tree).toEqual(parsed.ok ? parsed.tree : null);

    const { treeId } = await publishedTree();
    const into = await importTree(lead, starter, { into: treeId });
    expect(into).toMatchObject({ treeId });
    await expect(importTree(lead, starter, { into: treeId })).rejects.toMatchObject({
      kind: "conflict",
      code: "draft-open",
      details: { draftOf: treeId },
    });
    expect((await getTree(lead, treeId)).draft?.basedOnNumber).toBe(1);
  });

  it("export gives the engine's canonical form, as a download", async () => {
    const parsed = parseTree(starter);
    if (!parsed.ok) throw new Error("starter tree does not parse");
    const { treeId } = await publishedTree(lead, parsed.tree);
    const file = await exportVersion(lead, treeId, 1);
    expect(file.text).toBe(serializeTree(parsed.tree));
    expect(file.filename).toBe("two-fan-convection-rotisserie-heats-unevenly-v1.md");
    const { cookie } = await cookieFor("tech@tinderbox.example");
    const res = await treeExport.loader(routeArgs(requestWith(cookie, `/trees/${treeId}/versions/1/export`), { treeId, ref: "1" }));
    expect(res.headers.get("content-type")).toBe("text/markdown; charset=utf-8");
    expect(res.headers.get("content-disposition")).toBe(`attachment; filename="${file.filename}"`);
    expect(await res.text()).toBe(file.text);
    // A technician can't download a draft.
    await startDraft(lead, treeId);
    expect(
      (
        (await answer(
          treeExport.loader(routeArgs(requestWith(cookie, `/trees/${treeId}/versions/draft/export`), { treeId, ref: "draft" })),
        )) as Response
      ).status,
    ).toBe(403);
  });
});

describe("the library", () => {
  let ids: { a: string; b: string; c: string };
  const tag = crypto.randomUUID().slice(0, 8);
  beforeAll(async () => {
    const a = await publishedTree(lead, { ...smallTree(`Alpha ${tag} rotisserie`), category: "rotisserie" });
    const b = await createDraftTree(lead, { ...smallTree(`Beta ${tag} fryer`), category: "fryer", symptom: `Oil recovers slowly ${tag}` });
    const c = await publishedTree(lead, { ...smallTree(`Gamma ${tag} griddle`), category: "griddle" });
    await startDraft(owner, c.treeId);
    ids = { a: a.treeId, b: b.treeId, c: c.treeId };
  });

  it("searches titles and symptoms, filters by category and state, and sorts", async () => {
    const mine = (rows: { treeId: string }[]) => rows.map((r) => r.treeId).filter((id) => Object.values(ids).includes(id));
    expect(mine(await listLibrary(lead, { search: tag }))).toEqual([ids.a, ids.b, ids.c]);
    expect(mine(await listLibrary(lead, { search: `oil recovers slowly ${tag}` }))).toEqual([ids.b]);
    expect(mine(await listLibrary(lead, { search: tag, category: "griddle" }))).toEqual([ids.c]);
    expect(mine(await listLibrary(lead, { search: tag, state: "draft" }))).toEqual([ids.b, ids.c]);
    expect(mine(await listLibrary(lead, { search: tag, state: "published" }))).toEqual([ids.a, ids.c]);
    expect(mine(await listLibrary(lead, { search: tag, sort: "title", dir: "desc" }))).toEqual([ids.c, ids.b, ids.a]);
    expect(mine(await listLibrary(lead, { search: tag, sort: "changed", dir: "desc" }))[0]).toBe(ids.c);
    const c = (await listLibrary(lead, { search: tag })).find((r) => r.treeId === ids.c)!;
    expect(c).toMatchObject({ current: { number: 1 }, lastAuthor: "Maren Holt", versions: 1 });
    expect(c.draft).not.toBeNull();
    expect((await listLibrary(otherShop, { search: tag })).length).toBe(0);
  });

  it("a technician sees the library's published trees (page and API) but can't open the editor", async () => {
    const { cookie } = await cookieFor("tech@tinderbox.example");
    const page = await library.loader(routeArgs(requestWith(cookie, `/trees?q=${tag}&category=rotisserie`)));
    expect(page.rows.map((r) => r.treeId)).toEqual([ids.a]);
    expect(page.canEdit).toBe(false);
    const api = await apiTrees.loader(routeArgs(requestWith(cookie, `/api/trees?q=${tag}&state=draft`)));
    // The tree never published (b) is the authors' business and not listed for a technician.
    expect(((await api.json()) as { trees: { treeId: string }[] }).trees.map((t) => t.treeId)).toEqual([ids.c]);
    expect((await thrown(treeEdit.loader(routeArgs(requestWith(cookie, `/trees/${ids.c}/edit`), { treeId: ids.c })))).status).toBe(403);
  });
});

describe("images in step bodies", () => {
  const png = Uint8Array.from(
    atob("iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg=="),
    (c) => c.charCodeAt(0),
  );

  it("an image is stored by content, served to the shop with its name, and refused when it isn't an image", async () => {
    const { treeId } = await createDraftTree(lead, smallTree());
    const { cookie } = await cookieFor("lead@tinderbox.example");
    const form = new FormData();
    form.append("photo", new File([png], "wiring diagram.png", { type: "application/octet-stream" }));
    const res = (await apiTreeImages.action(
      routeArgs(
        requestWith(cookie, `/api/trees/${treeId}/images`, { method: "POST", headers: { origin: "http://localhost" }, body: form }),
        { treeId },
      ),
    )) as Response;
    expect(res.status).toBe(201);
    const up = (await res.json()) as { id: string; url: string; filename: string };
    expect(up.url).toBe(`/trees/${treeId}/images/${up.id}`);
    const tech = (await cookieFor("tech@tinderbox.example")).cookie;
    const img = await treeImage.loader(routeArgs(requestWith(tech, up.url), { treeId, imageId: up.id }));
    expect(img.headers.get("content-type")).toBe("image/png");
    expect(img.headers.get("content-disposition")).toBe('inline; filename="wiring diagram.png"');
    expect(new Uint8Array(await img.arrayBuffer())).toEqual(png);

    await expect(addTreeImage(lead, treeId, new TextEncoder().encode("<svg onload=alert(1)>"), "x.svg")).rejects.toMatchObject({
      kind: "wrong-type",
      status: 415,
    });
  });
});

describe("another shop's tree is a 404 on every route", () => {
  it("pages, downloads, images and the API all answer 404 to the other shop — and 200 to the tree's own shop", async () => {
    const { treeId } = await publishedTree();
    const draft = await startDraft(lead, treeId);
    const png = Uint8Array.from(
      atob("iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg=="),
      (c) => c.charCodeAt(0),
    );
    const image = await addTreeImage(lead, treeId, png, "part.png");
    const other = (await cookieFor("owner@pellham.example")).cookie;
    const own = (await cookieFor("owner@tinderbox.example")).cookie;
    const p = { treeId };
    const json = { origin: "http://localhost", "content-type": "application/json" };
    const calls: [string, (cookie: string) => unknown][] = [
      ["tree page", (c) => treePage.loader(routeArgs(requestWith(c, `/trees/${treeId}`), p))],
      [
        "tree page action",
        (c) =>
          treePage.action(
            routeArgs(
              requestWith(c, `/trees/${treeId}`, { method: "POST", body: new URLSearchParams({ intent: "retire", number: "1" }) }),
              p,
            ),
          ),
      ],
      ["version page", (c) => treeVersionPage.loader(routeArgs(requestWith(c, `/trees/${treeId}/versions/1`), { ...p, ref: "1" }))],
      ["draft page", (c) => treeVersionPage.loader(routeArgs(requestWith(c, `/trees/${treeId}/versions/draft`), { ...p, ref: "draft" }))],
      ["diff page", (c) => treeDiffPage.loader(routeArgs(requestWith(c, `/trees/${treeId}/diff?from=1&to=draft`), p))],
      ["editor", (c) => treeEdit.loader(routeArgs(requestWith(c, `/trees/${treeId}/edit`), p))],
      [
        "publish",
        (c) =>
          treeEdit.action(
            routeArgs(
              requestWith(c, `/trees/${treeId}/edit`, {
                method: "POST",
                body: new URLSearchParams({ intent: "publish", revision: "1", changeNote: "x" }),
              }),
              p,
            ),
          ),
      ],
      ["export", (c) => treeExport.loader(routeArgs(requestWith(c, `/trees/${treeId}/versions/1/export`), { ...p, ref: "1" }))],
      ["image", (c) => treeImage.loader(routeArgs(requestWith(c, image.url), { ...p, imageId: image.id }))],
      ["api tree", (c) => apiTree.loader(routeArgs(requestWith(c, `/api/trees/${treeId}`), p))],
      ["api version", (c) => apiTreeVersion.loader(routeArgs(requestWith(c, `/api/trees/${treeId}/versions/1`), { ...p, ref: "1" }))],
      [
        "api draft read",
        (c) => apiTreeVersion.loader(routeArgs(requestWith(c, `/api/trees/${treeId}/versions/draft`), { ...p, ref: "draft" })),
      ],
      ["api validation", (c) => apiTreeValidation.loader(routeArgs(requestWith(c, `/api/trees/${treeId}/validation`), p))],
      ["api diff", (c) => apiTreeDiff.loader(routeArgs(requestWith(c, `/api/trees/${treeId}/diff?from=1&to=draft`), p))],
      [
        "api autosave",
        (c) =>
          apiTreeDraft.action(
            routeArgs(
              requestWith(c, `/api/trees/${treeId}/draft`, {
                method: "POST",
                headers: json,
                body: JSON.stringify({ versionId: draft.versionId, revision: 1, tree: smallTree(), layout: {} }),
              }),
              p,
            ),
          ),
      ],
      [
        "api image upload",
        (c) => {
          const f = new FormData();
          f.append("photo", new File([png], "x.png"));
          return apiTreeImages.action(
            routeArgs(
              requestWith(c, `/api/trees/${treeId}/images`, { method: "POST", headers: { origin: "http://localhost" }, body: f }),
              p,
            ),
          );
        },
      ],
      [
        "import into",
        (c) => {
          const f = new FormData();
          f.append("file", new File([serializeTree(smallTree())], "t.md"));
          f.append("into", treeId);
          return treeImport.action(routeArgs(requestWith(c, "/trees/import", { method: "POST", body: f })));
        },
      ],
    ];
    for (const [name, call] of calls) {
      const r = (await answer(call(other))) as Response | { init?: { status: number } };
      const status = r instanceof Response ? r.status : r.init?.status;
      expect(status, name).toBe(404);
    }
    // The same reads succeed for the tree's own shop (so the 404s above are about the shop).
    for (const [name, call] of calls.filter(
      ([n]) => !["tree page action", "publish", "api autosave", "api image upload", "import into"].includes(n),
    )) {
      const r = await answer(call(own));
      const status = r instanceof Response ? r.status : 200;
      expect(status, name).toBe(200);
    }
    // Nothing of the tree changed.
    const t = await getTree(lead, treeId);
    expect(t.versions.map((v) => v.state)).toEqual(["published", "draft"]);
  });
});
