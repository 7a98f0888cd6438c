// The server entry over real HTTP, against the production build: no request stops the process, every
// Set-Cookie arrives, state changes only from our own pages, page security headers (CSP with a nonce
// per response, Permissions-Policy, HSTS only over TLS), the request log, a database outage answered
// with 503 and recovered from without a restart, and configuration checked at boot.
// Servers with their own settings are started here from the same build (server.js); a TCP relay in
// this process stands between one of them and MariaDB so the test can cut the database off and back.
import { spawn } from "node:child_process";
import { get as httpGet, type IncomingHttpHeaders } from "node:http";
import { connect } from "node:net";
import { brotliDecompressSync, gunzipSync } from "node:zlib";
import type { Browser } from "playwright-core";
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from "vitest";
import { DEMO_PASSWORD } from "../../db/demo";
import { launchBrowser, LAPTOP, PHONE, screenshotPath, signInAs } from "../support/browser";
import { relayedDatabase, SERVER_TEST_SECRET as SECRET, signIn, startServer, type DatabaseRelay, type Started } from "../support/server";

const baseUrl = inject("baseUrl");
const dbUrl = process.env.E2E_DATABASE_URL!;

/** Runs `node server.js` with these settings and waits for it to exit (a refused configuration). */
function bootFails(env: Record<string, string>): Promise<{ code: number | null; output: string }> {
  return new Promise((resolve) => {
    let output = "";
    const child = spawn(process.execPath, ["server.js"], {
      env: { ...process.env, HOST: "127.0.0.1", PORT: "1", DATABASE_URL: dbUrl, NODE_ENV: "production", AUTH_SECRET: SECRET, ...env },
      stdio: ["ignore", "pipe", "pipe"],
    });
    child.stdout!.on("data", (d) => (output += d));
    child.stderr!.on("data", (d) => (output += d));
    const timer = setTimeout(() => child.kill("SIGKILL"), 20_000);
    child.once("exit", (code) => {
      clearTimeout(timer);
      resolve({ code, output });
    });
  });
}

/** Sends raw bytes and returns what the server answered (or "" if it closed without a word). */
function rawHttp(port: number, text: string): Promise<string> {
  return new Promise((resolve) => {
    let got = "";
    const s = connect(port, "127.0.0.1", () => s.write(text));
    s.on("data", (d) => (got += d));
    s.on("close", () => resolve(got));
    s.on("error", () => resolve(got));
    s.setTimeout(5000, () => s.destroy());
  });
}

describe("no request stops the server (issue 9 item 1)", () => {
  it("answers 400 to bad percent-encoding on a file path, GET and HEAD, and keeps serving", async () => {
    const bad = await fetch(`${baseUrl}/%E0%A4%A.js`);
    expect(bad.status).toBe(400);
    const head = await fetch(`${baseUrl}/%zz.css`, { method: "HEAD" });
    expect(head.status).toBe(400);
    // The same on an API path is JSON, as every API error is.
    const api = await fetch(`${baseUrl}/api/%zz.json`);
    expect(api.status).toBe(400);
    expect(await api.json()).toEqual({ error: expect.any(String) });
    expect((await fetch(`${baseUrl}/healthz`)).status).toBe(200);
  });

  it("answers 400 to a bad Host header, a path that is not a path, and malformed HTTP, and keeps serving", async () => {
    const port = Number(new URL(baseUrl).port);
    expect(await rawHttp(port, "GET /login HTTP/1.1\r\nHost: bad host name\r\nConnection: close\r\n\r\n")).toMatch(/^HTTP\/1\.1 400 /);
    expect(await rawHttp(port, "GET http://elsewhere.example/login HTTP/1.1\r\nHost: 127.0.0.1\r\nConnection: close\r\n\r\n")).toMatch(
      /^HTTP\/1\.1 400 /,
    );
    expect(await rawHttp(port, "GARBAGE\r\n\r\n")).toMatch(/^HTTP\/1\.1 400 /);
    // RFC 9112 §3.2: a request without Host is a 400.
    expect(await rawHttp(port, "GET /login HTTP/1.1\r\nConnection: close\r\n\r\n")).toMatch(/^HTTP\/1\.1 400 /);
    // A doubled slash is a path on this host, never a request for another host.
    const dbl = await fetch(`${baseUrl}//elsewhere.example/login`, { redirect: "manual" });
    expect(dbl.status).toBe(404);
    expect((await fetch(`${baseUrl}/healthz`)).status).toBe(200);
  });
});

describe("every Set-Cookie reaches the client (issue 9 item 7)", () => {
  it("GET /auth/csrf sets both Auth.js cookies", async () => {
    const res = await fetch(`${baseUrl}/auth/csrf`);
    expect(res.status).toBe(200);
    const names = res.headers.getSetCookie().map((c) => c.split("=")[0]);
    expect(names).toEqual(expect.arrayContaining(["authjs.csrf-token", "authjs.callback-url"]));
  });
});

describe("state changes only from our own pages (issue 9 item 6; OWASP CSRF Prevention Cheat Sheet)", () => {
  it("refuses POST /logout from another site by Sec-Fetch-Site, Referer, Origin or no sign at all; the session survives", async () => {
    const cookie = await signIn(baseUrl, "tech@tinderbox.example");
    const attempts: Record<string, string>[] = [
      { "sec-fetch-site": "cross-site" },
      { "sec-fetch-site": "same-site" },
      { referer: "https://elsewhere.example/page" },
      { origin: "https://elsewhere.example" },
      { origin: "null" },
      {},
    ];
    for (const headers of attempts) {
      const res = await fetch(`${baseUrl}/logout`, { method: "POST", headers: { cookie, ...headers }, redirect: "manual" });
      expect(res.status, JSON.stringify(headers)).toBe(403);
      expect(await res.json()).toEqual({ error: "Cross-site requests are refused." });
    }
    const still = await fetch(`${baseUrl}/calls`, { headers: { cookie }, redirect: "manual" });
    expect(still.status).toBe(200);

    // From our own page (same-origin Fetch Metadata, or our Referer) it works and ends the session.
    const out = await fetch(`${baseUrl}/logout`, {
      method: "POST",
      headers: { cookie, "sec-fetch-site": "same-origin" },
      redirect: "manual",
    });
    expect(out.status).toBe(302);
    const after = await fetch(`${baseUrl}/calls`, { headers: { cookie }, redirect: "manual" });
    expect(after.status).toBe(302);
  });

  it("refuses a cross-site UI action and a cross-site API call before any route runs", async () => {
    const cookie = await signIn(baseUrl, "lead@tinderbox.example");
    const ui = await fetch(`${baseUrl}/calls/new`, {
      method: "POST",
      headers: { cookie, "sec-fetch-site": "cross-site", "content-type": "application/x-www-form-urlencoded" },
      body: "symptom=made+by+another+site",
      redirect: "manual",
    });
    expect(ui.status).toBe(403);
    const api = await fetch(`${baseUrl}/api/trees`, {
      method: "POST",
      headers: { cookie, referer: "https://elsewhere.example/" },
      body: "{}",
    });
    expect(api.status).toBe(403);
    expect(await api.json()).toEqual({ error: "Cross-site requests are refused." });
  });

  it("a page's action sent JSON or text is refused with 415 before it runs, and one with no body reads as an empty form (never a 500)", async () => {
    const cookie = await signIn(baseUrl, "lead@tinderbox.example");
    for (const [path, body, type] of [
      ["/calls/new", JSON.stringify({ symptom: "sent as JSON" }), "application/json"],
      ["/customers/new.data", JSON.stringify({ name: "x" }), "application/json"],
      ["/meters", "name=plain", "text/plain"],
    ] as const) {
      const res = await fetch(`${baseUrl}${path}`, {
        method: "POST",
        headers: { cookie, origin: baseUrl, "content-type": type },
        body,
        redirect: "manual",
      });
      expect(res.status, path).toBe(415);
    }
    // No body type: an empty form, so the form's own field errors (a unit to choose, a symptom).
    const empty = await fetch(`${baseUrl}/calls/new`, { method: "POST", headers: { cookie, origin: baseUrl }, redirect: "manual" });
    expect(empty.status).toBe(400);
    const form = await fetch(`${baseUrl}/calls/new`, {
      method: "POST",
      headers: { cookie, origin: baseUrl, "content-type": "application/x-www-form-urlencoded" },
      body: "symptom=x",
      redirect: "manual",
    });
    expect(form.status).toBe(400);
  });

  it("a GET to an API route that only takes POST answers 405 JSON with Allow: POST (RFC 9110 §15.5.6)", async () => {
    const cookie = await signIn(baseUrl, "tech@tinderbox.example");
    for (const path of [
      "/api/runs/00000000-0000-4000-8000-000000000000/steps",
      "/api/reports/00000000-0000-4000-8000-000000000000/send",
      "/api/trees/00000000-0000-4000-8000-000000000000/draft",
    ]) {
      const res = await fetch(`${baseUrl}${path}`, { headers: { cookie } });
      expect(res.status, path).toBe(405);
      expect(res.headers.get("allow"), path).toBe("POST");
      expect(await res.json(), path).toEqual({ error: "Use POST." });
    }
  });
});

describe("page security headers (issue 9 item 8)", () => {
  it("every page has a CSP whose nonce is on every script and new on every response", async () => {
    const nonces: string[] = [];
    for (let i = 0; i < 2; i++) {
      const res = await fetch(`${baseUrl}/login`);
      const csp = res.headers.get("content-security-policy") ?? "";
      // OWASP CSP Cheat Sheet: nonce-based script-src, object-src 'none', base-uri, frame-ancestors 'none'.
      expect(csp).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]{22,}'/);
      expect(csp).toContain("frame-ancestors 'none'");
      expect(csp).toContain("object-src 'none'");
      expect(csp).not.toMatch(/script-src[^;]*'unsafe-inline'/);
      const nonce = /'nonce-([^']+)'/.exec(csp)![1]!;
      const html = await res.text();
      const scripts = html.match(/<script\b[^>]*>/g) ?? [];
      expect(scripts.length).toBeGreaterThan(0);
      for (const tag of scripts) expect(tag).toContain(`nonce="${nonce}"`);
      nonces.push(nonce);
    }
    expect(nonces[0]).not.toBe(nonces[1]);
  });

  it("allows the camera on the runner only; no HSTS over plain HTTP", async () => {
    const login = await fetch(`${baseUrl}/login`);
    expect(login.headers.get("permissions-policy")).toContain("camera=()");
    expect(login.headers.get("strict-transport-security")).toBeNull();
    const runner = await fetch(`${baseUrl}/runs/00000000-0000-0000-0000-000000000000`, { redirect: "manual" });
    expect(runner.headers.get("permissions-policy")).toContain("camera=(self)");
    expect(runner.headers.get("permissions-policy")).toContain("microphone=()");
    const api = await fetch(`${baseUrl}/api/trees`);
    expect(api.headers.get("content-security-policy")).toBe("default-src 'none'; frame-ancestors 'none'");
    expect(api.headers.get("x-content-type-options")).toBe("nosniff");
  });

  it("pages hydrate and run under the CSP with no violation (Chromium)", async () => {
    let browser: Browser | undefined;
    try {
      browser = await launchBrowser();
      const violations: string[] = [];
      const problems: string[] = [];
      for (const [email, size, paths] of [
        ["tech@tinderbox.example", PHONE, ["/calls", "/calls/all", "/trees"]],
        ["owner@tinderbox.example", LAPTOP, ["/overview", "/people", "/customers", "/meters", "/outbox", "/audit"]],
      ] as const) {
        const context = await browser.newContext({ viewport: size });
        await context.addInitScript(() => {
          document.addEventListener("securitypolicyviolation", (e) => {
            (window as unknown as { __csp: string[] }).__csp ??= [];
            (window as unknown as { __csp: string[] }).__csp.push(`${e.violatedDirective} ${e.blockedURI}`);
          });
        });
        const page = await context.newPage();
        page.on("pageerror", (e) => problems.push(e.message));
        page.on("console", (m) => {
          if (m.type() === "error" && /Content Security Policy|hydrat/i.test(m.text())) problems.push(m.text().slice(0, 300));
        });
        await signInAs(page, baseUrl, email);
        await page.waitForURL((u) => !u.pathname.startsWith("/login"));
        for (const path of paths) {
          await page.goto(`${baseUrl}${path}`);
          await page.waitForLoadState("networkidle");
          // Hydrated: React Router's client router is running (it only starts when its scripts ran).
          await page.waitForFunction(() =>
            Boolean((window as unknown as { __reactRouterRouteModules?: unknown }).__reactRouterRouteModules),
          );
          violations.push(
            ...(await page.evaluate(() => (window as unknown as { __csp?: string[] }).__csp ?? [])).map((v) => `${path}: ${v}`),
          );
        }
        await page.screenshot({ path: screenshotPath(`server-csp-${email.split("@")[0]}`) });
        await context.close();
      }
      expect(violations).toEqual([]);
      expect(problems).toEqual([]);
    } finally {
      await browser?.close();
    }
  });
});

describe("HSTS behind a TLS proxy, request ids and the request log (issue 9 item 8, 'keep it so')", () => {
  let server: Started;
  beforeAll(async () => {
    server = await startServer({ TRUST_PROXY: "1" });
  });
  afterAll(() => server?.stop());

  it("sends HSTS when the trusted proxy says the client came over https (RFC 6797 §7.2: never over plain HTTP)", async () => {
    const tls = await fetch(`${server.url}/login`, { headers: { "x-forwarded-proto": "https" } });
    expect(tls.headers.get("strict-transport-security")).toMatch(/^max-age=\d{7,}/);
    const plain = await fetch(`${server.url}/login`);
    expect(plain.headers.get("strict-transport-security")).toBeNull();
    // Without TRUST_PROXY the same header is ignored (the shared test server runs without it).
    const untrusted = await fetch(`${baseUrl}/login`, { headers: { "x-forwarded-proto": "https" } });
    expect(untrusted.headers.get("strict-transport-security")).toBeNull();
  });

  it("a same-origin POST behind the proxy is judged against the https origin the browser saw", async () => {
    const host = new URL(server.url).host;
    const res = await fetch(`${server.url}/logout`, {
      method: "POST",
      headers: { "x-forwarded-proto": "https", origin: `https://${host}` },
      redirect: "manual",
    });
    expect(res.status).toBe(302);
    const wrong = await fetch(`${server.url}/logout`, {
      method: "POST",
      headers: { "x-forwarded-proto": "https", origin: `http://${host}` },
      redirect: "manual",
    });
    expect(wrong.status).toBe(403);
  });

  it("logs one JSON line per request with method, route pattern, status, time and the id sent back; no secrets", async () => {
    const cookie = await signIn(server.url, "tech@tinderbox.example");
    const token = "invite-token-that-must-not-be-logged-7f3a";
    const res = await fetch(`${server.url}/invite/${token}?code=query-secret-91`, {
      headers: { cookie, authorization: "Bearer header-secret-55" },
    });
    const id = res.headers.get("x-request-id");
    expect(id).toMatch(/^[0-9a-f-]{36}$/);
    // A trusted proxy's id is kept, so one id follows the request through both.
    const proxied = await fetch(`${server.url}/healthz`, { headers: { "x-request-id": "lb-0001-abcdef" } });
    expect(proxied.headers.get("x-request-id")).toBe("lb-0001-abcdef");
    await new Promise((r) => setTimeout(r, 300));
    const lines = server
      .output()
      .split("\n")
      .filter((l) => l.startsWith("{"))
      .map((l) => JSON.parse(l) as Record<string, unknown>);
    const line = lines.find((l) => l.reqId === id && l.msg === "request");
    expect(line).toMatchObject({ method: "GET", route: "/invite/:token", status: res.status });
    expect(typeof line!.ms).toBe("number");
    expect(lines.some((l) => l.reqId === "lb-0001-abcdef")).toBe(true);
    const login = lines.find((l) => l.msg === "request" && l.method === "POST" && l.route === "/login");
    expect(login).toMatchObject({ status: 302 });
    const all = server.output();
    for (const secret of [token, "query-secret-91", "header-secret-55", DEMO_PASSWORD, cookie.split("=")[1]!.slice(0, 40)])
      expect(all).not.toContain(secret);
  });
});

describe("a database outage answers 503 and recovers without a restart (issue 9 item 5)", () => {
  let relay: DatabaseRelay;
  let server: Started;
  beforeAll(async () => {
    let url: string;
    ({ relay, url } = await relayedDatabase());
    server = await startServer({ DATABASE_URL: url, DB_ACQUIRE_TIMEOUT_MS: "1500" });
  });
  afterEach(() => relay.up()); // a failed check must not leave the next one without a database
  afterAll(async () => {
    await server?.stop();
    await relay?.down();
  });

  it("pages say so in the user's words, API routes answer JSON {error, code}, and all is well once the database is back", async () => {
    const cookie = await signIn(server.url, "lead@tinderbox.example");
    expect((await fetch(`${server.url}/trees`, { headers: { cookie } })).status).toBe(200);

    await relay.down();
    const page = await fetch(`${server.url}/trees`, { headers: { cookie } });
    expect(page.status).toBe(503);
    expect(page.headers.get("content-type")).toContain("text/html");
    const html = await page.text();
    expect(html).toContain("Cluepath can&#x27;t reach its database; what you typed is kept — try again in a minute.");

    const api = await fetch(`${server.url}/api/trees`, { headers: { cookie } });
    expect(api.status).toBe(503);
    expect(await api.json()).toEqual({
      error: "Cluepath can't reach its database; what you typed is kept — try again in a minute.",
      code: "db_unavailable",
    });

    // A page's form post answers the same page; a resource route's post (sign-out) the JSON.
    const form = await fetch(`${server.url}/calls/new`, {
      method: "POST",
      headers: { cookie, origin: server.url, "content-type": "application/x-www-form-urlencoded" },
      body: "symptom=no+heat",
      redirect: "manual",
    });
    expect(form.status).toBe(503);
    expect(await form.text()).toContain("Cluepath can&#x27;t reach its database");
    const out = await fetch(`${server.url}/logout`, { method: "POST", headers: { cookie, origin: server.url }, redirect: "manual" });
    expect(out.status).toBe(503);
    expect(await out.json()).toMatchObject({ code: "db_unavailable" });
    expect((await fetch(`${server.url}/healthz`)).status).toBe(503);

    await relay.up();
    let back = 0;
    for (let i = 0; i < 20 && back !== 200; i++) {
      back = (await fetch(`${server.url}/trees`, { headers: { cookie } })).status;
      if (back !== 200) await new Promise((r) => setTimeout(r, 250));
    }
    expect(back).toBe(200);
    expect((await fetch(`${server.url}/api/trees`, { headers: { cookie } })).status).toBe(200);
    expect(server.child.exitCode).toBeNull();
  });

  it("shows the outage page in a browser", async () => {
    const browser = await launchBrowser();
    try {
      const context = await browser.newContext({ viewport: PHONE });
      const page = await context.newPage();
      await signInAs(page, server.url, "lead@tinderbox.example");
      await page.waitForURL(`${server.url}/authoring`);
      await relay.down();
      const res = await page.goto(`${server.url}/trees`);
      expect(res?.status()).toBe(503);
      await page.getByRole("heading", { level: 1, name: "Can't reach the database" }).waitFor();
      await page.screenshot({ path: screenshotPath("server-db-outage-phone") });
      await relay.up();
      await page.getByRole("link", { name: "Try again" }).click();
      await page.waitForURL(`${server.url}/trees`);
      await page.getByRole("heading", { level: 1 }).filter({ hasNotText: "Can't reach the database" }).waitFor();
      await context.close();
    } finally {
      await browser.close();
    }
  });
});

describe("configuration is checked at boot (issue 8 item 8)", () => {
  it("a bad value stops the start with a message naming the variable", async () => {
    for (const [name, value] of [
      ["PORT", "eighty"],
      ["TRUST_PROXY", "yes"],
      ["DATABASE_URL", "postgres://127.0.0.1/cluepath"],
      ["DB_ACQUIRE_TIMEOUT_MS", "-5"],
    ] as const) {
      const { code, output } = await bootFails({ [name]: value });
      expect(code, output).toBe(1);
      expect(output).toContain(`${name}:`);
    }
  });

  it("production without AUTH_SECRET does not start", async () => {
    const { code, output } = await bootFails({ AUTH_SECRET: "" });
    expect(code).toBe(1);
    expect(output).toContain("AUTH_SECRET:");
  });
});

describe("compressed answers where the client accepts them (issue 14)", () => {
  /** GET with exactly these headers; the raw bytes and headers as sent (fetch would decode them). */
  function rawGet(path: string, headers: Record<string, string>): Promise<{ status: number; headers: IncomingHttpHeaders; body: Buffer }> {
    return new Promise((resolve, reject) => {
      const req = httpGet(`${baseUrl}${path}`, { headers }, (res) => {
        const chunks: Buffer[] = [];
        res.on("data", (c: Buffer) => chunks.push(c));
        res.on("end", () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
      });
      req.on("error", reject);
    });
  }

  it("pages and JSON in brotli or gzip as Accept-Encoding asks (RFC 9110 §12.5.3), the same content as uncompressed; tiny answers as they are", async () => {
    const cookie = await signIn(baseUrl, "lead@tinderbox.example");
    const plain = await rawGet("/api/trees", { cookie, "accept-encoding": "identity" });
    expect(plain.status).toBe(200);
    expect(plain.headers["content-encoding"]).toBeUndefined();
    expect(plain.headers.vary).toMatch(/accept-encoding/i);
    expect(plain.body.length).toBeGreaterThan(1024);

    const br = await rawGet("/api/trees", { cookie, "accept-encoding": "gzip, deflate, br" });
    expect(br.headers["content-encoding"]).toBe("br");
    expect(Number(br.headers["content-length"])).toBe(br.body.length);
    expect(br.headers.vary).toMatch(/accept-encoding/i);
    expect(JSON.parse(brotliDecompressSync(br.body).toString())).toEqual(JSON.parse(plain.body.toString()));
    expect(br.body.length).toBeLessThan(plain.body.length / 2);

    const gz = await rawGet("/api/trees", { cookie, "accept-encoding": "gzip, deflate" });
    expect(gz.headers["content-encoding"]).toBe("gzip");
    expect(JSON.parse(gunzipSync(gz.body).toString())).toEqual(JSON.parse(plain.body.toString()));

    // A streamed page: the whole document arrives, compressed.
    const page = await rawGet("/calls/all", { cookie, "accept-encoding": "br;q=0, gzip" });
    expect(page.status).toBe(200);
    expect(page.headers["content-encoding"]).toBe("gzip");
    const html = gunzipSync(page.body).toString();
    expect(html).toMatch(/^<!DOCTYPE html>/i);
    expect(html).toMatch(/<\/html>\s*$/);

    // Under 1 KB it is not worth it; images and other binaries are never touched.
    const health = await rawGet("/healthz", { "accept-encoding": "gzip, br" });
    expect(health.headers["content-encoding"]).toBeUndefined();
    expect(JSON.parse(health.body.toString())).toEqual({ ok: true, db: "up" });
  });
});
