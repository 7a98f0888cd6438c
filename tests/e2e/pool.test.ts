// The database pool never locks up (issue 9 item 11). A fresh server — its cache of tree versions
// empty, so every step must read its run's version inside its own transaction — gets 64 step posts at
// once on 64 runs, three times the pool's 20 connections. Every post answers (201, or 503 when a
// connection did not come free within the acquire timeout; never a hang, never a 500), /healthz keeps
// answering while they run, and says the database is up afterwards.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { stableId } from "../../db/seed";
import type { Ctx } from "../../app/lib/context";
import { inArray } from "drizzle-orm";
import { runSteps } from "../../db/schema";
import { closeDb, db } from "../../app/lib/db.server";
import { startRun } from "../../app/models/runs/start.server";
import { startServer, signIn, type Started } from "../support/server";

// The models below talk to the browser tests' database, as the server does (the configuration is
// read at the first query, after this line).
process.env.DATABASE_URL = process.env.E2E_DATABASE_URL;

const tech: Ctx = { shopId: stableId("shop:tinderbox"), userId: stableId("user:tech@tinderbox.example"), role: "technician" };
const rotisserieTree = stableId("tree:rotisserie-uneven-heat.md");
const POSTS = 64;

let server: Started | undefined;
afterAll(async () => {
  await server?.stop();
  await closeDb();
});

describe("64 concurrent steps on a fresh server (pool of 20)", () => {
  let runIds: string[];
  beforeAll(async () => {
    runIds = [];
    for (let i = 0; i < POSTS; i++) runIds.push((await startRun(tech, { treeId: rotisserieTree })).runId);
    server = await startServer({ DB_POOL_SIZE: "20", DB_ACQUIRE_TIMEOUT_MS: "5000", LOG_LEVEL: "warn" });
  });

  it("every post answers 201 or 503 within the time bound, /healthz answers throughout, and each stored step is stored once", async () => {
    const { url } = server!;
    const cookie = await signIn(url, "tech@tinderbox.example");
    const bound = AbortSignal.timeout(60_000);
    const post = async (runId: string) => {
      const started = performance.now();
      const res = await fetch(`${url}/api/runs/${runId}/steps`, {
        method: "POST",
        headers: { cookie, origin: url, "content-type": "application/json" },
        body: JSON.stringify({ key: crypto.randomUUID(), entry: { type: "acknowledge", node: "lockout" } }),
        signal: bound,
      });
      const body = (await res.json()) as { error?: string; code?: string; step?: { seq: number } };
      return { status: res.status, ms: performance.now() - started, body };
    };
    let burstDone = false;
    const health: number[] = [];
    const polling = (async () => {
      while (!burstDone) {
        const res = await fetch(`${url}/healthz`, { signal: AbortSignal.timeout(10_000) });
        health.push(res.status);
        await new Promise((r) => setTimeout(r, 100));
      }
    })();
    const answers = await Promise.all(runIds.map(post));
    burstDone = true;
    await polling;

    const statuses = answers.map((a) => a.status);
    expect(statuses.filter((s) => s !== 201 && s !== 503)).toEqual([]);
    for (const a of answers.filter((x) => x.status === 503)) expect(a.body.code).toBe("db_unavailable");
    for (const a of answers.filter((x) => x.status === 201)) expect(a.body.step?.seq).toBe(0);
    expect(statuses.filter((s) => s === 201).length).toBeGreaterThan(0);
    const stored = await db().select({ runId: runSteps.runId, seq: runSteps.seq }).from(runSteps).where(inArray(runSteps.runId, runIds));
    expect(stored).toHaveLength(statuses.filter((s) => s === 201).length);
    expect(new Set(stored.map((r) => r.runId)).size).toBe(stored.length);
    // /healthz answered every poll (its own short timeout may say 503 while the pool is full).
    expect(health.length).toBeGreaterThan(0);
    expect(health.every((s) => s === 200 || s === 503)).toBe(true);
    const after = await fetch(`${url}/healthz`);
    expect(after.status).toBe(200);
    expect(await after.json()).toMatchObject({ ok: true, db: "up" });
    console.log(
      `64 steps at once on a fresh server: ${statuses.filter((s) => s === 201).length} × 201, ${statuses.filter((s) => s === 503).length} × 503; ` +
        `slowest ${Math.round(Math.max(...answers.map((a) => a.ms)))} ms; /healthz ${health.filter((s) => s === 200).length} × 200, ${health.filter((s) => s === 503).length} × 503`,
    );
  });
});
