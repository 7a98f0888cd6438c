// Property test (fast-check) of every API POST route (issue 9, "keep it so"): generated bad payloads —
// wrong types, missing fields, huge strings, odd unicode, deep JSON, wrong content types, malformed
// JSON, bogus units, enormous numbers — never get a 5xx, and every error is JSON `{ error }` with a
// status that fits (4xx, never 401/403 for a signed-in, same-origin caller). The routes are read from
// app/routes.ts: every `api/…` route whose module has an action is fuzzed, and a new one fails the
// first test until it has a fixture below. Requests go through the route modules to the models and
// the real MariaDB, as the server entry would pass them on.
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { RouteConfigEntry } from "@react-router/dev/routes";
import { stableId } from "../../db/seed";
import routes from "../../app/routes";
import type { Ctx } from "../../app/lib/context";
import { closeDb } from "../../app/lib/db.server";
import { createCall } from "../../app/models/calls.server";
import { recordOutcome } from "../../app/models/runs/lifecycle.server";
import { addPhoto } from "../../app/models/runs/photos.server";
import { startRun } from "../../app/models/runs/start.server";
import { postStep } from "../../app/models/runs/steps.server";
import { createDraftTree, createPublishedTree } from "../../app/models/trees/drafts.server";
import { TINY_PNG } from "../support/photo";
import { cookieFor, requestWith, routeArgs } from "../support/session";
import { smallTree } from "../support/trees";

afterAll(() => closeDb());

const RUNS = Number(process.env.FUZZ_RUNS ?? 1000);
const shopId = stableId("shop:tinderbox");
const tech: Ctx = { shopId, userId: stableId("user:tech@tinderbox.example"), role: "technician" };
const lead: Ctx = { shopId, userId: stableId("user:lead@tinderbox.example"), role: "lead" };
const unitId = stableId("unit:larkspur-rotisserie");

// --- the API POST routes, from the route config -------------------------------------------------------

function flatten(entries: RouteConfigEntry[], out: { path: string; file: string }[] = []) {
  for (const e of entries) {
    if (e.path !== undefined) out.push({ path: e.path, file: e.file });
    if (e.children) flatten(e.children, out);
  }
  return out;
}

type Module = { action?: (args: never) => Promise<unknown> };
const modules = import.meta.glob<Module>("../../app/routes/api.*.ts", { eager: true });
const apiPosts = flatten(routes)
  .filter((r) => r.path.startsWith("api/"))
  .map((r) => ({ ...r, module: modules[`../../app/${r.file}`] }))
  .filter((r): r is typeof r & { module: Required<Module> } => typeof r.module?.action === "function");

// --- what each route is called with: a session, its parameters and a well-formed payload to spoil ---

type Body = { kind: "json"; template: Record<string, unknown> } | { kind: "multipart"; fields: Record<string, string> } | { kind: "none" };
type Fixture = { cookie: string; params: Record<string, string>; body: Body };

let fixtures: Record<string, Fixture>;

/** The small tree with every optional text filled in, so each can be spoiled. */
function everyField() {
  const tree = smallTree("Fuzzed draft");
  tree.equipment = "Two-fan convection rotisserie";
  tree.description = "When the fan hums but the wheel stays still.";
  for (const n of tree.nodes) n.body = `What to do at ${n.id}.`;
  return tree;
}

async function runOnCall(treeId: string) {
  const call = await createCall(lead, {
    unitId,
    symptom: "fuzzing the field routes",
    priority: "low",
    assignedTo: tech.userId,
    notes: null,
  });
  return (await startRun(tech, { treeId, callId: call.id })).runId;
}

beforeAll(async () => {
  const techCookie = (await cookieFor("tech@tinderbox.example")).cookie;
  const leadCookie = (await cookieFor("lead@tinderbox.example")).cookie;
  const { treeId, versionId } = await createPublishedTree(lead, smallTree(`Fuzz ${crypto.randomUUID().slice(0, 6)}`), "For the fuzz test");
  const runId = await runOnCall(treeId);
  const statusRun = await runOnCall(treeId);
  const outcomeRun = await runOnCall(treeId);
  await postStep(tech, outcomeRun, { key: crypto.randomUUID(), entry: { type: "answer", node: "cap-look", answer: "yes" } });
  const reportRun = await runOnCall(treeId);
  await postStep(tech, reportRun, { key: crypto.randomUUID(), entry: { type: "answer", node: "cap-look", answer: "yes" } });
  const { reportId } = await recordOutcome(tech, reportRun, { action: "Replaced the run capacitor.", minutes: 20, parts: [] });
  const photo = await addPhoto(tech, runId, { key: crypto.randomUUID(), node: "cap-look", bytes: TINY_PNG });
  const draft = await createDraftTree(lead, smallTree(`Fuzz draft ${crypto.randomUUID().slice(0, 6)}`));
  fixtures = {
    // A run the phone started without signal (each spoiled payload is a fresh attempt; the template's id is new).
    "api/runs": {
      cookie: techCookie,
      params: {},
      body: { kind: "json", template: { id: crypto.randomUUID(), treeId, versionId, callId: null, at: new Date().toISOString() } },
    },
    "api/runs/:runId/steps": {
      cookie: techCookie,
      params: { runId },
      body: {
        kind: "json",
        template: {
          key: crypto.randomUUID(),
          entry: { type: "reading", node: "cap-measure", reading: "1.47 µF" },
          meterId: null,
          at: new Date().toISOString(),
        },
      },
    },
    "api/runs/:runId/notes": {
      cookie: techCookie,
      params: { runId },
      body: { kind: "json", template: { key: crypto.randomUUID(), node: "cap-look", text: "Top of the capacitor is domed." } },
    },
    "api/runs/:runId/photos": {
      cookie: techCookie,
      params: { runId },
      body: { kind: "multipart", fields: { key: crypto.randomUUID(), node: "cap-look" } },
    },
    "api/runs/:runId/status": {
      cookie: techCookie,
      params: { runId: statusRun },
      body: { kind: "json", template: { action: "escalate", reason: "Burnt smell at the terminal block." } },
    },
    "api/runs/:runId/outcome": {
      cookie: techCookie,
      params: { runId: outcomeRun },
      body: {
        kind: "json",
        template: {
          action: "Replaced the run capacitor.",
          minutes: 30,
          parts: [{ partNumber: "RC-15", description: "Motor-run capacitor 1.5 µF", quantity: 1 }],
        },
      },
    },
    // A real run here: finishing one that is not practice is refused (404), never a 5xx, whatever is sent.
    "api/runs/:runId/finish": { cookie: techCookie, params: { runId }, body: { kind: "none" } },
    "api/photos/:photoId": { cookie: techCookie, params: { photoId: photo.photo.id }, body: { kind: "none" } },
    "api/reports/:reportId/send": { cookie: techCookie, params: { reportId }, body: { kind: "json", template: {} } },
    "api/trees/:treeId/draft": {
      cookie: leadCookie,
      params: { treeId: draft.treeId },
      body: {
        kind: "json",
        template: { versionId: draft.versionId, revision: 1, tree: everyField(), layout: { "cap-look": { x: 10, y: 20 } } },
      },
    },
    "api/trees/:treeId/images": { cookie: leadCookie, params: { treeId: draft.treeId }, body: { kind: "multipart", fields: {} } },
  };
});

// --- bad values --------------------------------------------------------------------------------------

/** A number written into the JSON text as is: some are beyond a double (1e999 parses as Infinity). */
const RAW_NUMBERS = [
  "1e308",
  "-1e308",
  "1e999",
  "-1e999",
  "123456789012345678901234567890",
  "-0",
  "4.9e-324",
  "9007199254740993",
  "0.1e-400",
];
const ODD_TEXT = [
  "\ud83d", // half a surrogate pair
  "\udc00\ud800", // two halves the wrong way round
  "\u0000", // NUL
  "\u202e\u202d", // bidi overrides
  "e\u0301\u0301\u0301\u0301\u0301", // stacked combining accents
  "🔥🧯⚡", // astral characters
  "\ufeff", // byte order mark
  "𝟙.𝟝 µF", // mathematical digits
  "1,470 nF", // an ambiguous decimal comma
  "<script>alert(1)</script>",
  "'; DROP TABLE run_steps; --",
  "%s%n%x",
  "../../etc/passwd",
];
const BOGUS_UNITS = [
  "12 furlongs",
  "1e999 V",
  "NaN µF",
  "Infinity Ω",
  "-0 °F",
  "0x1F V",
  "--5 V",
  "5 V V",
  "1.5 µF µF",
  "1e-400 A",
  "−273.16 °C",
  "1.5",
  "µF",
  " ",
  "9".repeat(400) + " V",
];

const oddString = fc.oneof(
  fc.constantFrom(...ODD_TEXT),
  fc.string({ unit: "binary", maxLength: 40 }),
  fc.string({ unit: "grapheme", maxLength: 40 }),
);
// Lengths spread over every size that matters: a varchar's, a TEXT column's, the 4 MB body cap.
const hugeString = fc
  .oneof(fc.integer({ min: 100, max: 1_000 }), fc.integer({ min: 1_000, max: 100_000 }), fc.integer({ min: 100_000, max: 6_000_000 }))
  .map((n) => "x".repeat(n));
const wrongType = fc.oneof(
  fc.constant(null),
  fc.boolean(),
  fc.integer(),
  fc.double(),
  fc.constant([]),
  fc.constant({}),
  fc.array(fc.string(), { maxLength: 3 }),
  fc.dictionary(fc.string({ maxLength: 5 }), fc.integer(), { maxKeys: 3 }),
);
const enormous = fc.oneof(
  fc.constantFrom(1e308, -1e308, Number.MAX_VALUE, 2 ** 64, -(2 ** 63), Number.MIN_VALUE, -0),
  fc.constantFrom(...RAW_NUMBERS).map((raw) => ({ raw })),
);
const missing = fc.constant(undefined); // the field left out
/** A bad value for a field holding `current`: texts get odd, huge or unit-less text more often, numbers enormous ones. */
function badValue(current: unknown): fc.Arbitrary<unknown> {
  if (typeof current === "string")
    return fc.oneof(
      { arbitrary: hugeString, weight: 3 },
      { arbitrary: oddString, weight: 3 },
      { arbitrary: fc.constantFrom(...BOGUS_UNITS), weight: 2 },
      { arbitrary: wrongType, weight: 2 },
      { arbitrary: missing, weight: 1 },
    );
  if (typeof current === "number")
    return fc.oneof(
      { arbitrary: enormous, weight: 3 },
      { arbitrary: wrongType, weight: 2 },
      { arbitrary: fc.constantFrom(...BOGUS_UNITS), weight: 1 },
      { arbitrary: missing, weight: 1 },
    );
  return fc.oneof(
    { arbitrary: wrongType, weight: 3 },
    { arbitrary: oddString, weight: 1 },
    { arbitrary: enormous, weight: 1 },
    { arbitrary: hugeString, weight: 1 },
    { arbitrary: missing, weight: 2 },
  );
}

/** The value at a path of a JSON value. */
const at = (v: unknown, path: (string | number)[]) =>
  path.reduce<unknown>((x, p) => (x as Record<string | number, unknown> | undefined)?.[p], v);

/** The paths of a JSON value's fields, for spoiling one of them. */
function paths(v: unknown, at: (string | number)[] = []): (string | number)[][] {
  if (Array.isArray(v)) return [at, ...v.flatMap((x, i) => paths(x, [...at, i]))];
  if (v && typeof v === "object") return [at, ...Object.entries(v).flatMap(([k, x]) => paths(x, [...at, k]))];
  return [at];
}

/** The template with the value at `path` replaced (or removed when `value` is undefined), as JSON text. */
function spoil(template: unknown, path: (string | number)[], value: unknown): string {
  const copy = structuredClone(template) as Record<string | number, unknown>;
  let raw: string | undefined;
  const put = (v: unknown) => (v && typeof v === "object" && "raw" in v ? ((raw = (v as { raw: string }).raw), "__RAW_NUMBER__") : v);
  if (path.length === 0) return value === undefined ? "" : JSON.stringify(put(value)).replace('"__RAW_NUMBER__"', raw ?? "0");
  let node: Record<string | number, unknown> = copy;
  for (const p of path.slice(0, -1)) node = node[p] as Record<string | number, unknown>;
  const last = path[path.length - 1]!;
  if (value === undefined) {
    if (Array.isArray(node)) node.splice(Number(last), 1);
    else delete node[last];
  } else node[last] = put(value);
  const text = JSON.stringify(copy);
  return raw === undefined ? text : text.replace('"__RAW_NUMBER__"', raw);
}

type Sent = { contentType?: string; body: BodyInit | null; what: string };

/** A deeply nested JSON text: arrays or objects `depth` levels down. */
const deepJson = fc
  .tuple(fc.integer({ min: 100, max: 200_000 }), fc.boolean())
  .map(([depth, arrays]) => (arrays ? "[".repeat(depth) + "]".repeat(depth) : '{"a":'.repeat(depth) + "1" + "}".repeat(depth)));
const malformedJson = fc.oneof(
  fc.constantFrom(
    "{",
    "}",
    '{"key":',
    "[1,2,",
    "nul",
    "{'single':'quotes'}",
    '{"a":1,}',
    "\u0000",
    "",
    "   ",
    '{"a":NaN}',
    '{"a":Infinity}',
    "undefined",
    '"just a string"',
    "42",
    "true",
    "[]",
  ),
  fc.string({ maxLength: 60 }),
);

function payload(body: Body): fc.Arbitrary<Sent> {
  const wrongContentTypes = fc.record({
    contentType: fc.constantFrom(
      "application/x-www-form-urlencoded",
      "text/plain",
      "multipart/form-data; boundary=x",
      "application/xml",
      "image/png",
      "application/json; charset=latin1",
    ),
    body: fc.oneof(fc.constant("a=1&b=2"), fc.constant("<x/>"), fc.string({ maxLength: 80 })),
    what: fc.constant("wrong content type"),
  });
  const raw = (text: fc.Arbitrary<string>, what: string) => text.map((t): Sent => ({ contentType: "application/json", body: t, what }));
  const common = [
    raw(malformedJson, "malformed JSON"),
    raw(deepJson, "deep JSON"),
    wrongContentTypes,
    raw(
      wrongType.map((v) => JSON.stringify(v)),
      "a JSON value of the wrong type",
    ),
  ];
  if (body.kind === "json") {
    const spoiled = fc.constantFrom(...paths(body.template)).chain((path) =>
      badValue(at(body.template, path)).map((value) => ({
        contentType: "application/json",
        body: spoil(body.template, path, value),
        what: `spoiled ${path.join(".") || "(whole)"}`,
      })),
    );
    return fc.oneof({ arbitrary: spoiled, weight: 6 }, ...common.map((arbitrary) => ({ arbitrary, weight: 1 })));
  }
  if (body.kind === "multipart") {
    const fields = fc.record({
      key: fc.oneof(
        fc.constant(crypto.randomUUID()),
        oddString,
        hugeString.map((s) => s.slice(0, 200_000)),
      ),
      node: fc.oneof(fc.constant("cap-look"), oddString, fc.constantFrom(...BOGUS_UNITS)),
      file: fc.oneof(
        fc.constant(TINY_PNG),
        fc.uint8Array({ maxLength: 64 }),
        fc.constant(new TextEncoder().encode("%PDF-1.7")),
        fc.constant(null),
      ),
      fileField: fc.constantFrom("photo", "file", "image"),
    });
    const multipart = fields.map(({ key, node, file, fileField }): Sent => {
      const form = new FormData();
      form.set("key", key);
      form.set("node", node);
      if (file) form.set(fileField, new Blob([file as BlobPart], { type: "image/png" }), "photo.png");
      return {
        body: form,
        what: `multipart key=${key.slice(0, 20)} node=${node.slice(0, 20)} ${fileField}:${file ? file.byteLength : "none"}`,
      };
    });
    return fc.oneof(
      { arbitrary: multipart, weight: 4 },
      raw(fc.constant(JSON.stringify({ key: crypto.randomUUID(), node: "cap-look" })), "JSON to a multipart route"),
      ...common,
    );
  }
  return fc.oneof(...common, raw(fc.constant("{}"), "empty object"));
}

// --- the property ------------------------------------------------------------------------------------

/** Statuses that fit a bad payload from a signed-in, same-origin caller (2xx when it happened to be valid). */
const FITTING = new Set([200, 201, 400, 404, 405, 409, 410, 413, 415, 422, 429]);

async function send(
  route: (typeof apiPosts)[number],
  fixture: Fixture,
  sent: Sent,
): Promise<{ status: number; json: unknown; crash?: string }> {
  const path = "/" + route.path.replace(/:(\w+)/g, (_, name: string) => fixture.params[name]!);
  const headers: Record<string, string> = { origin: "http://localhost" };
  if (sent.contentType) headers["content-type"] = sent.contentType;
  const request = requestWith(fixture.cookie, path, { method: "POST", headers, body: sent.body });
  let res: unknown;
  try {
    res = await route.module.action(routeArgs(request, fixture.params, { clientAddress: "192.0.2.44" }) as never);
  } catch (e) {
    if (!(e instanceof Response))
      return { status: 500, json: null, crash: e instanceof Error ? `${e.name}: ${e.message.slice(0, 300)}` : String(e) };
    res = e;
  }
  if (!(res instanceof Response)) return { status: 200, json: res };
  const text = await res.text();
  let json: unknown = null;
  try {
    json = JSON.parse(text);
  } catch {
    /* not JSON */
  }
  // A save that happened to be valid moves the draft on: later payloads build on it, as the editor
  // does, so they reach the database instead of stopping at the revision check.
  const revision = (json as { revision?: unknown } | null)?.revision;
  if (fixture.body.kind === "json" && "revision" in fixture.body.template && res.status === 200 && typeof revision === "number")
    fixture.body.template.revision = revision;
  return { status: res.status, json };
}

describe("fuzzing every API POST route (fast-check)", () => {
  it("the route config's API POST routes each have a fixture here", () => {
    expect(apiPosts.length).toBeGreaterThanOrEqual(9);
    expect(apiPosts.map((r) => r.path).filter((p) => !(p in fixtures))).toEqual([]);
  });

  it(`${RUNS} generated bad payloads: no 5xx; every error is JSON { error } with a fitting status`, async () => {
    const seen = new Map<string, Map<number, number>>();
    const problems: string[] = [];
    const arbitrary = fc.constantFrom(...apiPosts).chain((route) => payload(fixtures[route.path]!.body).map((sent) => ({ route, sent })));
    // fc.check, not fc.assert: a failing payload can be megabytes long, so the report is `problems`
    // (each cut short) and the seed to run it again (FUZZ_SEED).
    const details = await fc.check(
      fc.asyncProperty(arbitrary, async ({ route, sent }) => {
        const got = await send(route, fixtures[route.path]!, sent);
        const tally = seen.get(route.path) ?? new Map<number, number>();
        tally.set(got.status, (tally.get(got.status) ?? 0) + 1);
        seen.set(route.path, tally);
        const error = (got.json as { error?: unknown } | null)?.error;
        const ok = got.status < 500 && FITTING.has(got.status) && (got.status < 400 || (typeof error === "string" && error.length > 0));
        if (!ok) problems.push(`${route.path} ← ${sent.what}: ${got.status} ${got.crash ?? JSON.stringify(got.json)?.slice(0, 200)}`);
        return ok;
      }),
      { numRuns: RUNS, endOnFailure: true, ...(process.env.FUZZ_SEED ? { seed: Number(process.env.FUZZ_SEED) } : {}) },
    );
    expect(problems, `seed ${details.seed}`).toEqual([]);
    expect(details.failed).toBe(false);
    // Every route was reached, and the bad payloads were mostly refused.
    const total = [...seen.values()].reduce((n, t) => n + [...t.values()].reduce((a, b) => a + b, 0), 0);
    expect(total).toBe(RUNS);
    for (const r of apiPosts) expect(seen.has(r.path), r.path).toBe(true);
    console.log(
      "fuzz statuses by route:\n" +
        [...seen.entries()]
          .map(
            ([path, t]) =>
              `  ${path}: ${[...t.entries()]
                .sort((a, z) => a[0] - z[0])
                .map(([s, n]) => `${s}×${n}`)
                .join(" ")}`,
          )
          .join("\n"),
    );
  }, 300_000);
});
