// Ordinary requests racing each other (issue 9 items 2, 3 and 12): no race between two ordinary
// requests may answer 500. Each race is run many times against the real MariaDB; every answer must be
// a success or the refusal the loser is owed (a Refusal from the model, so a 4xx from the route).
import { and, count, eq, inArray, like } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { DEMO_SHOP } from "../../db/demo";
import { reports, runPhotos, serviceCalls } from "../../db/schema";
import { stableId } from "../../db/seed";
import type { Ctx } from "../../app/lib/context";
import { closeDb, db, writeTxRetries } from "../../app/lib/db.server";
import { isRefusal } from "../../app/lib/refusal";
import { createCall } from "../../app/models/calls.server";
import { addPhoto } from "../../app/models/runs/photos.server";
import { startRun } from "../../app/models/runs/start.server";
import { createDraftTree, replaceDraftContent, startDraft } from "../../app/models/trees/drafts.server";
import { publishDraft } from "../../app/models/trees/publish.server";
import { recordOutcome } from "../../app/models/runs/lifecycle.server";
import { postStep } from "../../app/models/runs/steps.server";
import * as newCall from "../../app/routes/calls.new";
import { TINY_PNG } from "../support/photo";
import { cookieFor, requestWith, routeArgs } from "../support/session";
import { freshShop } from "../support/shops";
import { objectKeys } from "../support/storage";
import { smallTree } from "../support/trees";

afterAll(() => closeDb());

const shop = stableId(DEMO_SHOP.key);
const lead: Ctx = { shopId: shop, userId: stableId("user:lead@tinderbox.example"), role: "lead" };
const owner: Ctx = { shopId: shop, userId: stableId("user:owner@tinderbox.example"), role: "owner" };
const tech: Ctx = { shopId: shop, userId: stableId("user:tech@tinderbox.example"), role: "technician" };
const rotisserie = stableId("unit:larkspur-rotisserie");
const rotisserieTree = stableId("tree:rotisserie-uneven-heat.md");

/** What a promise settled to: the value, a Refusal (the 4xx a route would send), or anything else (a 500). */
async function settle<T>(p: Promise<T>): Promise<{ ok: T } | { refused: { kind: string; code?: string } } | { crashed: unknown }> {
  try {
    return { ok: await p };
  } catch (e) {
    if (isRefusal(e)) return { refused: { kind: e.kind, ...(e.code ? { code: e.code } : {}) } };
    return { crashed: e };
  }
}

/** Deadlocks (1213) writeTx had to retry in this process since `before`. */
const deadlocksSince = (before: Record<number, number>) => (writeTxRetries()[1213] ?? 0) - (before[1213] ?? 0);

const crashes = (results: object[]) => results.filter((r) => "crashed" in r).map((r) => String((r as { crashed: unknown }).crashed));

describe("publish racing an autosave of the same draft (item 2)", () => {
  it("30 races: never a database error nor a deadlock to retry; either the publish wins (the save is told the draft is gone) or the save wins (the publish is told it is stale)", async () => {
    const before = writeTxRetries();
    const outcomes = { publishWon: 0, saveWon: 0 };
    const failures: string[] = [];
    for (let i = 0; i < 30; i++) {
      const title = `Race ${i} ${crypto.randomUUID().slice(0, 6)}`;
      const { treeId } = await createDraftTree(lead, smallTree(title));
      await publishDraft(lead, treeId, 1, "First");
      const { versionId } = await startDraft(lead, treeId);
      const changed = smallTree(`${title} (changed)`);
      await replaceDraftContent(lead, versionId, changed, 1);
      // Both start from revision 2: the save writes 3, the publish numbers version 2.
      const [publish, save] = await Promise.all([
        settle(publishDraft(lead, treeId, 2, "Second")),
        settle(replaceDraftContent(owner, versionId, smallTree(`${title} (owner's)`), 2, { treeId })),
      ]);
      failures.push(...crashes([publish, save]));
      if ("ok" in publish) {
        outcomes.publishWon++;
        expect(save).toEqual({ refused: { kind: "gone" } });
      } else if ("ok" in save) {
        outcomes.saveWon++;
        expect(publish).toEqual({ refused: { kind: "conflict", code: "stale" } });
      } else if (!("crashed" in publish) && !("crashed" in save)) {
        throw new Error(`neither won: ${JSON.stringify({ publish, save })}`);
      }
    }
    expect(failures).toEqual([]);
    expect(outcomes.publishWon + outcomes.saveWon).toBe(30);
    // Both take the tree's row first (docs/decisions/0240): they wait for each other, never deadlock.
    expect(deadlocksSince(before)).toBe(0);
  });
});

describe("the same photo uploaded twice at once (item 3)", () => {
  it("10 concurrent uploads with one idempotency key: one stored photo and one object, every other answer a replay of it", async () => {
    const { runId } = await startRun(tech, { treeId: rotisserieTree });
    const prefix = `${shop}/run-photos/`;
    const before = new Set(await objectKeys(prefix));
    const key = crypto.randomUUID();
    const before1 = writeTxRetries();
    const results = await Promise.all(
      Array.from({ length: 10 }, () => settle(addPhoto(tech, runId, { key, node: "lockout", bytes: TINY_PNG }))),
    );
    expect(crashes(results)).toEqual([]);
    const answers = results.map((r) => (r as { ok: { replayed: boolean; photo: { id: string } } }).ok);
    expect(answers.filter((a) => !a.replayed)).toHaveLength(1);
    expect(new Set(answers.map((a) => a.photo.id)).size).toBe(1);
    const [rows] = await db()
      .select({ n: count() })
      .from(runPhotos)
      .where(and(eq(runPhotos.runId, runId), eq(runPhotos.idempotencyKey, key)));
    expect(rows!.n).toBe(1);
    // The losers' objects were removed: exactly one new object, the stored photo's.
    const added = (await objectKeys(prefix)).filter((k) => !before.has(k));
    const [stored] = await db().select({ objectKey: runPhotos.objectKey }).from(runPhotos).where(eq(runPhotos.id, answers[0]!.photo.id));
    expect(added).toEqual([stored!.objectKey]);
    expect(deadlocksSince(before1)).toBe(0);
  });

  it("the same key with another step, at the same time, is refused as a reused key (422), never a 500", async () => {
    const { runId } = await startRun(tech, { treeId: rotisserieTree });
    const key = crypto.randomUUID();
    const results = await Promise.all(
      Array.from({ length: 6 }, (_, i) => settle(addPhoto(tech, runId, { key, node: i % 2 ? "lockout" : "live-test", bytes: TINY_PNG }))),
    );
    expect(crashes(results)).toEqual([]);
    expect(results.filter((r) => "ok" in r && !(r.ok as { replayed: boolean }).replayed)).toHaveLength(1);
    for (const r of results) if ("refused" in r) expect(r.refused).toEqual({ kind: "rejected", code: "key-reused" });
  });
});

describe("numbers people say, under concurrent creation (item 12)", () => {
  const callInput = (symptom: string) => ({ unitId: rotisserie, symptom, priority: "normal" as const, assignedTo: null, notes: null });

  for (const n of [8, 32]) {
    it(`${n} concurrent new calls through the form all succeed, with ${n} distinct consecutive numbers`, async () => {
      const { cookie } = await cookieFor("lead@tinderbox.example");
      const tag = `burst ${n} ${crypto.randomUUID().slice(0, 8)}`;
      const post = (i: number) =>
        settle(
          newCall.action(
            routeArgs(
              requestWith(cookie, "/calls/new", {
                method: "POST",
                body: new URLSearchParams({
                  unitId: rotisserie,
                  symptom: `${tag} call ${i}`,
                  priority: "normal",
                  assignedTo: "",
                  notes: "",
                }),
              }),
            ),
          ) as Promise<unknown>,
        );
      const results = await Promise.all(Array.from({ length: n }, (_, i) => post(i)));
      // The action answers a redirect to the new call on success.
      const statuses = results.map((r) =>
        "ok" in r && r.ok instanceof Response ? r.ok.status : "crashed" in r ? String(r.crashed) : JSON.stringify(r),
      );
      expect(statuses).toEqual(Array(n).fill(302));
      const rows = await db()
        .select({ number: serviceCalls.number })
        .from(serviceCalls)
        .where(and(eq(serviceCalls.shopId, shop), like(serviceCalls.symptom, `${tag} call %`)));
      const numbers = rows.map((r) => r.number).sort((a, z) => a - z);
      expect(numbers).toHaveLength(n);
      expect(numbers.at(-1)! - numbers[0]!).toBe(n - 1);
    });
  }

  it("a new shop's first eight calls, made at once, are numbered 1001 to 1008", async () => {
    const fresh = await freshShop();
    const made = await Promise.all(
      Array.from({ length: 8 }, (_, i) => createCall(fresh.ctx, { ...callInput(`first calls ${i}`), unitId: fresh.unitId })),
    );
    expect(made.map((m) => m.number).sort()).toEqual([1001, 1002, 1003, 1004, 1005, 1006, 1007, 1008]);
  });

  for (const n of [8, 32]) {
    it(`${n} outcomes recorded at once make ${n} reports with distinct consecutive numbers`, async () => {
      const { treeId } = await createDraftTree(lead, smallTree(`Reports burst ${n} ${crypto.randomUUID().slice(0, 6)}`));
      await publishDraft(lead, treeId, 1, "First");
      const runIds: string[] = [];
      for (let i = 0; i < n; i++) {
        const { runId } = await startRun(tech, { treeId });
        await postStep(tech, runId, { key: crypto.randomUUID(), entry: { type: "answer", node: "cap-look", answer: "yes" } });
        runIds.push(runId);
      }
      const results = await Promise.all(
        runIds.map((runId) => settle(recordOutcome(tech, runId, { action: "Replaced the run capacitor.", minutes: 30, parts: [] }))),
      );
      expect(crashes(results)).toEqual([]);
      const numbers = results.map((r) => (r as { ok: { number: number } }).ok.number).sort((a, z) => a - z);
      expect(new Set(numbers).size).toBe(n);
      expect(numbers.at(-1)! - numbers[0]!).toBe(n - 1);
      const [stored] = await db().select({ n: count() }).from(reports).where(inArray(reports.runId, runIds));
      expect(stored!.n).toBe(n);
    });
  }
});
