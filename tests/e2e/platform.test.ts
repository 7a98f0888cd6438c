import { spawn } from "node:child_process";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { DEMO_PASSWORD } from "../../db/demo";
import { stableId } from "../../db/seed";
import { launchBrowser, PHONE, signInAs } from "../support/browser";
import { freePort } from "../support/e2e-setup";

const baseUrl = inject("baseUrl");
const secondBaseUrl = inject("secondBaseUrl");
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(() => browser?.close());

describe("health", () => {
  it("GET /healthz answers 200 {ok:true, db:'up'}", async () => {
    const res = await fetch(`${baseUrl}/healthz`);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ ok: true, db: "up" });
  });

  it("answers 503 with db:'down' when MariaDB is unreachable", async () => {
    // A server pointed at a port where nothing listens.
    const port = await freePort();
    const child = spawn(process.execPath, ["server.js"], {
      env: {
        ...process.env,
        PORT: String(port),
        HOST: "127.0.0.1",
        DATABASE_URL: "mysql://root@127.0.0.1:9/nowhere",
        NODE_ENV: "production",
        AUTH_SECRET: "x".repeat(40),
      },
      stdio: "ignore",
    });
    try {
      let res: Response | undefined;
      for (let i = 0; i < 100 && !res; i++) {
        res = await fetch(`http://127.0.0.1:${port}/healthz`).catch(() => undefined);
        if (!res) await new Promise((r) => setTimeout(r, 100));
      }
      expect(res?.status).toBe(503);
      expect(await res!.json()).toEqual({ ok: false, db: "down" });
    } finally {
      child.kill("SIGTERM");
    }
  });
});

describe("two app servers on one database", () => {
  it("a session made on one works on the other, and signing out on the second ends it on the first", async () => {
    const context = await browser.newContext({ viewport: PHONE });
    const page = await context.newPage();
    await signInAs(page, baseUrl, "tech@tinderbox.example");
    await page.waitForURL(`${baseUrl}/calls`);
    const cookies = await context.cookies(baseUrl);
    const header = cookies.map((c) => `${c.name}=${c.value}`).join("; ");

    const onSecond = await fetch(`${secondBaseUrl}/calls`, { headers: { cookie: header }, redirect: "manual" });
    expect(onSecond.status).toBe(200);

    const out = await fetch(`${secondBaseUrl}/logout`, {
      method: "POST",
      headers: { cookie: header, origin: secondBaseUrl },
      redirect: "manual",
    });
    expect(out.status).toBe(302);

    await page.goto(`${baseUrl}/calls`);
    await page.waitForURL(/\/login/);
    const again = await fetch(`${baseUrl}/calls`, { headers: { cookie: header }, redirect: "manual" });
    expect(again.status).toBe(302);
    expect(again.headers.get("location")).toMatch(/^\/login/);
    await context.close();
  });
});

describe("shop scope over HTTP", () => {
  it("the other shop's owner gets 404 for this shop's unit page; this shop's technician gets the page", async () => {
    const unitA = stableId("unit:larkspur-rotisserie");
    const other = await browser.newContext({ viewport: PHONE });
    const page = await other.newPage();
    await signInAs(page, baseUrl, "owner@pellham.example");
    await page.waitForURL(`${baseUrl}/overview`);
    const res = await page.goto(`${baseUrl}/equipment/${unitA}`);
    expect(res?.status()).toBe(404);
    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toBe("Not found");
    await other.close();

    const own = await browser.newContext({ viewport: PHONE });
    const ownPage = await own.newPage();
    await signInAs(ownPage, baseUrl, "tech@tinderbox.example");
    await ownPage.waitForURL(`${baseUrl}/calls`);
    const ok = await ownPage.goto(`${baseUrl}/equipment/${unitA}`);
    expect(ok?.status()).toBe(200);
    await expect(ownPage.getByText("VR22-004417").isVisible()).resolves.toBe(true);
    await own.close();
  });

  it("a technician opening the owner's People page gets 403", async () => {
    const context = await browser.newContext({ viewport: PHONE });
    const page = await context.newPage();
    await signInAs(page, baseUrl, "tech@tinderbox.example");
    await page.waitForURL(`${baseUrl}/calls`);
    const res = await page.goto(`${baseUrl}/people`);
    expect(res?.status()).toBe(403);
    await context.close();
  });
});

describe("steps through two app servers (issue 14: each server keeps the run logs it wrote)", () => {
  it("steps posted to one run alternately through both servers are each judged against the whole log", async () => {
    // A server answers a step from the run's log as it last stored it when the locked run's step
    // count says nothing was added since; here every other step is added by the other server, so
    // each server must notice and read the log. A stale log would judge an undo or a reading
    // against the wrong step (the engine's refusal, 422) or take back the wrong one.
    const lead = await signInCookie(baseUrl, "lead@tinderbox.example");
    const tech = await signInCookie(baseUrl, "tech@tinderbox.example");
    const call = await fetch(`${baseUrl}/calls/new`, {
      method: "POST",
      redirect: "manual",
      headers: { cookie: lead, origin: baseUrl, "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({
        unitId: stableId("unit:larkspur-rotisserie"),
        symptom: "one fan slow (two servers)",
        priority: "normal",
        assignedTo: stableId("user:tech@tinderbox.example"),
        notes: "",
      }),
    });
    expect(call.status).toBe(302);
    const callPath = call.headers.get("location");
    expect(callPath).toMatch(/^\/calls\/[0-9a-f-]{36}$/);
    const start = await fetch(`${baseUrl}${callPath}`, {
      method: "POST",
      redirect: "manual",
      headers: { cookie: tech, origin: baseUrl, "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ treeId: stableId("tree:rotisserie-uneven-heat.md") }),
    });
    const runId = /\/runs\/([0-9a-f-]{36})$/.exec(start.headers.get("location") ?? "")?.[1];
    expect(runId).toBeDefined();

    const post = async (server: string, entry: Record<string, string>) => {
      const res = await fetch(`${server}/api/runs/${runId}/steps`, {
        method: "POST",
        headers: { cookie: tech, origin: server, "content-type": "application/json" },
        body: JSON.stringify({ key: crypto.randomUUID(), entry }),
      });
      const body = await res.json();
      expect(res.status, JSON.stringify(body)).toBe(201);
      return body.step as { seq: number; undoesSeq: number | null; verdict: string | null };
    };
    const servers = [baseUrl, secondBaseUrl];
    const supply = { type: "reading", node: "supply-voltage", reading: "208 V" };
    let n = 0;
    for (const node of ["lockout", "discharge-caps", "live-test"]) await post(servers[n++ % 2]!, { type: "acknowledge", node });
    for (let i = 0; i < 4; i++) {
      const reading = await post(servers[n++ % 2]!, supply);
      expect(reading.verdict).toBe("within");
      const undo = await post(servers[n++ % 2]!, { type: "undo" });
      expect(undo.undoesSeq).toBe(reading.seq);
    }
    // Two undos in a row through different servers take back two different steps.
    const last = await post(servers[n++ % 2]!, { type: "undo" });
    const before = await post(servers[n++ % 2]!, { type: "undo" });
    expect([last.undoesSeq, before.undoesSeq]).toEqual([2, 1]);
    const view = await (await fetch(`${secondBaseUrl}/api/runs/${runId}`, { headers: { cookie: tech } })).json();
    expect(view.steps.map((s: { seq: number }) => s.seq)).toEqual(Array.from({ length: n }, (_, i) => i));
    expect(view.run.currentNode).toBe("discharge-caps");
  });
});

/** A session cookie through the /login form. */
async function signInCookie(url: string, email: string): Promise<string> {
  const res = await fetch(`${url}/login`, {
    method: "POST",
    redirect: "manual",
    headers: { origin: url, "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ email, password: DEMO_PASSWORD }),
  });
  return res.headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .join("; ");
}
