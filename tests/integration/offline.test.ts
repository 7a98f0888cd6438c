// What offline field mode needs from the server, against the real MariaDB: a run started on the
// phone with its own id (the same id again is the same run; a draft version or another run's id is
// refused), the phone's clock kept on runs, notes and photos, and the field kit a phone keeps
// (the technician's own open calls, their runs, the procedures to start one, versions the phone
// already has left out).
import { and, eq } from "drizzle-orm";
import { readFileSync } from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { runNotes, runPhotos, runs, runSteps } from "../../db/schema";
import { stableId } from "../../db/seed";
import { parseTree } from "../../app/engine/markdown/parse";
import type { Ctx } from "../../app/lib/context";
import { closeDb, db } from "../../app/lib/db.server";
import { createCall } from "../../app/models/calls.server";
import { fieldKit } from "../../app/models/runs/kit.server";
import { addNote } from "../../app/models/runs/notes.server";
import { addPhoto } from "../../app/models/runs/photos.server";
import { startRun } from "../../app/models/runs/start.server";
import { postStep } from "../../app/models/runs/steps.server";
import { createDraftTree, createPublishedTree, replaceDraftContent, startDraft } from "../../app/models/trees/drafts.server";
import { publishDraft } from "../../app/models/trees/publish.server";
import { action as startAction } from "../../app/routes/api.runs";
import { loader as kitLoader } from "../../app/routes/api.field-kit";
import { TINY_PNG } from "../support/photo";
import { cookieFor, requestWith, routeArgs } from "../support/session";
import { smallTree } from "../support/trees";

afterAll(() => closeDb());

const shopA = stableId("shop:tinderbox");
const tech: Ctx = { shopId: shopA, userId: stableId("user:tech@tinderbox.example"), role: "technician" };
const lead: Ctx = { shopId: shopA, userId: stableId("user:lead@tinderbox.example"), role: "lead" };
const otherTech: Ctx = { shopId: stableId("shop:pellham"), userId: stableId("user:tech@pellham.example"), role: "technician" };
const rotisserie = stableId("unit:larkspur-rotisserie");
const rotisserieTree = stableId("tree:rotisserie-uneven-heat.md");
const rotisserieV1 = stableId("tree-version:rotisserie-uneven-heat.md:1");

const newCall = async (symptom = "heats unevenly", assignedTo: string | null = tech.userId) =>
  (await createCall(lead, { unitId: rotisserie, symptom, priority: "high", assignedTo, notes: null })).id;

describe("a run started on the phone", () => {
  it("is created with the phone's id, on the version the phone walked, at the phone's time; the same start again is the same run", async () => {
    const callId = await newCall();
    const id = crypto.randomUUID();
    const at = new Date(Date.now() - 45 * 60_000); // started 45 minutes ago, in a basement
    const first = await startRun(tech, { runId: id, treeId: rotisserieTree, versionId: rotisserieV1, callId, startedAt: at });
    expect(first).toEqual({ runId: id, versionId: rotisserieV1, replayed: false });
    const again = await startRun(tech, { runId: id, treeId: rotisserieTree, versionId: rotisserieV1, callId, startedAt: at });
    expect(again).toEqual({ runId: id, versionId: rotisserieV1, replayed: true });
    const rows = await db().select().from(runs).where(eq(runs.id, id));
    expect(rows).toHaveLength(1);
    expect(rows[0]!.startedAt.toISOString()).toBe(at.toISOString());
    expect(rows[0]!.callId).toBe(callId);
    // Its steps follow as usual, with their keys.
    await postStep(tech, id, { key: crypto.randomUUID(), entry: { type: "acknowledge", node: "lockout" }, at: new Date().toISOString() });
  });

  it("the id of another run, another call or another shop's run is refused (422); the call's rules hold at sync", async () => {
    const callId = await newCall();
    const id = crypto.randomUUID();
    await startRun(tech, { runId: id, treeId: rotisserieTree, versionId: rotisserieV1, callId });
    await expect(
      startRun(tech, { runId: id, treeId: rotisserieTree, versionId: rotisserieV1, callId: await newCall() }),
    ).rejects.toMatchObject({ status: 422, code: "key-reused" });
    await expect(startRun(lead, { runId: id, treeId: rotisserieTree, versionId: rotisserieV1, callId })).rejects.toMatchObject({
      status: 422,
      code: "key-reused",
    });
    await expect(startRun(otherTech, { runId: id, treeId: rotisserieTree })).rejects.toMatchObject({ status: 422 });
    // Another phone-made run on a call that already has one in progress: the usual conflict.
    await expect(
      startRun(tech, { runId: crypto.randomUUID(), treeId: rotisserieTree, versionId: rotisserieV1, callId }),
    ).rejects.toMatchObject({ status: 409, code: "run-open" });
  });

  it("walks the version the phone had even when a newer one is published; never a draft", async () => {
    const parsed = parseTree(readFileSync("trees/rotisserie-uneven-heat.md", "utf8"));
    if (!parsed.ok) throw new Error("starter tree does not parse");
    const { treeId, versionId: v1 } = await createPublishedTree(
      lead,
      { ...parsed.tree, title: `Offline pinning ${crypto.randomUUID().slice(0, 8)}` },
      "test",
    );
    const draft = await startDraft(lead, treeId);
    const saved = await replaceDraftContent(lead, draft.versionId, { ...parsed.tree, title: "Second" }, 1);
    await publishDraft(lead, treeId, saved.revision, "test: a later version");
    const r = await startRun(tech, { runId: crypto.randomUUID(), treeId, versionId: v1 });
    expect(r.versionId).toBe(v1);
    const { treeId: draftTree, versionId: draftVersion } = await createDraftTree(
      lead,
      smallTree(`Offline draft ${crypto.randomUUID().slice(0, 8)}`),
    );
    await expect(startRun(tech, { runId: crypto.randomUUID(), treeId: draftTree, versionId: draftVersion })).rejects.toMatchObject({
      status: 409,
      code: "unpublished",
    });
  });

  it("a phone clock far off (a month back, or ahead) is not believed: the server's time is used", async () => {
    for (const at of [new Date(Date.now() - 30 * 86_400_000), new Date(Date.now() + 3_600_000)]) {
      const before = Date.now();
      const { runId } = await startRun(tech, {
        runId: crypto.randomUUID(),
        treeId: rotisserieTree,
        versionId: rotisserieV1,
        startedAt: at,
      });
      const [row] = await db().select().from(runs).where(eq(runs.id, runId));
      expect(row!.startedAt.getTime()).toBeGreaterThanOrEqual(before - 1000);
    }
  });

  it("two tries of the same start at the same moment make one run; both answer with it", async () => {
    const callId = await newCall();
    const id = crypto.randomUUID();
    const both = await Promise.all(
      [0, 1].map(() => startRun(tech, { runId: id, treeId: rotisserieTree, versionId: rotisserieV1, callId })),
    );
    expect(both.map((b) => b.runId)).toEqual([id, id]);
    expect(both.map((b) => b.replayed).sort()).toEqual([false, true]);
    expect(await db().select().from(runs).where(eq(runs.callId, callId))).toHaveLength(1);
  });

  it("over HTTP: POST /api/runs answers 201, then 200 with the same run; a bad body is a 400 naming the field; cross-site is a 403", async () => {
    const { cookie } = await cookieFor("tech@tinderbox.example");
    const callId = await newCall();
    const body = { id: crypto.randomUUID(), treeId: rotisserieTree, versionId: rotisserieV1, callId, at: new Date().toISOString() };
    const post = (b: unknown, headers: Record<string, string> = {}) =>
      startAction(
        routeArgs(
          requestWith(cookie, "/api/runs", {
            method: "POST",
            headers: { "content-type": "application/json", origin: "http://localhost", ...headers },
            body: JSON.stringify(b),
          }),
        ),
      );
    const a = await post(body);
    expect(a.status).toBe(201);
    const b = await post(body);
    expect(b.status).toBe(200);
    expect(await b.json()).toEqual({ ok: true, runId: body.id, versionId: rotisserieV1, replayed: true });
    const bad = await post({ ...body, id: "not-a-uuid" });
    expect(bad.status).toBe(400);
    expect(await bad.json()).toMatchObject({ error: "The run needs an id (a UUID).", fields: { id: "The run needs an id (a UUID)." } });
    const cross = await post({ ...body, id: crypto.randomUUID() }, { origin: "https://elsewhere.example" }).catch((r: Response) => r);
    expect(cross.status).toBe(403);
  });
});

describe("the phone's clock", () => {
  it("is kept on steps, notes and photos that reach the server later", async () => {
    const { runId } = await startRun(tech, { treeId: rotisserieTree, callId: await newCall() });
    const now = Date.now();
    const [stepAt, noteAt, photoAt] = [20, 19, 18].map((min) => new Date(now - min * 60_000).toISOString());
    await postStep(tech, runId, { key: crypto.randomUUID(), entry: { type: "acknowledge", node: "lockout" }, at: stepAt });
    const note = await addNote(tech, runId, {
      key: crypto.randomUUID(),
      node: "lockout",
      text: "Disconnect is in the back corridor.",
      at: noteAt,
    });
    const photo = await addPhoto(tech, runId, { key: crypto.randomUUID(), node: "lockout", bytes: TINY_PNG, at: photoAt });
    const [s] = await db()
      .select()
      .from(runSteps)
      .where(and(eq(runSteps.runId, runId), eq(runSteps.seq, 0)));
    const [n] = await db().select().from(runNotes).where(eq(runNotes.idempotencyKey, note.note.key));
    const [p] = await db().select().from(runPhotos).where(eq(runPhotos.id, photo.photo.id));
    expect([s!.clientAt!.toISOString(), n!.clientAt!.toISOString(), p!.clientAt!.toISOString()]).toEqual([stepAt, noteAt, photoAt]);
    // The server's own time is kept beside it.
    expect(n!.clientAt!.getTime()).toBeLessThan(n!.createdAt.getTime());
    expect(p!.clientAt!.getTime()).toBeLessThan(p!.createdAt.getTime());
  });
});

describe("the field kit", () => {
  it("holds the technician's own open calls with their runs and the procedures to start one, best match first; versions the phone has are left out", async () => {
    const waiting = await newCall("heats unevenly, left side pale");
    const running = await newCall("heats unevenly, right side pale");
    const { runId } = await startRun(tech, { treeId: rotisserieTree, callId: running });
    const notMine = await newCall("not mine", null);
    const kit = await fieldKit(tech);
    expect(kit.user).toEqual({ id: tech.userId, name: expect.any(String) });
    const w = kit.calls.find((c) => c.id === waiting)!;
    expect(w.openRun).toBeNull();
    expect(w.unit).toMatchObject({ id: rotisserie, category: "rotisserie" });
    // The best match for "heats unevenly" (other tests may have published copies under the same title).
    const best = w.procedures[0]!;
    expect(best.title).toBe("Two-fan convection rotisserie heats unevenly");
    expect(w.procedures.length).toBeLessThanOrEqual(3);
    expect(kit.versions[best.versionId]!.tree.start).toBe("lockout");
    expect(Object.keys(kit.versions[best.versionId]!.bodies)).toContain("supply-voltage");
    expect(kit.calls.find((c) => c.id === running)!.openRun).toEqual({ id: runId, status: "active" });
    expect(kit.runs.map((r) => r.run.id)).toContain(runId);
    expect(kit.calls.some((c) => c.id === notMine)).toBe(false);
    expect(kit.meters.length).toBeGreaterThan(0);
    // Already on the phone: not sent again.
    const again = await fieldKit(tech, [best.versionId]);
    expect(again.versions[best.versionId]).toBeUndefined();
    expect(Object.keys(again.versions).length).toBe(Object.keys(kit.versions).length - 1);
    // Another shop's technician sees none of it.
    const other = await fieldKit(otherTech);
    expect(other.calls.some((c) => c.id === waiting || c.id === running)).toBe(false);
  });

  it("over HTTP: GET /api/field-kit?have=… answers the kit, private and not stored; a lead's is a 403", async () => {
    const { cookie } = await cookieFor("tech@tinderbox.example");
    const res = await kitLoader(routeArgs(requestWith(cookie, `/api/field-kit?have=${rotisserieV1},junk`)));
    expect(res.status).toBe(200);
    expect(res.headers.get("cache-control")).toBe("private, no-store");
    const kit = (await res.json()) as { versions: Record<string, unknown> };
    expect(kit.versions[rotisserieV1]).toBeUndefined();
    const { cookie: leadCookie } = await cookieFor("lead@tinderbox.example");
    expect((await kitLoader(routeArgs(requestWith(leadCookie, "/api/field-kit")))).status).toBe(403);
  });
});
