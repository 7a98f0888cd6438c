// The pool's acquire timeout (issue 9 items 5 and 11): a request that waits too long for a
// connection fails fast as an outage (503) instead of hanging forever, and the pool recovers.
import { afterAll, describe, expect, it } from "vitest";
import { createPool, PoolAcquireTimeout } from "../../app/lib/db.server";
import { isDatabaseUnavailable } from "../../app/lib/errors.server";

const pool = createPool(process.env.DATABASE_URL!, { size: 2, acquireTimeoutMs: 300 });
afterAll(() => pool.end());

describe("pool acquire timeout", () => {
  it("a query queued behind a full pool fails after the timeout, as an outage; the pool serves again once connections return", async () => {
    const held = [await pool.getConnection(), await pool.getConnection()];
    const started = performance.now();
    const error = await pool.query("SELECT 1").catch((e: unknown) => e);
    const waited = performance.now() - started;
    expect(error).toBeInstanceOf(PoolAcquireTimeout);
    expect(isDatabaseUnavailable(error)).toBe(true);
    expect(waited).toBeGreaterThanOrEqual(290);
    expect(waited).toBeLessThan(3000);
    // A transaction's getConnection is bounded the same way.
    await expect(pool.getConnection()).rejects.toBeInstanceOf(PoolAcquireTimeout);

    for (const c of held) c.release();
    // The late hand-overs went back to the pool: both connections serve queries at once again.
    const rows = await Promise.all([pool.query("SELECT 1 AS one"), pool.query("SELECT 2 AS two")]);
    expect(rows.map(([r]) => Object.values((r as Record<string, number>[])[0]!)[0])).toEqual([1, 2]);
  });
});
