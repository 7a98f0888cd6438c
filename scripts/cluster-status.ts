// What `scripts/cluster status` prints, and the probes the cluster tests share: each Galera node's
// wsrep state, each app server's /healthz, and HAProxy's view of the app servers (its stats socket).
//   npx tsx scripts/cluster-status.ts [--wait SECONDS] .data/cluster/cluster.json
import { readFileSync } from "node:fs";
import { connect } from "node:net";
import { fileURLToPath } from "node:url";
import mysql from "mysql2/promise";

export type NodeInfo = { name: string; port: number; pidFile: string; log: string };
export type AppInfo = { name: string; port: number; dbPort: number; pidFile: string; log: string };
/** Written by scripts/cluster start into CLUSTER_DIR/cluster.json: the one description of the layout. */
export type Layout = {
  mode: "galera" | "single";
  dir: string;
  url: string;
  haproxySocket: string;
  haproxyPidFile: string;
  database: string;
  nodes: NodeInfo[];
  apps: AppInfo[];
};

export function readLayout(file: string): Layout {
  return JSON.parse(readFileSync(file, "utf8")) as Layout;
}

export function dbUrl(layout: Layout, port: number): string {
  return `mysql://root@127.0.0.1:${port}/${layout.database}`;
}

export type NodeStatus =
  { up: false; error: string } | { up: true; state: string; ready: boolean; clusterSize: number; clusterStatus: string; wsrep: boolean };

/** A node's wsrep_* status (a plain MariaDB reports wsrep: false). */
export async function nodeStatus(port: number): Promise<NodeStatus> {
  let conn: mysql.Connection | undefined;
  try {
    conn = await mysql.createConnection({ host: "127.0.0.1", port, user: "root", connectTimeout: 1500 });
    const [[on]] = (await conn.query("SELECT @@wsrep_on AS wsrep")) as unknown as [{ wsrep: number }[]];
    if (!on?.wsrep) return { up: true, state: "standalone", ready: true, clusterSize: 1, clusterStatus: "-", wsrep: false };
    const [rows] = await conn.query("SHOW GLOBAL STATUS LIKE 'wsrep%'");
    const s = new Map((rows as { Variable_name: string; Value: string }[]).map((r) => [r.Variable_name, r.Value]));
    return {
      up: true,
      wsrep: true,
      state: s.get("wsrep_local_state_comment") ?? "?",
      ready: s.get("wsrep_ready") === "ON",
      clusterSize: Number(s.get("wsrep_cluster_size") ?? 0),
      clusterStatus: s.get("wsrep_cluster_status") ?? "?",
    };
  } catch (e) {
    return { up: false, error: (e as { code?: string }).code ?? (e instanceof Error ? e.message : String(e)) };
  } finally {
    await conn?.end().catch(() => undefined);
  }
}

export type Health = { status: number; body: string } | { status: 0; body: string };

export async function appHealth(port: number): Promise<Health> {
  try {
    const r = await fetch(`http://127.0.0.1:${port}/healthz`, { signal: AbortSignal.timeout(3000) });
    return { status: r.status, body: (await r.text()).trim() };
  } catch (e) {
    return { status: 0, body: (e as { cause?: { code?: string } }).cause?.code ?? (e instanceof Error ? e.message : String(e)) };
  }
}

/** One command on HAProxy's stats socket (the runtime API). */
export function haproxyCommand(socket: string, command: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const c = connect(socket);
    let out = "";
    c.setTimeout(3000, () => c.destroy(new Error("HAProxy's stats socket did not answer")));
    c.on("connect", () => c.write(`${command}\n`));
    c.on("data", (d) => (out += d));
    c.on("end", () => resolve(out));
    c.on("error", reject);
  });
}

export type ServerStat = { name: string; status: string; sessions: number; checkStatus: string; downtime: number };

/** HAProxy's view of each app server in the `apps` backend: UP/DOWN, requests sent (stot), last check. */
export async function haproxyServers(socket: string): Promise<ServerStat[]> {
  const csv = await haproxyCommand(socket, "show stat");
  const lines = csv.split("\n").filter(Boolean);
  const header = (lines.shift() ?? "").replace(/^# /, "").split(",");
  const col = (name: string) => header.indexOf(name);
  return lines
    .map((l) => l.split(","))
    .filter((f) => f[col("pxname")] === "apps" && f[col("svname")] !== "BACKEND" && f[col("svname")] !== "FRONTEND")
    .map((f) => ({
      name: f[col("svname")]!,
      status: f[col("status")]!,
      sessions: Number(f[col("stot")]),
      checkStatus: f[col("check_status")] ?? "",
      downtime: Number(f[col("downtime")] ?? 0),
    }));
}

/** The status as printed, and whether everything is up: every node synced, every app server UP in HAProxy. */
export async function clusterStatus(layout: Layout): Promise<{ text: string; healthy: boolean }> {
  const out: string[] = [];
  const nodes = await Promise.all(layout.nodes.map(async (n) => ({ n, s: await nodeStatus(n.port) })));
  const sizes = nodes.flatMap(({ s }) => (s.up && s.wsrep ? [s.clusterSize] : []));
  if (layout.mode === "galera") {
    const primary = nodes.find(({ s }) => s.up && s.clusterStatus === "Primary");
    out.push(
      `Galera cluster size: ${sizes.length ? Math.max(...sizes) : 0} of ${layout.nodes.length}${primary ? " (primary component)" : " (no primary component)"}`,
    );
  } else {
    out.push("Single MariaDB (no cluster)");
  }
  for (const { n, s } of nodes) {
    const what = s.up ? (s.wsrep ? `${s.state}${s.ready ? "" : " (not ready)"}, ${s.clusterStatus}` : "up") : `down (${s.error})`;
    out.push(`  ${n.name.padEnd(7)} 127.0.0.1:${n.port}  ${what}`);
  }
  let lb: ServerStat[] = [];
  let lbError = "";
  try {
    lb = await haproxyServers(layout.haproxySocket);
  } catch (e) {
    lbError = e instanceof Error ? e.message : String(e);
  }
  const front = await appHealth(Number(new URL(layout.url).port));
  out.push(`HAProxy ${layout.url}  ${lbError ? `not running (${lbError})` : `healthz ${front.status || front.body}`}`);
  for (const a of layout.apps) {
    const h = await appHealth(a.port);
    const node = layout.nodes.find((n) => n.port === a.dbPort)?.name ?? String(a.dbPort);
    const seen = lb.find((s) => s.name === a.name);
    const health = h.status ? `healthz ${h.status} ${h.body}` : `down (${h.body})`;
    out.push(`  ${a.name.padEnd(7)} 127.0.0.1:${a.port} → ${node.padEnd(6)} ${health}${seen ? `; HAProxy: ${seen.status}` : ""}`);
  }
  const healthy =
    nodes.every(({ s }) => s.up && (!s.wsrep || (s.state === "Synced" && s.clusterStatus === "Primary"))) &&
    !lbError &&
    lb.every((s) => s.status === "UP");
  return { text: out.join("\n"), healthy };
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  // [--wait SECONDS] FILE: with --wait, polls until everything is up (scripts/cluster start uses it).
  const args = process.argv.slice(2);
  const wait = args[0] === "--wait" ? Number(args[1]) : 0;
  const layout = readLayout(args[wait ? 2 : 0] ?? ".data/cluster/cluster.json");
  const until = Date.now() + wait * 1000;
  let status = await clusterStatus(layout);
  while (!status.healthy && Date.now() < until) {
    await new Promise((r) => setTimeout(r, 250));
    status = await clusterStatus(layout);
  }
  console.log(status.text);
  if (!status.healthy) process.exitCode = 3;
}
