// Cluepath scaled out: three app servers behind HAProxy on a three-node MariaDB Galera cluster, all on
// 127.0.0.1 (scripts/cluster). Run with `npm run test:cluster` (scripts/test-cluster), not part of
// scripts/test. Bounded: a fixed number of technicians and calls, a stop signal for the failover load.
//   1. technicians work runs at once through HAProxy, so their steps land on every app server and
//      every node: each acknowledged step is stored exactly once, read back from each node;
//   2. under a load of step posts, one Galera node and one app server are killed (SIGKILL): the load
//      goes on through the survivors, HAProxy stops sending to the dead app server, the node rejoins
//      by state transfer; acknowledged vs stored: 0 missing, 0 doubled, and the time without service;
//   3. persisted steps per second through HAProxy on the cluster and on the single-database setup.
import { writeFileSync } from "node:fs";
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { dbUrl, haproxyServers, nodeStatus, type ServerStat } from "../../scripts/cluster-status";
import {
  bringDown,
  bringUp,
  clusterScript,
  compare,
  Ledger,
  percentile,
  readBack,
  rotisserieWalk,
  technicians,
  WORK,
  type Ack,
  type Setup,
  type Technician,
} from "./harness";

let galera: Setup | undefined;
let single: Setup | undefined;
const results: Record<string, unknown> = {};
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const seconds = (ms: number) => Number((ms / 1000).toFixed(2));

beforeAll(async () => {
  galera = await bringUp("galera");
  console.log(galera.startOutput.trim());
});

afterAll(async () => {
  await bringDown(galera).catch((e) => console.error(e));
  await bringDown(single).catch((e) => console.error(e));
  writeFileSync(`${WORK}/results.json`, JSON.stringify(results, null, 2));
});

/** What every acknowledged walk step must say: the verdicts are the engine's, computed on whichever node served it. */
function checkVerdicts(acks: Ack[]) {
  for (const a of acks) {
    if (a.entry.type === "reading" && a.entry.node === "supply-voltage") {
      // 208 V on a 191–218 V range: ANSI C84.1 utilisation minimum and Range A maximum for 208 V (REFERENCES.md: from memory).
      expect([a.verdict, a.limitsText]).toEqual(["within", "191–218 V"]);
    }
    if (a.entry.type === "reading" && a.entry.node === "cap-measure") {
      // 1.47 µF (and 1470 nF) against 1.5 µF ± 6 %: the field rule for run capacitors (REFERENCES.md: common practice).
      expect([a.verdict, a.limitsText]).toEqual(["within", "1.41–1.59 µF"]);
    }
  }
}

/** Each run's acknowledged steps carry seq 0, 1, 2… in walk order, whichever server answered. */
function checkSequence(acks: Ack[], extra: number) {
  const walk = rotisserieWalk(extra);
  const byRun = new Map<string, Ack[]>();
  for (const a of acks) byRun.set(a.runId, [...(byRun.get(a.runId) ?? []), a]);
  for (const [, list] of byRun) {
    list.sort((x, y) => x.seq - y.seq);
    expect(list.map((a) => a.seq)).toEqual(list.map((_, i) => i));
    expect(list.map((a) => a.entry)).toEqual(walk.slice(0, list.length));
  }
}

async function readAll(setup: Setup, runIds: string[]) {
  return Promise.all(setup.layout.nodes.map((n) => readBack(setup.layout, n.port, runIds)));
}

describe("Galera's rules in the schema", () => {
  it("every table has a primary key and is InnoDB (Galera replicates only InnoDB, and needs a key to apply rows)", async () => {
    // Source: MariaDB Galera Cluster known limitations (primary keys, InnoDB only) — from memory.
    const conn = await mysql.createConnection({ uri: dbUrl(galera!.layout, galera!.layout.nodes[0]!.port) });
    const [tables] = await conn.query(
      `SELECT t.TABLE_NAME AS name, t.ENGINE AS engine,
              (SELECT COUNT(*) FROM information_schema.TABLE_CONSTRAINTS c
                WHERE c.TABLE_SCHEMA = t.TABLE_SCHEMA AND c.TABLE_NAME = t.TABLE_NAME AND c.CONSTRAINT_TYPE = 'PRIMARY KEY') AS pk
         FROM information_schema.TABLES t WHERE t.TABLE_SCHEMA = DATABASE() AND t.TABLE_TYPE = 'BASE TABLE'`,
    );
    await conn.end();
    const list = tables as { name: string; engine: string; pk: number }[];
    expect(list.length).toBeGreaterThan(20);
    expect(list.filter((t) => Number(t.pk) !== 1).map((t) => t.name)).toEqual([]);
    expect(list.filter((t) => t.engine !== "InnoDB").map((t) => t.name)).toEqual([]);
  });
});

describe("technicians on different app servers at once", () => {
  it("every acknowledged step is stored exactly once, and every node has the same steps", async () => {
    const ledger = new Ledger();
    const extra = 2;
    const techs = await technicians(galera!, 6, "c1", ledger, 3);
    const t0 = performance.now();
    await Promise.all(techs.map((t) => t.work({ extra, thinkMs: 0 })));
    const ms = performance.now() - t0;

    const servedBy = Object.fromEntries(galera!.layout.apps.map((a) => [a.name, ledger.acks.filter((x) => x.servedBy === a.name).length]));
    const stored = await readAll(galera!, [...ledger.runs]);
    const figures = stored.map((s) => ({ node: s.node, ...compare(ledger.acks, s), digest: s.digest }));
    console.log(
      `\n[1] ${techs.length} technicians, ${ledger.runs.size} runs, ${ledger.acks.length} steps in ${seconds(ms)} s; answered by ${JSON.stringify(servedBy)}; failed tries ${ledger.misses.length}`,
    );
    console.table(figures);
    results.concurrent = {
      technicians: techs.length,
      runs: ledger.runs.size,
      steps: ledger.acks.length,
      seconds: seconds(ms),
      servedBy,
      failedTries: ledger.misses.length,
      nodes: figures,
    };

    expect(ledger.acks).toHaveLength(6 * 3 * rotisserieWalk(extra).length);
    // Round robin over three healthy servers: each one answered steps, so each node took writes.
    for (const app of galera!.layout.apps) expect(servedBy[app.name]).toBeGreaterThan(0);
    checkVerdicts(ledger.acks);
    checkSequence(ledger.acks, extra);
    for (const f of figures) {
      expect(f).toMatchObject({
        acknowledged: ledger.acks.length,
        stored: ledger.acks.length,
        missing: 0,
        doubled: 0,
        unacknowledged: 0,
        gaps: 0,
        countsOff: 0,
      });
    }
    expect(new Set(figures.map((f) => f.digest)).size).toBe(1);
  });

  it("the same idempotency key sent to two app servers (two nodes) at once is stored once and answered twice with the same step", async () => {
    const ledger = new Ledger();
    const [tech] = await technicians(galera!, 1, "c2", ledger, 1);
    const [a1, a2] = galera!.layout.apps;
    const runId = await tech!.startRun(tech!.calls[0]!);
    const viaOne = tech!.via(`http://127.0.0.1:${a1!.port}`);
    const viaTwo = tech!.via(`http://127.0.0.1:${a2!.port}`);
    const walk = rotisserieWalk(3);
    for (const entry of walk) {
      const key = crypto.randomUUID();
      const [x, y] = await Promise.all([viaOne.postKeyed(runId, key, entry), viaTwo.postKeyed(runId, key, entry)]);
      expect([x.status, y.status].sort()).toEqual([200, 201]);
      expect(x.seq).toBe(y.seq);
    }
    const stored = await readAll(galera!, [runId]);
    for (const s of stored) {
      expect(s.rows).toBe(walk.length);
      expect([...s.byKey.values()].every((n) => n === 1)).toBe(true);
      expect(s.byRun.get(runId)).toEqual(walk.map((_, i) => i));
    }
    console.log(
      `\n[1b] ${walk.length} steps each sent to app1 (node1) and app2 (node2) at the same moment: ${walk.length} rows on every node, one 201 and one replayed 200 per key`,
    );
  });
});

describe("failover under load", () => {
  it("SIGKILL one Galera node and one app server: the load goes on, the node rejoins, 0 missing and 0 doubled", async () => {
    const setup = galera!;
    const { layout } = setup;
    const ledger = new Ledger();
    const extra = 8;
    const techs = await technicians(setup, 8, "f", ledger, 24);
    let stop = false;
    const load = Promise.all(techs.map((t) => t.work({ extra, thinkMs: 25, stop: () => stop })));
    const loadFailed = load.then(
      () => null,
      (e: unknown) => e,
    );

    await sleep(4000);
    const deadApp = layout.apps[0]!; // app1, on node1
    const deadNode = layout.nodes[2]!; // node3, under app3
    const { readFileSync } = await import("node:fs");
    const appPid = Number(readFileSync(deadApp.pidFile, "utf8"));
    const nodePid = Number(readFileSync(deadNode.pidFile, "utf8"));
    const acksBeforeKill = ledger.acks.length;
    const tKill = ledger.now();
    process.kill(nodePid, "SIGKILL");
    process.kill(appPid, "SIGKILL");
    console.log(
      `\n[2] t=${seconds(tKill)} s: SIGKILL ${deadNode.name} (pid ${nodePid}) and ${deadApp.name} (pid ${appPid}) after ${acksBeforeKill} acknowledged steps`,
    );

    // HAProxy takes app1 (dead) and app3 (its node dead, /healthz 503) out of rotation.
    const downAt: Record<string, number> = {};
    let atDown: ServerStat[] = [];
    for (let i = 0; i < 300 && Object.keys(downAt).length < 2; i++) {
      const stats = await haproxyServers(layout.haproxySocket);
      for (const s of stats)
        if ((s.name === "app1" || s.name === "app3") && s.status.startsWith("DOWN") && !(s.name in downAt))
          downAt[s.name] = ledger.now() - tKill;
      atDown = stats;
      await sleep(100);
    }
    expect(Object.keys(downAt).sort()).toEqual(["app1", "app3"]);
    const app1SessionsAtDown = atDown.find((s) => s.name === "app1")!.sessions;

    // The two survivors form the primary component of two.
    let size = 0;
    let sizeAt = 0;
    for (let i = 0; i < 300; i++) {
      const [one, two] = await Promise.all([nodeStatus(layout.nodes[0]!.port), nodeStatus(layout.nodes[1]!.port)]);
      if (one.up && two.up && one.clusterSize === 2 && two.clusterSize === 2 && one.clusterStatus === "Primary") {
        size = 2;
        sizeAt = ledger.now() - tKill;
        break;
      }
      await sleep(100);
    }
    expect(size).toBe(2);

    // Degraded: work goes on through app2 alone, for 150 more steps (or 30 s at most).
    const tDegraded = ledger.now();
    for (let i = 0; i < 300 && ledger.acks.filter((a) => a.ackAt > tDegraded).length < 150; i++) await sleep(100);
    const degradedAcks = ledger.acks.filter((a) => a.ackAt > tDegraded);
    const degradedSeconds = seconds(ledger.now() - tDegraded);
    const statsBeforeRestart = await haproxyServers(layout.haproxySocket);
    const app1SessionsBeforeRestart = statsBeforeRestart.find((s) => s.name === "app1")!.sessions;

    // scripts/cluster start brings back what is missing: node3 (recovered position, state transfer) and app1.
    const tRestart = ledger.now();
    const restartOutput = await clusterScript(setup.env, "start");
    const rejoinLine = restartOutput.split("\n").find((l) => l.includes(`${deadNode.name.replace("node", "node ")} synced`)) ?? "";
    const tRejoined = ledger.now();
    let allUp = false;
    for (let i = 0; i < 200 && !allUp; i++) {
      allUp = (await haproxyServers(layout.haproxySocket)).every((s) => s.status === "UP");
      if (!allUp) await sleep(100);
    }
    expect(allUp).toBe(true);
    const tAllUp = ledger.now();
    await sleep(3000);
    stop = true;
    const failure = await loadFailed;
    if (failure) throw failure;
    const tEnd = ledger.now();

    const after = await Promise.all(layout.nodes.map((n) => nodeStatus(n.port)));
    const stored = await readAll(setup, [...ledger.runs]);
    const figures = stored.map((s) => ({ node: s.node, ...compare(ledger.acks, s), digest: s.digest }));

    // Time without service: the longest stretch in which no step at all was acknowledged.
    const times = ledger.acks.map((a) => a.ackAt).sort((x, y) => x - y);
    let gap = 0;
    let gapFrom = 0;
    for (let i = 1; i < times.length; i++) {
      if (times[i]! - times[i - 1]! > gap) {
        gap = times[i]! - times[i - 1]!;
        gapFrom = times[i - 1]!;
      }
    }
    const waits = ledger.acks.map((a) => a.ackAt - a.firstTry);
    const missesByStatus: Record<string, number> = {};
    for (const m of ledger.misses) {
      const from = `${m.status} from ${m.servedBy || (/^\d+$/.test(m.status) ? "HAProxy" : "the connection")}`;
      missesByStatus[from] = (missesByStatus[from] ?? 0) + 1;
    }
    const servedAfterRejoin = Object.fromEntries(
      layout.apps.map((a) => [a.name, ledger.acks.filter((x) => x.ackAt > tAllUp && x.servedBy === a.name).length]),
    );
    const servedDegraded = Object.fromEntries(layout.apps.map((a) => [a.name, degradedAcks.filter((x) => x.servedBy === a.name).length]));
    const summary = {
      technicians: techs.length,
      runs: ledger.runs.size,
      acknowledged: ledger.acks.length,
      acknowledgedByReplay: ledger.acks.filter((a) => a.replayed).length,
      failedTries: ledger.misses.length,
      failedTriesByStatus: missesByStatus,
      seconds: seconds(tEnd),
      haproxyMarkedDownAfter: Object.fromEntries(Object.entries(downAt).map(([k, v]) => [k, seconds(v)])),
      clusterOfTwoAfter: seconds(sizeAt),
      acknowledgedWhileDegraded: `${degradedAcks.length} in ${degradedSeconds} s`,
      servedWhileDegraded: servedDegraded,
      rejoin: rejoinLine.replace(/^›\s*/, ""),
      rejoinSeconds: seconds(tRejoined - tRestart),
      servedAfterRejoin,
      timeWithoutService: seconds(gap),
      timeWithoutServiceStartsAfterKill: seconds(gapFrom - tKill),
      longestWaitForOneStep: seconds(Math.max(...waits)),
      p50StepMs: Math.round(percentile(waits, 50)),
      p99StepMs: Math.round(percentile(waits, 99)),
    };
    console.log(`[2] ${JSON.stringify(summary, null, 2)}`);
    console.table(figures);
    for (const f of figures)
      console.log(`[2] ${f.node}: acknowledged ${f.acknowledged}, stored ${f.stored}: ${f.missing} missing, ${f.doubled} doubled`);
    results.failover = { ...summary, nodes: figures };

    // The load went on through the survivors, and only through them.
    expect(degradedAcks.length).toBeGreaterThanOrEqual(150);
    expect(servedDegraded.app1).toBe(0);
    expect(servedDegraded.app3).toBe(0);
    // HAProxy sent nothing more to the dead app server once it marked it down.
    expect(app1SessionsBeforeRestart).toBe(app1SessionsAtDown);
    // The killed node came back by state transfer and the restored servers take traffic again.
    expect(rejoinLine).toMatch(/state transfer/);
    expect(after.every((s) => s.up && s.state === "Synced" && s.clusterSize === 3)).toBe(true);
    expect(servedAfterRejoin.app1).toBeGreaterThan(0);
    expect(servedAfterRejoin.app3).toBeGreaterThan(0);
    // Acknowledged against stored, on every node including the one that was killed.
    checkVerdicts(ledger.acks);
    checkSequence(ledger.acks, extra);
    for (const f of figures)
      expect(f).toMatchObject({ missing: 0, doubled: 0, unacknowledged: 0, gaps: 0, countsOff: 0, stored: ledger.acks.length });
    expect(new Set(figures.map((f) => f.digest)).size).toBe(1);
  });
});

describe("throughput: the cluster beside the single database", () => {
  const extra = 4; // 19 steps a run
  const runsPerRound = 2;
  const rounds = 3;

  /** One round: every technician works `runsPerRound` runs without pausing; persisted steps per second. */
  async function round(setup: Setup, ledger: Ledger, techs: Technician[], r: number) {
    const before = ledger.acks.length;
    const t0 = ledger.now();
    await Promise.all(techs.map((t) => t.work({ extra, thinkMs: 0, skip: 1 + r * runsPerRound, limit: runsPerRound })));
    const ms = ledger.now() - t0;
    const acks = ledger.acks.slice(before);
    return {
      setup: setup.kind,
      round: r + 1,
      steps: acks.length,
      seconds: seconds(ms),
      stepsPerSecond: Math.round(acks.length / (ms / 1000)),
      latencies: acks.map((a) => a.ackAt - a.firstTry),
    };
  }

  it("prints persisted steps per second on both, in interleaved rounds, and their ratio", async () => {
    // Both setups up at once on their own ports; each round runs on one while the other idles, so
    // whatever else this shared machine does at the time weighs on both alike.
    single = await bringUp("single");
    const setups = [galera!, single];
    const ledgers = setups.map(() => new Ledger());
    const techs: Technician[][] = [];
    for (const [i, setup] of setups.entries())
      techs.push(await technicians(setup, 6, i === 0 ? "tg" : "ts", ledgers[i]!, 1 + rounds * runsPerRound));
    for (const [i] of setups.entries()) await Promise.all(techs[i]!.map((t) => t.work({ extra, thinkMs: 0, limit: 1 }))); // warm-up
    const measured: Awaited<ReturnType<typeof round>>[] = [];
    for (let r = 0; r < rounds; r++) {
      const order = r % 2 === 0 ? [0, 1] : [1, 0];
      for (const i of order) measured.push(await round(setups[i]!, ledgers[i]!, techs[i]!, r));
    }
    const rows = setups.map((setup, i) => {
      const mine = measured.filter((m) => m.setup === setup.kind);
      const rates = mine.map((m) => m.stepsPerSecond).sort((a, b) => a - b);
      const lat = mine.flatMap((m) => m.latencies);
      return {
        setup: setup.kind === "galera" ? "3-node Galera, 3 app servers, HAProxy" : "1 MariaDB, 3 app servers, HAProxy",
        steps: mine.reduce((n, m) => n + m.steps, 0),
        roundsStepsPerSecond: mine.map((m) => m.stepsPerSecond).join(" / "),
        medianStepsPerSecond: rates[Math.floor(rates.length / 2)]!,
        p50Ms: Math.round(percentile(lat, 50)),
        p95Ms: Math.round(percentile(lat, 95)),
        failedTries: ledgers[i]!.misses.length,
      };
    });
    for (const [i, setup] of setups.entries()) {
      const stored = await readBack(setup.layout, setup.layout.nodes[0]!.port, [...ledgers[i]!.runs]);
      expect(compare(ledgers[i]!.acks, stored)).toMatchObject({ missing: 0, doubled: 0, unacknowledged: 0, gaps: 0, countsOff: 0 });
    }
    const ratio = Number((rows[0]!.medianStepsPerSecond / rows[1]!.medianStepsPerSecond).toFixed(2));
    console.log(
      `\n[3] persisted steps per second through HAProxy: 6 technicians without pauses, ${rounds} interleaved rounds of ${runsPerRound} runs × ${rotisserieWalk(extra).length} steps each`,
    );
    console.table(rows);
    console.log(`[3] cluster / single (medians) = ${ratio}`);
    results.throughput = { cluster: rows[0], single: rows[1], ratio };
    expect(rows[0]!.steps).toBe(rows[1]!.steps);
    expect(ratio).toBeGreaterThan(0);
  });
});
