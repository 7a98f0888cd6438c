// Chaos run (issue 9): under a bounded load of step posts, SIGKILL the app server and then MariaDB,
// restart both, and compare the steps the clients saw acknowledged with the rows MariaDB kept.
//
//   npm run chaos        (CHAOS_CLIENTS=16, STACK_PORT_BASE=… to pin ports; about 1–2 minutes)
//
// Each client is one technician's phone on its own run: it posts valid steps (undo / the supply
// reading again, see scripts/lib/field.ts), one after another, each with a fresh idempotency key.
// A step that gets no answer, a connection error or a 5xx is sent again with the same key and the
// same payload (the phone's rule, with its back-off shortened to a quarter); only a 2xx counts as
// acknowledged. A 4xx is final for that step (the phone drops it and refetches the run).
// When the load stops, every client keeps retrying its last step until it is acknowledged.
//
// App code imported: none here; scripts/lib/field.ts takes DEMO_PASSWORD from db/demo.ts.
import type mysql from "mysql2/promise";
import { cloneRun, nextKind, PREFIX, postStep, startField, stepBody, techSessions, type Field } from "./lib/field";
import { log, sleep, Stack } from "./lib/stack";

const CLIENTS = Number(process.env.CHAOS_CLIENTS ?? 16);
const LOAD_BEFORE_APP_KILL = 8_000;
const LOAD_BEFORE_DB_KILL = 8_000;
const DOWN_FOR = 2_000;
const LOAD_AFTER = 8_000;
const DRAIN_LIMIT = 60_000;
const REQUEST_TIMEOUT = 10_000;

type Ack = { run: string; key: string; seq: number; replayed: boolean; attempts: number };
type Tally = { acks: Ack[]; refused: string[]; abandoned: number; retries: Map<string, number>; lastAck: number; longestGap: number };

const backoff = (attempt: number) => Math.min(250 * 2 ** attempt, 4_000);

async function main() {
  const stack = await Stack.start({ name: "chaos" });
  try {
    await chaos(stack);
  } finally {
    await stack.stop();
  }
}

async function chaos(stack: Stack) {
  const field = await startField(stack);
  const runs = await cloneRun(stack.sql(), field.runId, CLIENTS);
  const cookies = await techSessions(stack, CLIENTS);

  const t0 = Date.now();
  const at = () => ((Date.now() - t0) / 1000).toFixed(1);
  const events: string[] = [];
  const note = (what: string) => {
    events.push(`- t = ${at()} s: ${what}`);
    log(`t=${at()} s ${what}`);
  };
  const tally: Tally = { acks: [], refused: [], abandoned: 0, retries: new Map(), lastAck: Date.now(), longestGap: 0 };
  const state = { stopping: false, givingUp: false };
  const clients = runs.map((run, i) => client(stack, field, run, cookies[i]!, tally, state));

  note(`load started: ${CLIENTS} clients, each posting steps to its own run`);
  await sleep(LOAD_BEFORE_APP_KILL);
  const acksBeforeApp = tally.acks.length;
  note(`SIGKILL to the app server (pid ${stack.serverPid}) after ${acksBeforeApp} acknowledged steps`);
  await stack.killServer("SIGKILL");
  await sleep(DOWN_FOR);
  await stack.startServer();
  note("app server restarted and answering /healthz");

  await sleep(LOAD_BEFORE_DB_KILL);
  note(`SIGKILL to MariaDB (pid ${stack.dbPid()}) after ${tally.acks.length} acknowledged steps`);
  await stack.killDb();
  await sleep(DOWN_FOR);
  await stack.startDb();
  note("MariaDB restarted (crash recovery done, accepting connections)");
  const acksAtDbRestart = tally.acks.length;
  const recoverBy = Date.now() + 30_000;
  while (tally.acks.length === acksAtDbRestart && Date.now() < recoverBy) await sleep(50);
  if (tally.acks.length > acksAtDbRestart) {
    note("steps acknowledged again, with the same app server process (no restart needed)");
  } else {
    note("no step acknowledged within 30 s of MariaDB's restart: restarting the app server");
    await stack.killServer("SIGKILL");
    await stack.startServer();
  }

  await sleep(LOAD_AFTER);
  state.stopping = true;
  note("load stopped; clients finish their last step");
  const drained = await Promise.race([Promise.all(clients).then(() => true), sleep(DRAIN_LIMIT).then(() => false)]);
  if (!drained) {
    state.givingUp = true;
    await Promise.all(clients);
  }
  note(drained ? "every client's last step acknowledged" : `clients gave up after retrying for ${DRAIN_LIMIT / 1000} s`);

  const stored = await storedRows(stack.sql(), runs);
  report(tally, stored, runs, events);
}

/** One phone: posts the next valid step of its run until told to stop, retrying each until a 2xx. */
async function client(
  stack: Stack,
  field: Field,
  run: string,
  cookie: string,
  tally: Tally,
  state: { stopping: boolean; givingUp: boolean },
) {
  let length = PREFIX;
  while (!state.stopping) {
    const key = crypto.randomUUID();
    const body = stepBody(nextKind(length), field.meterId, key);
    for (let attempt = 1; ; attempt++) {
      let outcome: string;
      try {
        const res = await postStep(stack, cookie, run, body, AbortSignal.timeout(REQUEST_TIMEOUT));
        const text = await res.text();
        if (res.ok) {
          const json = JSON.parse(text) as { replayed: boolean; step: { seq: number }; run: { stepCount: number } };
          tally.acks.push({ run, key, seq: json.step.seq, replayed: json.replayed, attempts: attempt });
          const now = Date.now();
          tally.longestGap = Math.max(tally.longestGap, now - tally.lastAck);
          tally.lastAck = now;
          length = json.run.stepCount;
          break;
        }
        if (res.status < 500 && res.status !== 429) {
          tally.refused.push(`${res.status} ${text.slice(0, 200)}`);
          length = await refetchLength(stack, cookie, run);
          break;
        }
        outcome = `HTTP ${res.status}`;
      } catch (e) {
        outcome = (e as Error).name === "TimeoutError" ? "no answer in 10 s" : "connection error";
      }
      tally.retries.set(outcome, (tally.retries.get(outcome) ?? 0) + 1);
      if (state.givingUp) {
        tally.abandoned++;
        return;
      }
      await sleep(backoff(attempt));
    }
  }
}

async function refetchLength(stack: Stack, cookie: string, run: string): Promise<number> {
  for (let attempt = 1; ; attempt++) {
    try {
      const res = await fetch(`${stack.baseUrl}/api/runs/${run}`, { headers: { cookie } });
      if (res.ok) return ((await res.json()) as { run: { stepCount: number } }).run.stepCount;
    } catch {
      /* retried below */
    }
    await sleep(backoff(attempt));
  }
}

type Row = { run_id: string; idempotency_key: string; seq: number };

async function storedRows(pool: mysql.Pool, runs: string[]): Promise<Row[]> {
  const [rows] = await pool.query<(mysql.RowDataPacket & Row)[]>(
    "SELECT run_id, idempotency_key, seq FROM run_steps WHERE run_id IN (?) AND seq >= ?",
    [runs, PREFIX],
  );
  return rows;
}

function report(tally: Tally, stored: Row[], runs: string[], events: string[]) {
  const id = (run: string, key: string) => `${run}/${key}`;
  const storedByKey = new Map<string, Row[]>();
  for (const r of stored)
    storedByKey.set(id(r.run_id, r.idempotency_key), [...(storedByKey.get(id(r.run_id, r.idempotency_key)) ?? []), r]);
  const acked = new Map(tally.acks.map((a) => [id(a.run, a.key), a]));
  const missing = tally.acks.filter((a) => !storedByKey.has(id(a.run, a.key)));
  const doubled = [...storedByKey.values()].filter((rows) => rows.length > 1).length;
  const unacknowledged = [...storedByKey.keys()].filter((k) => !acked.has(k)).length;
  const seqMismatch = tally.acks.filter(
    (a) => storedByKey.get(id(a.run, a.key))?.[0]?.seq !== a.seq && storedByKey.has(id(a.run, a.key)),
  ).length;
  let gaps = 0;
  for (const run of runs) {
    const seqs = stored
      .filter((r) => r.run_id === run)
      .map((r) => r.seq)
      .sort((a, b) => a - b);
    seqs.forEach((s, i) => (gaps += s === PREFIX + i ? 0 : 1));
  }
  const replays = tally.acks.filter((a) => a.replayed).length;
  const retried = tally.acks.filter((a) => a.attempts > 1).length;
  const retries = [...tally.retries].map(([what, n]) => `${n} × ${what}`).join(", ") || "none";
  const lines = [
    `chaos — ${new Date().toISOString().slice(0, 10)}, Node ${process.version}, ${CLIENTS} clients, one app server, SIGKILL to the app and then to MariaDB under load`,
    "",
    ...events,
    "",
    "| what | count |",
    "|---|--:|",
    `| steps acknowledged (2xx) | ${tally.acks.length} |`,
    `| … of which acknowledged only after a retry | ${retried} |`,
    `| … of which answered as a replay of a stored step (200, replayed) | ${replays} |`,
    `| rows stored for these steps | ${stored.length} |`,
    `| **missing** (acknowledged, not stored) | **${missing.length}** |`,
    `| **doubled** (one step stored more than once) | **${doubled}** |`,
    `| stored but never acknowledged | ${unacknowledged} |`,
    `| acknowledged position ≠ stored position | ${seqMismatch} |`,
    `| gaps in a run's step numbers | ${gaps} |`,
    `| steps refused (4xx) | ${tally.refused.length} |`,
    `| steps never acknowledged (client gave up after ${DRAIN_LIMIT / 1000} s) | ${tally.abandoned} |`,
    "",
    `Retried attempts: ${retries}. Longest time with no step acknowledged by any client: ${(tally.longestGap / 1000).toFixed(1)} s.`,
  ];
  if (tally.refused.length) lines.push("", "Refused:", ...tally.refused.slice(0, 5).map((r) => `- ${r}`));
  console.log(lines.join("\n"));
  if (missing.length || doubled || seqMismatch || gaps || tally.abandoned) process.exitCode = 1;
}

main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
