// The hot path side by side (issue 14): the framework's JSON floor, the database floor, persisted
// steps with a 6- and a 60-entry run log, GET /api/runs/:id, and the runner page against a bare SSR
// page — 32 concurrent clients, medians of interleaved rounds — with SQL statements per request and
// the app server's CPU per request. Starts its own stack on loopback and prints one Markdown table.
// A benchmark, not a test: it reports figures and targets, it does not fail on them.
//
//   npm run bench:app            (BENCH_ROUNDS=3, BENCH_SECONDS=4, STACK_PORT_BASE=… to pin ports,
//                                 BENCH_ONLY=json,step6,step60,api,bare,runner,db for a subset,
//                                 STACK_CPU_PROF=DIR for the server's CPU profile)
//
// The two floors are not app routes: the benchmark builds a copy of the app with two routes of its
// own — /__bench/json (a resource route returning JSON, no database) and /__bench/hello (a page with
// one heading, no loader) — and measures everything on that one build and server.
//
// App code imported: none here; scripts/lib/field.ts takes DEMO_PASSWORD from db/demo.ts.
import autocannon from "autocannon";
import mysql from "mysql2/promise";
import { readdirSync, readFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import { join } from "node:path";
import { gzipSync } from "node:zlib";
import { cloneRun, extendTo, nextKind, startField, stepBody, stepHeaders, techSessions, type Field } from "./lib/field";
import { cpuSeconds, log, Stack } from "./lib/stack";

const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 3);
const SECONDS = Number(process.env.BENCH_SECONDS ?? 4);
const CLIENTS = 32;
const VIEW_LOG = 20;
const BROWSER = { "accept-encoding": "gzip, deflate, br" };

const extraRoutes = {
  "/__bench/json": {
    file: "__bench-json.ts",
    source: `export function loader() {\n  return Response.json({ ok: true, at: Date.now() });\n}\n`,
  },
  "/__bench/hello": { file: "__bench-hello.tsx", source: `export default function Hello() {\n  return <main><h1>Hello</h1></main>;\n}\n` },
};

type Round = { rps: number; p50: number; p95: number; cpuMs: number; dbCpuMs: number; bytes: number; failed: number; recycled: number };
type Scenario = { key: string; label: string; round: (seconds: number) => Promise<Round> };

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};
const quantile = (sorted: number[], q: number) => sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? NaN;

/** Fresh runs for step rounds: each client takes one, posts undo, reading, undo, reading, and hands it back. */
class RunQueue {
  fresh: string[] = [];
  recycled: string[] = [];
  recycledTaken = 0;
  private n = 0;
  constructor(
    private readonly template: string,
    private readonly cookies: string[],
    private readonly pool: mysql.Pool,
  ) {}
  async topUp(count: number) {
    if (this.fresh.length < count) this.fresh.push(...(await cloneRun(this.pool, this.template, count - this.fresh.length)));
  }
  take(): { run: string; cookie: string } {
    let run = this.fresh.pop();
    if (!run) {
      // Out of fresh runs: reuse one whose cycle finished (its log is 4 entries longer).
      run = this.recycled.shift();
      this.recycledTaken++;
    }
    if (!run) throw new Error("no run left for a step round");
    return { run, cookie: this.cookies[this.n++ % this.cookies.length]! };
  }
}

async function main() {
  log(`bench:app — ${ROUNDS} rounds of ${SECONDS} s per scenario, ${CLIENTS} clients`);
  const load0 = loadavg()[0]!;
  const stack = await Stack.start({ name: "bench", extraRoutes });
  try {
    await bench(stack, load0);
  } finally {
    await stack.stop();
  }
}

async function bench(stack: Stack, load0: number) {
  const setupStarted = Date.now();
  const field: Field & { runId: string } = await startField(stack);
  const cookies = await techSessions(stack, CLIENTS);
  const pool = stack.sql();

  // Templates with a 6-, 20- and 60-entry log; the 20-entry ones are what the GET scenarios read.
  const t6 = field.runId;
  await extendTo(field, t6, 4, 6);
  const [t20] = await cloneRun(pool, t6, 1);
  await extendTo(field, t20!, 6, VIEW_LOG);
  const [t60] = await cloneRun(pool, t20!, 1);
  await extendTo(field, t60!, VIEW_LOG, 60);
  const views = await cloneRun(pool, t20!, CLIENTS);
  const queues = { 6: new RunQueue(t6, cookies, pool), 60: new RunQueue(t60!, cookies, pool) };

  // The database floor's own table, next to the app's database on the same server.
  const floorUrl = stack.dbUrl.replace(/\/[^/]+$/, "/bench_floor");
  await pool.query("CREATE DATABASE IF NOT EXISTS bench_floor");
  await pool.query("CREATE TABLE IF NOT EXISTS bench_floor.item (id VARCHAR(36) PRIMARY KEY, body VARCHAR(200) NOT NULL) ENGINE=InnoDB");
  const floorPool = mysql.createPool({ uri: floorUrl, connectionLimit: CLIENTS });
  log(`setup (sessions, template runs) in ${((Date.now() - setupStarted) / 1000).toFixed(1)} s`);

  /** One autocannon round against the app, with the server's and MariaDB's CPU over it. */
  async function httpRound(seconds: number, requests: autocannon.Request[]): Promise<Omit<Round, "recycled">> {
    const latencies: number[] = [];
    let bytes = 0;
    let failed = 0;
    const cpu0 = cpuSeconds(stack.serverPid);
    const db0 = cpuSeconds(stack.dbPid());
    const t0 = performance.now();
    const result = await new Promise<autocannon.Result>((resolve, reject) => {
      const instance = autocannon({ url: stack.baseUrl, connections: CLIENTS, duration: seconds, requests, timeout: 30 }, (e, r) =>
        e ? reject(e) : resolve(r),
      );
      instance.on("response", (_client, status, resBytes, ms) => {
        if (status >= 200 && status < 300) latencies.push(ms);
        else failed++;
        bytes += resBytes;
      });
    });
    const elapsed = (performance.now() - t0) / 1000;
    const cpu = cpuSeconds(stack.serverPid) - cpu0;
    const dbCpu = cpuSeconds(stack.dbPid()) - db0;
    failed += result.errors; // socket errors and timeouts (non-2xx answers are counted above)
    latencies.sort((a, b) => a - b);
    const n = latencies.length + failed;
    return {
      rps: latencies.length / elapsed,
      p50: quantile(latencies, 0.5),
      p95: quantile(latencies, 0.95),
      cpuMs: (cpu * 1000) / Math.max(1, n),
      dbCpuMs: (dbCpu * 1000) / Math.max(1, n),
      bytes: bytes / Math.max(1, n),
      failed,
    };
  }

  let k = 0;
  const getEach = (path: (i: number) => string, accept: string): autocannon.Request[] => [
    {
      setupRequest: (req) => {
        const i = k++ % CLIENTS;
        return { ...req, method: "GET", path: path(i), headers: { cookie: cookies[i]!, accept, ...BROWSER } };
      },
    },
  ];

  const stepRates: Record<6 | 60, number> = { 6: 300, 60: 300 };
  const stepScenario = (log: 6 | 60): Scenario => ({
    key: `step${log}`,
    label: `persisted step, POST /api/runs/:id/steps, log of ${log} entries`,
    round: async (seconds) => {
      const q = queues[log];
      q.recycledTaken = 0;
      await q.topUp(Math.ceil((stepRates[log] * seconds * 1.5) / 4) + CLIENTS * 2);
      const requests: autocannon.Request[] = [0, 1, 2, 3].map((i) => ({
        setupRequest: (req, ctx: { run?: string; cookie?: string; failed?: boolean }) => {
          if (i === 0) Object.assign(ctx, q.take());
          return {
            ...req,
            method: "POST",
            path: `/api/runs/${ctx.run}/steps`,
            headers: stepHeaders(stack, ctx.cookie!),
            body: stepBody(nextKind(log + i), field.meterId),
          };
        },
        onResponse: (status, _body, ctx: { run?: string; failed?: boolean }) => {
          if (status < 200 || status >= 300) ctx.failed = true;
          else if (i === 3 && !ctx.failed) q.recycled.push(ctx.run!);
        },
      }));
      const r = await httpRound(seconds, requests);
      stepRates[log] = Math.max(stepRates[log], r.rps);
      return { ...r, recycled: q.recycledTaken };
    },
  });

  const all: Scenario[] = [
    {
      key: "json",
      label: "framework floor: a resource route returning JSON, no database (/__bench/json)",
      round: async (s) => ({
        ...(await httpRound(
          s,
          getEach(() => "/__bench/json", "application/json"),
        )),
        recycled: 0,
      }),
    },
    {
      key: "db",
      label: `database floor: one durable INSERT + SELECT by key, ${CLIENTS}-connection pool (mysql2)`,
      round: async (seconds) => {
        const latencies: number[] = [];
        const db0 = cpuSeconds(stack.dbPid());
        const t0 = performance.now();
        const end = t0 + seconds * 1000;
        await Promise.all(
          Array.from({ length: CLIENTS }, async () => {
            while (performance.now() < end) {
              const s = performance.now();
              const id = crypto.randomUUID();
              await floorPool.query("INSERT INTO item (id, body) VALUES (?, ?)", [id, "a reading of 208 V"]);
              await floorPool.query("SELECT id, body FROM item WHERE id = ?", [id]);
              latencies.push(performance.now() - s);
            }
          }),
        );
        const elapsed = (performance.now() - t0) / 1000;
        latencies.sort((a, b) => a - b);
        const dbCpu = cpuSeconds(stack.dbPid()) - db0;
        return {
          rps: latencies.length / elapsed,
          p50: quantile(latencies, 0.5),
          p95: quantile(latencies, 0.95),
          cpuMs: NaN,
          dbCpuMs: (dbCpu * 1000) / latencies.length,
          bytes: NaN,
          failed: 0,
          recycled: 0,
        };
      },
    },
    stepScenario(6),
    stepScenario(60),
    {
      key: "api",
      label: `GET /api/runs/:id (log of ${VIEW_LOG} entries)`,
      round: async (s) => ({
        ...(await httpRound(
          s,
          getEach((i) => `/api/runs/${views[i]}`, "application/json"),
        )),
        recycled: 0,
      }),
    },
    {
      key: "bare",
      label: "a bare SSR page with one heading (/__bench/hello)",
      round: async (s) => ({
        ...(await httpRound(
          s,
          getEach(() => "/__bench/hello", "text/html"),
        )),
        recycled: 0,
      }),
    },
    {
      key: "runner",
      label: `the runner page /runs/:id (log of ${VIEW_LOG} entries)`,
      round: async (s) => ({
        ...(await httpRound(
          s,
          getEach((i) => `/runs/${views[i]}`, "text/html"),
        )),
        recycled: 0,
      }),
    },
  ];

  // BENCH_ONLY=step6,json measures only those (a quicker look while working; the ratios need both sides).
  const only = process.env.BENCH_ONLY?.split(",").map((k) => k.trim());
  const scenarios = only ? all.filter((s) => only.includes(s.key)) : all;
  log("warm-up round");
  for (const s of scenarios) {
    const r = await s.round(Math.min(1.5, SECONDS));
    if (r.failed)
      throw new Error(`${s.key}: ${r.failed} failed requests in the warm-up; the server said:\n${stack.serverOutput().slice(-2000)}`);
  }
  const rounds = new Map<string, Round[]>(scenarios.map((s) => [s.key, []]));
  for (let r = 1; r <= ROUNDS; r++) {
    log(`round ${r} of ${ROUNDS}`);
    for (const s of scenarios) rounds.get(s.key)!.push(await s.round(SECONDS));
  }
  floorPool.end().catch(() => {});

  const sql = await statementsPerRequest(stack, field, queues[6], views[0]!, cookies[0]!);
  const runnerEncoding = (await fetch(`${stack.baseUrl}/runs/${views[0]}`, { headers: { cookie: cookies[0]!, ...BROWSER } })).headers.get(
    "content-encoding",
  );
  report(scenarios, rounds, sql, { load0, runnerEncoding, weight: runnerWeight(stack.clientDir) });
}

type RunnerWeight = { sharedKb: number; ownKb: number; fontFiles: number };

/**
 * The runner's download from the build's client manifest, gzip, kB = 1000 bytes: the part every
 * page loads (the entry, the root route and their imports), the runner route's own modules beyond
 * that, and the font files the root stylesheet names.
 */
function runnerWeight(clientDir: string): RunnerWeight {
  const assets = join(clientDir, "assets");
  const file = readdirSync(assets).find((f) => /^manifest-\w+\.js$/.test(f));
  if (!file) throw new Error(`no client manifest in ${assets}`);
  const text = readFileSync(join(assets, file), "utf8");
  type Entry = { module: string; imports?: string[]; css?: string[] };
  const manifest = JSON.parse(text.slice(text.indexOf("{"), text.lastIndexOf("}") + 1)) as { entry: Entry; routes: Record<string, Entry> };
  const files = (e: Entry) => [e.module, ...(e.imports ?? [])];
  const gz = (url: string) => gzipSync(readFileSync(join(clientDir, url))).length / 1000;
  const root = manifest.routes.root!;
  const shared = new Set([...files(manifest.entry), ...files(root)]);
  const own = files(manifest.routes["routes/runs.$runId"]!).filter((f) => !shared.has(f));
  const fonts = new Set((root.css ?? []).flatMap((css) => readFileSync(join(clientDir, css), "utf8").match(/[\w./-]+\.woff2?/g) ?? []));
  const sum = (xs: Iterable<string>) => [...xs].reduce((a, f) => a + gz(f), 0);
  return { sharedKb: sum(shared), ownKb: sum(own), fontFiles: fonts.size };
}

type Statements = { total: number; detail: string };

/** SQL statements one request costs, from MariaDB's Com_* counters just before and after it. */
async function statementsPerRequest(stack: Stack, field: Field, q: RunQueue, viewRun: string, cookie: string) {
  const conn = await stack.sql().getConnection();
  const counters = async () => {
    const [rows] = await conn.query<mysql.RowDataPacket[]>("SHOW GLOBAL STATUS LIKE 'Com\\_%'");
    return new Map(rows.map((r) => [String(r.Variable_name).slice(4), Number(r.Value)]));
  };
  async function once(request: () => Promise<Response>): Promise<Statements> {
    const before = await counters();
    const res = await request();
    await res.arrayBuffer();
    if (!res.ok) throw new Error(`counting statements: ${res.status}`);
    const after = await counters();
    const parts: string[] = [];
    let total = 0;
    for (const [name, v] of after) {
      const d = v - (before.get(name) ?? 0) - (name === "show_status" ? 1 : 0); // our own SHOW STATUS
      if (d > 0) {
        total += d;
        parts.push(`${d} ${name}`);
      }
    }
    return { total, detail: parts.join(", ") };
  }
  const middle = (xs: Statements[]) => [...xs].sort((a, b) => a.total - b.total)[xs.length >> 1]!;
  async function median5(request: () => Promise<Response>): Promise<Statements> {
    const xs: Statements[] = [];
    for (let i = 0; i < 5; i++) xs.push(await once(request));
    return middle(xs);
  }
  const get = (path: string, accept: string) => () => fetch(`${stack.baseUrl}${path}`, { headers: { cookie, accept, ...BROWSER } });
  const post = (run: string, kind: "undo" | "reading") => () =>
    fetch(`${stack.baseUrl}/api/runs/${run}/steps`, {
      method: "POST",
      headers: stepHeaders(stack, field.cookie),
      body: stepBody(kind, field.meterId),
    });
  // Steps on fresh 6-entry runs: an undo, then the reading.
  await q.topUp(5);
  const undos: Statements[] = [];
  const readings: Statements[] = [];
  for (let i = 0; i < 5; i++) {
    const { run } = q.take();
    undos.push(await once(post(run, "undo")));
    readings.push(await once(post(run, "reading")));
  }
  const out = {
    json: await median5(get("/__bench/json", "application/json")),
    step6: middle(readings),
    undo: middle(undos),
    api: await median5(get(`/api/runs/${viewRun}`, "application/json")),
    bare: await median5(get("/__bench/hello", "text/html")),
    runner: await median5(get(`/runs/${viewRun}`, "text/html")),
  };
  conn.release();
  return out;
}

function report(
  scenarios: Scenario[],
  rounds: Map<string, Round[]>,
  sql: Record<"json" | "step6" | "undo" | "api" | "bare" | "runner", Statements>,
  extra: { load0: number; runnerEncoding: string | null; weight: RunnerWeight },
) {
  const m = (key: string, f: keyof Round) => median((rounds.get(key) ?? []).map((r) => r[f]));
  const rps = (key: string) => m(key, "rps");
  const p50 = (key: string) => m(key, "p50");
  const x = (v: number) => `${v.toFixed(v < 1 ? 3 : 2)}×`;
  const num = (v: number, digits = 0) =>
    Number.isFinite(v) ? v.toLocaleString("en-US", { maximumFractionDigits: digits, minimumFractionDigits: digits }) : "—";
  const ms = (v: number) => (Number.isFinite(v) ? `${num(v, v < 10 ? 1 : 0)} ms` : "—");
  // Throughput ratios, and the same ratio of server CPU per request, which holds up better when
  // other work shares the machine (the server is one thread: 1000 / CPU ms is its ceiling per core).
  const cpu = (key: string) => m(key, "cpuMs");
  const vs = (key: string, floor: string) => ({ rps: rps(key) / rps(floor), cpu: cpu(floor) / cpu(key) });
  const both = (r: { rps: number; cpu: number }) => `${x(r.rps)} (by CPU ${x(r.cpu)})`;
  const ratios = { step6: vs("step6", "json"), step60: vs("step60", "json"), api: vs("api", "json"), runner: vs("runner", "bare") };
  const ratio: Record<string, string> = {
    step6: `${both(ratios.step6)} the JSON floor; p50 ${x(p50("step6") / p50("db"))} the DB floor`,
    step60: `${both(ratios.step60)} the JSON floor; p50 ${x(p50("step60") / p50("db"))} the DB floor`,
    api: `${both(ratios.api)} the JSON floor`,
    runner: `${both(ratios.runner)} the bare page`,
  };
  const sqlOf: Record<string, string> = {
    json: String(sql.json.total),
    db: "2",
    step6: `${sql.step6.total} (undo ${sql.undo.total})`,
    step60: "—",
    api: String(sql.api.total),
    bare: String(sql.bare.total),
    runner: String(sql.runner.total),
  };
  const lines = [
    `bench:app — ${new Date().toISOString().slice(0, 10)}, Node ${process.version}, ${cpus().length} cores, ${CLIENTS} clients, medians of ${ROUNDS} interleaved rounds of ${SECONDS} s (load average ${extra.load0.toFixed(2)} before, ${loadavg()[0]!.toFixed(2)} after)`,
    "",
    "| what | req/s | p50 | p95 | ratio | server CPU ms/req | MariaDB CPU ms/req | SQL statements/req | KB/response (with headers) |",
    "|---|--:|--:|--:|---|--:|--:|--:|--:|",
    ...scenarios.map((s) =>
      [
        s.label,
        num(rps(s.key)),
        ms(p50(s.key)),
        ms(m(s.key, "p95")),
        ratio[s.key] ?? "—",
        num(m(s.key, "cpuMs"), 2),
        num(m(s.key, "dbCpuMs"), 2),
        sqlOf[s.key] ?? "—",
        num(m(s.key, "bytes") / 1000, 1),
      ]
        .join(" | ")
        .replace(/^/, "| ")
        .replace(/$/, " |"),
    ),
    "",
    `SQL statements per reading step: ${sql.step6.total} (${sql.step6.detail}); per undo: ${sql.undo.total} (${sql.undo.detail}); GET /api/runs/:id: ${sql.api.total} (${sql.api.detail}); runner page: ${sql.runner.total} (${sql.runner.detail}).`,
    "",
    "| target (issue 14) | measured | by server CPU per request | met |",
    "|---|--:|--:|---|",
  ];
  const target = (what: string, measured: string, byCpu: string, ok: boolean) =>
    lines.push(`| ${what} | ${measured} | ${byCpu} | ${ok ? "yes" : "no"} |`);
  for (const log of ["6", "60"] as const) {
    const r = ratios[`step${log}`];
    target(`persisted step ≥ 0.30× the JSON floor (log of ${log})`, x(r.rps), x(r.cpu), r.rps >= 0.3);
    const p = p50(`step${log}`) / p50("db");
    target(`persisted step p50 ≤ 5× the DB floor's p50 (log of ${log})`, x(p), "—", p <= 5);
  }
  target("GET /api/runs/:id ≥ 0.40× the JSON floor", x(ratios.api.rps), x(ratios.api.cpu), ratios.api.rps >= 0.4);
  target("runner page ≥ 0.40× the bare SSR page", x(ratios.runner.rps), x(ratios.runner.cpu), ratios.runner.rps >= 0.4);
  target("SQL statements per reading step ≤ 6", String(sql.step6.total), "—", sql.step6.total <= 6);
  target("runner HTML compressed (Accept-Encoding: gzip, deflate, br)", extra.runnerEncoding ?? "none", "—", extra.runnerEncoding !== null);
  const w = extra.weight;
  target(
    `runner route's own JavaScript beyond the shared part (${w.sharedKb.toFixed(1)} kB) ≤ 40 kB gzip`,
    `${w.ownKb.toFixed(1)} kB`,
    "—",
    w.ownKb <= 40,
  );
  target("font files every page loads (the root stylesheet's) ≤ 1", String(w.fontFiles), "—", w.fontFiles <= 1);
  const failed = scenarios.map((s) => [s.key, rounds.get(s.key)!.reduce((a, r) => a + r.failed, 0)] as const).filter(([, n]) => n > 0);
  const recycled = ["step6", "step60"]
    .map((k) => [k, (rounds.get(k) ?? []).reduce((a, r) => a + r.recycled, 0)] as const)
    .filter(([, n]) => n > 0);
  if (failed.length) lines.push("", `Failed requests (not counted above): ${failed.map(([k, n]) => `${k} ${n}`).join(", ")}.`);
  if (recycled.length)
    lines.push("", `Runs reused after their cycle (log 4 entries longer): ${recycled.map(([k, n]) => `${k} ${n}`).join(", ")}.`);
  console.log(lines.join("\n"));
}

main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
