// Runs for the load harnesses, made the way a phone makes them: a technician starts a run on the
// demo call 1041 (the two-fan rotisserie) from the call page, then posts steps to the runs API.
// Many identical runs are made by copying one run's rows in SQL (new ids and idempotency keys),
// so a benchmark can have thousands of runs with a 60-entry log without posting them one by one.
//
// The step pattern: acknowledge the three cautions, read the supply (208 V on the van's voltmeter,
// within 191–218 V), and from there alternate undo / the same reading again — every one a valid
// step of the starter tree, each with a fresh idempotency key. The run then stands at the fans
// question after a reading and at the supply reading after an undo.
//
// App code used: DEMO_PASSWORD and the technician's e-mail from db/demo.ts. Table and column
// names used in SQL: service_calls(id, number), runs(id), run_steps(id, run_id, idempotency_key).
import type mysql from "mysql2/promise";
import { DEMO_PASSWORD } from "../../db/demo";
import type { Stack } from "./stack";

const TECH = "tech@tinderbox.example";
const CALL_NUMBER = 1041;
const TREE_TITLE = "Two-fan convection rotisserie heats unevenly";
export const SUPPLY_READING = "208 V";
/** Entries before the undo/reading alternation starts: three cautions and the supply reading. */
export const PREFIX = 4;

export type StepKind = "undo" | "reading";

export type Field = { stack: Stack; cookie: string; meterId: string };

/** What the next step is, given how many entries the run's log has (see the pattern above). */
export function nextKind(logLength: number): StepKind {
  return (logLength - PREFIX) % 2 === 0 ? "undo" : "reading";
}

export function stepBody(kind: StepKind, meterId: string, key: string = crypto.randomUUID()): string {
  const entry = kind === "undo" ? { type: "undo" } : { type: "reading", node: "supply-voltage", reading: SUPPLY_READING };
  return JSON.stringify({ key, entry, ...(kind === "reading" ? { meterId } : {}), at: new Date().toISOString() });
}

export function stepHeaders(stack: Stack, cookie: string): Record<string, string> {
  return { cookie, origin: stack.baseUrl, "content-type": "application/json", "accept-encoding": "gzip, deflate, br" };
}

export async function postStep(stack: Stack, cookie: string, runId: string, body: string, signal?: AbortSignal): Promise<Response> {
  return fetch(`${stack.baseUrl}/api/runs/${runId}/steps`, { method: "POST", headers: stepHeaders(stack, cookie), body, signal });
}

async function mustPost(f: Field, runId: string, body: string): Promise<void> {
  const res = await postStep(f.stack, f.cookie, runId, body);
  if (res.status !== 201) throw new Error(`setup step answered ${res.status}: ${await res.text()}`);
}

/** `count` sessions of the demo technician (one per client, as on separate phones). */
export async function techSessions(stack: Stack, count: number): Promise<string[]> {
  const cookies: string[] = [];
  for (let i = 0; i < count; i++) cookies.push(await stack.signIn(TECH, DEMO_PASSWORD));
  return cookies;
}

/** Signs the technician in and starts one run on the demo rotisserie call, with the 4-entry prefix. */
export async function startField(stack: Stack): Promise<Field & { runId: string }> {
  const cookie = await stack.signIn(TECH, DEMO_PASSWORD);
  const [calls] = await stack.sql().query<mysql.RowDataPacket[]>("SELECT id FROM service_calls WHERE number = ?", [CALL_NUMBER]);
  const callId = calls[0]?.id as string | undefined;
  if (!callId) throw new Error(`demo call ${CALL_NUMBER} is missing`);
  const library = (await (await fetch(`${stack.baseUrl}/api/trees`, { headers: { cookie } })).json()) as {
    trees: { treeId: string; title: string }[];
  };
  const treeId = library.trees.find((t) => t.title === TREE_TITLE)?.treeId;
  if (!treeId) throw new Error(`starter tree "${TREE_TITLE}" is missing`);
  const start = await fetch(`${stack.baseUrl}/calls/${callId}`, {
    method: "POST",
    redirect: "manual",
    headers: { cookie, origin: stack.baseUrl, "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ treeId }),
  });
  const runId = /\/runs\/([0-9a-f-]{36})$/.exec(start.headers.get("location") ?? "")?.[1];
  if (!runId) throw new Error(`starting a run answered ${start.status}`);
  const view = (await (await fetch(`${stack.baseUrl}/api/runs/${runId}`, { headers: { cookie } })).json()) as {
    meters: { id: string; quantity: string; unit: string }[];
  };
  const meterId = view.meters.find((m) => m.quantity === "voltage" && m.unit === "V")?.id;
  if (!meterId) throw new Error("the demo shop has no voltmeter");
  const field = { stack, cookie, meterId };
  for (const node of ["lockout", "discharge-caps", "live-test"]) {
    await mustPost(field, runId, JSON.stringify({ key: crypto.randomUUID(), entry: { type: "acknowledge", node } }));
  }
  await mustPost(field, runId, stepBody("reading", meterId));
  return { ...field, runId };
}

/** Posts undo/reading steps until the run's log has `length` entries. */
export async function extendTo(f: Field, runId: string, from: number, length: number): Promise<void> {
  for (let n = from; n < length; n++) await mustPost(f, runId, stepBody(nextKind(n), f.meterId));
}

/**
 * `count` copies of a run (the run row and its step rows), each with new ids and new idempotency
 * keys, in one transaction per batch. Returns the new run ids.
 */
export async function cloneRun(pool: mysql.Pool, runId: string, count: number): Promise<string[]> {
  const ids = Array.from({ length: count }, () => crypto.randomUUID());
  const conn = await pool.getConnection();
  try {
    for (let i = 0; i < ids.length; i += 500) {
      const batch = ids.slice(i, i + 500);
      await conn.query("CREATE TEMPORARY TABLE clone_ids (id VARCHAR(36) PRIMARY KEY)");
      await conn.query("INSERT INTO clone_ids (id) VALUES ?", [batch.map((id) => [id])]);
      await conn.query("CREATE TEMPORARY TABLE clone_runs AS SELECT r.*, i.id AS clone_id FROM runs r JOIN clone_ids i WHERE r.id = ?", [
        runId,
      ]);
      await conn.query("UPDATE clone_runs SET id = clone_id");
      await conn.query("ALTER TABLE clone_runs DROP COLUMN clone_id");
      await conn.query(
        "CREATE TEMPORARY TABLE clone_steps AS SELECT s.*, i.id AS clone_run FROM run_steps s JOIN clone_ids i WHERE s.run_id = ?",
        [runId],
      );
      await conn.query("UPDATE clone_steps SET id = UUID(), run_id = clone_run, idempotency_key = UUID()");
      await conn.query("ALTER TABLE clone_steps DROP COLUMN clone_run");
      await conn.beginTransaction();
      await conn.query("INSERT INTO runs SELECT * FROM clone_runs");
      await conn.query("INSERT INTO run_steps SELECT * FROM clone_steps");
      await conn.commit();
      await conn.query("DROP TEMPORARY TABLE clone_ids, clone_runs, clone_steps");
    }
  } finally {
    conn.release();
  }
  return ids;
}
