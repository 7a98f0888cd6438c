// The cluster tests' harness: bring a setup up and down with scripts/cluster, add technicians, and
// drive them through HAProxy the way the phone runner does (sign in on the /login form, open a call,
// start a run on it, post each step with its own idempotency key and retry it on 5xx or a dropped
// connection until it is acknowledged). Every acknowledgement is recorded for the read-back.
import { spawn } from "node:child_process";
import { sql } from "drizzle-orm";
import { drizzle } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import { memberships, users } from "../../db/schema";
import { DEMO_PASSWORD, DEMO_SHOP } from "../../db/demo";
import { stableId } from "../../db/seed";
import type { LogEntry } from "../../app/engine/traversal";
import { hashPassword } from "../../app/lib/password.server";
import { dbUrl, readLayout, type Layout } from "../../scripts/cluster-status";
import { ROTISSERIE_TO_CAPACITOR } from "../support/trees";

export const SHOP = stableId(DEMO_SHOP.key);
export const ROTISSERIE_UNIT = stableId("unit:larkspur-rotisserie");
export const ROTISSERIE_TREE = stableId("tree:rotisserie-uneven-heat.md");

/** Where the test's setups live; scripts/test-cluster sets both (a temporary folder, a free port block). */
export const WORK = process.env.CLUSTER_TEST_DIR ?? ".tmp/cluster-test";
export const BASE = Number(process.env.CLUSTER_TEST_BASE ?? 45000);

export type Setup = { kind: "galera" | "single"; env: Record<string, string>; layout: Layout; startOutput: string };

export function setupEnv(kind: "galera" | "single"): Record<string, string> {
  return {
    CLUSTER_DIR: `${WORK}/${kind}`,
    CLUSTER_BASE: String(kind === "galera" ? BASE : BASE + 50),
    CLUSTER_DB: kind,
    CLUSTER_SKIP_BUILD: "1",
  };
}

/** Runs scripts/cluster with the setup's environment; resolves with everything it printed. */
export function clusterScript(env: Record<string, string>, command: string, timeoutMs = 300_000): Promise<string> {
  return new Promise((resolve, reject) => {
    const child = spawn("scripts/cluster", [command], { env: { ...process.env, ...env }, stdio: ["ignore", "pipe", "pipe"] });
    let out = "";
    child.stdout.on("data", (d) => (out += d));
    child.stderr.on("data", (d) => (out += d));
    const timer = setTimeout(() => child.kill("SIGTERM"), timeoutMs);
    child.on("exit", (code) => {
      clearTimeout(timer);
      if (code === 0) resolve(out);
      else reject(new Error(`scripts/cluster ${command} exited with ${code}:\n${out}`));
    });
  });
}

export async function bringUp(kind: "galera" | "single"): Promise<Setup> {
  const env = setupEnv(kind);
  const startOutput = await clusterScript(env, "start");
  return { kind, env, layout: readLayout(`${env.CLUSTER_DIR}/cluster.json`), startOutput };
}

export async function bringDown(setup: Setup | undefined): Promise<void> {
  if (setup) await clusterScript(setup.env, "stop");
}

/** Technicians of the demo shop made for the test (the demo has one); the demo password for all. */
export async function addTechnicians(setup: Setup, count: number, prefix: string): Promise<{ email: string; id: string }[]> {
  const pool = mysql.createPool({ uri: dbUrl(setup.layout, setup.layout.nodes[0]!.port), connectionLimit: 2 });
  const db = drizzle(pool, { mode: "default" });
  const hash = await hashPassword(DEMO_PASSWORD);
  const made = Array.from({ length: count }, (_, i) => {
    const email = `${prefix}-${i + 1}@tinderbox.example`;
    return { email, id: stableId(`user:${email}`), name: `Load technician ${prefix.toUpperCase()}-${i + 1}` };
  });
  await db
    .insert(users)
    .values(made.map((t) => ({ id: t.id, email: t.email, name: t.name, passwordHash: hash })))
    .onDuplicateKeyUpdate({ set: { name: sql`name` } });
  await db
    .insert(memberships)
    .values(made.map((t) => ({ id: stableId(`membership:${t.email}`), shopId: SHOP, userId: t.id, role: "technician" as const })))
    .onDuplicateKeyUpdate({ set: { role: sql`role` } });
  await pool.end();
  return made;
}

// --- the walk ------------------------------------------------------------------------------------

export type Entry = LogEntry;

/**
 * The rotisserie call as a technician walks it (trees/rotisserie-uneven-heat.md): three cautions,
 * 208 V at the supply, one fan slow, the capacitor rated 1.5 µF read as 1.47 µF, taken back and
 * entered again as 1470 nF, the seized shaft; then `extra` pairs of "undo" and the answer again,
 * as a technician changing their mind (each one a stored step).
 */
export function rotisserieWalk(extra: number): Entry[] {
  const walk: Entry[] = [
    ...ROTISSERIE_TO_CAPACITOR,
    { type: "reading", node: "cap-measure", reading: "1.47 µF" },
    { type: "undo" },
    { type: "reading", node: "cap-measure", reading: "1470 nF" },
    { type: "answer", node: "shaft-free", answer: "stiff, gritty or seized" },
  ];
  for (let i = 0; i < extra; i++) walk.push({ type: "undo" }, { type: "answer", node: "shaft-free", answer: "stiff, gritty or seized" });
  return walk;
}

// --- the technician's client ---------------------------------------------------------------------

export type Ack = {
  tech: string;
  runId: string;
  key: string;
  entry: Entry;
  seq: number;
  verdict: string | null;
  limitsText: string | null;
  replayed: boolean;
  servedBy: string;
  firstTry: number;
  ackAt: number;
  attempts: number;
};
export type Miss = { at: number; what: string; status: string; servedBy: string };

/** Shared by every technician of one load: the clock, the acknowledgements and the failed tries. */
export class Ledger {
  readonly t0 = performance.now();
  readonly acks: Ack[] = [];
  readonly misses: Miss[] = [];
  readonly runs = new Set<string>();
  now(): number {
    return performance.now() - this.t0;
  }
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Answers that mean "try again with the same key": the server or the balancer failed, not the step. */
function retryable(status: number): boolean {
  return status >= 500;
}

export class Technician {
  private cookie = "";
  readonly calls: string[] = [];

  constructor(
    readonly email: string,
    readonly userId: string,
    readonly base: string,
    readonly ledger: Ledger,
  ) {}

  private async send(path: string, init: { method?: string; form?: Record<string, string>; json?: unknown }, timeoutMs = 20_000) {
    const headers: Record<string, string> = { origin: this.base };
    if (this.cookie) headers.cookie = this.cookie;
    let body: string | undefined;
    if (init.form) {
      headers["content-type"] = "application/x-www-form-urlencoded";
      body = new URLSearchParams(init.form).toString();
    } else if (init.json !== undefined) {
      headers["content-type"] = "application/json";
      body = JSON.stringify(init.json);
    }
    return fetch(`${this.base}${path}`, {
      method: init.method ?? "POST",
      headers,
      body,
      redirect: "manual",
      signal: AbortSignal.timeout(timeoutMs),
    });
  }

  /** Repeats `attempt` on 5xx and dropped connections until it answers otherwise or `deadlineMs` passes. */
  private async retrying(
    what: string,
    attempt: () => Promise<Response>,
    deadlineMs = 90_000,
  ): Promise<{ res: Response; attempts: number; firstTry: number }> {
    const firstTry = this.ledger.now();
    for (let attempts = 1; ; attempts++) {
      let status: string;
      let servedBy = "";
      try {
        const res = await attempt();
        servedBy = res.headers.get("x-served-by") ?? "";
        if (!retryable(res.status)) return { res, attempts, firstTry };
        status = String(res.status);
        await res.body?.cancel();
      } catch (e) {
        status = (e as { cause?: { code?: string } }).cause?.code ?? (e as Error).name ?? "error";
      }
      this.ledger.misses.push({ at: this.ledger.now(), what, status, servedBy });
      if (this.ledger.now() - firstTry > deadlineMs) throw new Error(`${what}: no answer within ${deadlineMs} ms (last: ${status})`);
      await sleep(100 + Math.random() * 150);
    }
  }

  async signIn(): Promise<void> {
    const { res } = await this.retrying("sign-in", () => this.send("/login", { form: { email: this.email, password: DEMO_PASSWORD } }));
    const cookies = res.headers.getSetCookie().map((c) => c.split(";")[0]!);
    if (res.status !== 302 || !cookies.length) throw new Error(`${this.email} could not sign in: ${res.status} ${await res.text()}`);
    this.cookie = cookies.join("; ");
  }

  /** Opens a call on the demo rotisserie, assigned to this technician (the New call form). Not retried: it is not idempotent. */
  async openCall(): Promise<string> {
    const res = await this.send("/calls/new", {
      form: { unitId: ROTISSERIE_UNIT, symptom: "heats unevenly", priority: "normal", assignedTo: this.userId, notes: "" },
    });
    const where = res.headers.get("location") ?? "";
    const id = /\/calls\/([0-9a-f-]{36})$/.exec(where)?.[1];
    if (res.status !== 302 || !id) throw new Error(`opening a call failed: ${res.status} ${where} ${(await res.text()).slice(0, 400)}`);
    this.calls.push(id);
    return id;
  }

  /** Starts the rotisserie run on a call (the call page's form); a retry lands on the run already started. */
  async startRun(callId: string): Promise<string> {
    const { res } = await this.retrying("start run", () => this.send(`/calls/${callId}`, { form: { treeId: ROTISSERIE_TREE } }));
    const id = /\/runs\/([0-9a-f-]{36})$/.exec(res.headers.get("location") ?? "")?.[1];
    if (res.status !== 302 || !id)
      throw new Error(`starting a run failed: ${res.status} ${res.headers.get("location")} ${(await res.text()).slice(0, 400)}`);
    this.ledger.runs.add(id);
    return id;
  }

  /** One step, retried with the same idempotency key until acknowledged (201, or 200 replayed). */
  async postStep(runId: string, entry: Entry): Promise<Ack> {
    const key = crypto.randomUUID();
    const { res, attempts, firstTry } = await this.retrying("step", () =>
      this.send(`/api/runs/${runId}/steps`, { json: { key, entry, at: new Date().toISOString() } }),
    );
    const body = (await res.json()) as {
      replayed?: boolean;
      step?: { seq: number; key: string; verdict: string | null; limitsText: string | null };
      error?: string;
    };
    if ((res.status !== 201 && res.status !== 200) || !body.step)
      throw new Error(`step ${entry.type} on run ${runId} refused: ${res.status} ${body.error ?? ""}`);
    const ack: Ack = {
      tech: this.email,
      runId,
      key,
      entry,
      seq: body.step.seq,
      verdict: body.step.verdict,
      limitsText: body.step.limitsText,
      replayed: Boolean(body.replayed),
      servedBy: res.headers.get("x-served-by") ?? "",
      firstTry,
      ackAt: this.ledger.now(),
      attempts,
    };
    this.ledger.acks.push(ack);
    return ack;
  }

  /** The same technician (same session cookie) talking to another address, e.g. one app server directly. */
  via(base: string): Technician {
    const other = new Technician(this.email, this.userId, base, this.ledger);
    other.cookie = this.cookie;
    return other;
  }

  /** One try of a step with a given key: the status and the seq of the step answered. */
  async postKeyed(runId: string, key: string, entry: Entry): Promise<{ status: number; seq: number | null; replayed: boolean }> {
    const res = await this.send(`/api/runs/${runId}/steps`, { json: { key, entry } });
    const body = (await res.json()) as { replayed?: boolean; step?: { seq: number } };
    return { status: res.status, seq: body.step?.seq ?? null, replayed: Boolean(body.replayed) };
  }

  /** Works the prepared calls one run after another until they run out or `stop()` says so. */
  async work(opts: { extra: number; thinkMs: number; stop?: () => boolean; skip?: number; limit?: number }): Promise<number> {
    let runs = 0;
    for (const callId of this.calls.slice(opts.skip ?? 0, opts.limit === undefined ? undefined : (opts.skip ?? 0) + opts.limit)) {
      if (opts.stop?.()) break;
      const runId = await this.startRun(callId);
      for (const entry of rotisserieWalk(opts.extra)) {
        await this.postStep(runId, entry);
        if (opts.thinkMs) await sleep(opts.thinkMs);
      }
      runs++;
    }
    return runs;
  }
}

export async function technicians(setup: Setup, count: number, prefix: string, ledger: Ledger, callsEach: number): Promise<Technician[]> {
  const made = await addTechnicians(setup, count, prefix);
  const techs = made.map((t) => new Technician(t.email, t.id, setup.layout.url, ledger));
  await Promise.all(techs.map((t) => t.signIn()));
  // Calls are opened one after another, round the technicians: each takes the shop's next call
  // number, and a crowd opening calls nonstop at once exhausts that numbering's bounded retry (on one
  // MariaDB as on the cluster), which is not what these tests are about.
  for (let i = 0; i < callsEach; i++) for (const t of techs) await t.openCall();
  return techs;
}

// --- read-back -----------------------------------------------------------------------------------

export type Stored = {
  node: string;
  rows: number;
  byKey: Map<string, number>;
  byRun: Map<string, number[]>;
  stepCounts: Map<string, number>;
  digest: string;
};

/** The steps of the given runs as one node has them, read straight from that node. */
export async function readBack(layout: Layout, port: number, runIds: string[]): Promise<Stored> {
  const conn = await mysql.createConnection({ uri: dbUrl(layout, port) });
  try {
    const byKey = new Map<string, number>();
    const byRun = new Map<string, number[]>();
    const stepCounts = new Map<string, number>();
    let rows = 0;
    const hash = (await import("node:crypto")).createHash("sha256");
    for (let i = 0; i < runIds.length; i += 200) {
      const ids = runIds.slice(i, i + 200);
      const [steps] = await conn.query(
        "SELECT run_id, seq, idempotency_key, type, verdict FROM run_steps WHERE run_id IN (?) ORDER BY run_id, seq",
        [ids],
      );
      for (const r of steps as { run_id: string; seq: number; idempotency_key: string; type: string; verdict: string | null }[]) {
        rows++;
        byKey.set(r.idempotency_key, (byKey.get(r.idempotency_key) ?? 0) + 1);
        byRun.set(r.run_id, [...(byRun.get(r.run_id) ?? []), r.seq]);
        hash.update(`${r.run_id}/${r.seq}/${r.idempotency_key}/${r.type}/${r.verdict ?? ""}\n`);
      }
      const [runRows] = await conn.query("SELECT id, step_count FROM runs WHERE id IN (?)", [ids]);
      for (const r of runRows as { id: string; step_count: number }[]) stepCounts.set(r.id, r.step_count);
    }
    const node = layout.nodes.find((n) => n.port === port)?.name ?? String(port);
    return { node, rows, byKey, byRun, stepCounts, digest: hash.digest("hex").slice(0, 16) };
  } finally {
    await conn.end();
  }
}

/** Acknowledged against stored: missing = acknowledged but not stored; doubled = stored more than once. */
export function compare(acks: Ack[], stored: Stored) {
  const acked = new Set(acks.map((a) => a.key));
  const missing = [...acked].filter((k) => !stored.byKey.has(k)).length;
  const doubled = [...stored.byKey.values()].filter((n) => n > 1).length;
  const unacknowledged = [...stored.byKey.keys()].filter((k) => !acked.has(k)).length;
  const gaps = [...stored.byRun.entries()].filter(([, seqs]) => seqs.some((s, i) => s !== i)).length;
  const countsOff = [...stored.byRun.entries()].filter(([run, seqs]) => stored.stepCounts.get(run) !== seqs.length).length;
  return { acknowledged: acked.size, stored: stored.rows, missing, doubled, unacknowledged, gaps, countsOff };
}

export function percentile(values: number[], p: number): number {
  if (!values.length) return 0;
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))]!;
}
