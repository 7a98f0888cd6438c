// Every text the schemas accept fits the column that stores it (issue 9 item 4). Each cap — the
// engine's TEXT_CAPS and every string in the models' zod schemas — is compared with its column's
// size as db/schema declares it: a varchar(N) holds N characters (MariaDB counts characters, and
// JavaScript's length is never fewer), a TEXT column 65,535 bytes, and one UTF-16 code unit is at
// most 3 bytes of UTF-8 (RFC 3629: a BMP character is 1–3 bytes; a pair of surrogates, 2 units, is
// 4 bytes). A new string field in a model's schema fails the last check until it is mapped here.
// Then the behaviour: an autosave with every text at its cap is stored whole; a 1,000,000-character
// body is a 422 naming the field, and nothing is written.
import { getTableConfig, type MySqlTable } from "drizzle-orm/mysql-core";
import { afterAll, describe, expect, it } from "vitest";
import * as schema from "../../db/schema";
import { stableId } from "../../db/seed";
import { TEXT_CAPS } from "../../app/engine/schema";
import type { Tree } from "../../app/engine/types";
import type { Ctx } from "../../app/lib/context";
import { closeDb } from "../../app/lib/db.server";
import { createDraftTree } from "../../app/models/trees/drafts.server";
import { loadTreeVersion } from "../../app/models/trees/versions.server";
import * as apiTreeDraft from "../../app/routes/api.trees.$treeId.draft";
import * as invite from "../../app/routes/invite.$token";
import { cookieFor, requestWith, routeArgs } from "../support/session";
import { smallTree } from "../support/trees";

afterAll(() => closeDb());

const lead: Ctx = { shopId: stableId("shop:tinderbox"), userId: stableId("user:lead@tinderbox.example"), role: "lead" };

// --- the columns, as db/schema declares them ---------------------------------------------------------

const TEXT_BYTES = 65_535;
const columns = new Map<string, string>();
for (const table of Object.values(schema)) {
  if (typeof table !== "object" || table === null || !(Symbol.for("drizzle:IsDrizzleTable") in table)) continue;
  const config = getTableConfig(table as MySqlTable);
  for (const c of config.columns) columns.set(`${config.name}.${c.name}`, c.getSQLType());
}

/** How many UTF-16 code units a column holds whatever the text (minus a fixed prefix the app adds). */
function capacity(column: string, prefix = 0): number {
  const type = columns.get(column);
  if (!type) throw new Error(`no column ${column} in db/schema`);
  const varchar = /^varchar\((\d+)\)$/.exec(type);
  if (varchar) return Number(varchar[1]) - prefix;
  if (type === "text") return Math.floor(TEXT_BYTES / 3) - prefix;
  if (type === "json" || type === "longtext") return Number.MAX_SAFE_INTEGER;
  throw new Error(`${column} is ${type}: say how much text it holds`);
}

// --- the engine's caps ----------------------------------------------------------------------------------

/** Where each of the engine's texts is stored; `prefix` is what the app writes before it. */
const ENGINE_COLUMNS: Record<keyof typeof TEXT_CAPS, { column: string; prefix?: number }[]> = {
  treeTitle: [{ column: "trees.title" }, { column: "tree_versions.title" }],
  symptom: [{ column: "trees.symptom" }, { column: "tree_versions.symptom" }],
  equipment: [{ column: "tree_versions.equipment" }],
  nodeTitle: [{ column: "tree_nodes.title" }, { column: "runs.root_cause" }],
  // An answer is the branch key "answer:<label>", and the step row keeps the label and the branch.
  answer: [
    { column: "tree_branches.branch_key", prefix: "answer:".length },
    { column: "run_steps.answer" },
    { column: "run_steps.branch", prefix: "answer:".length },
  ],
  remedy: [{ column: "tree_nodes.data" }],
  part: [{ column: "tree_nodes.data" }],
  reason: [{ column: "tree_nodes.data" }],
  formula: [{ column: "tree_nodes.data" }],
  body: [{ column: "tree_nodes.body" }, { column: "tree_versions.description" }],
};

describe("the engine's caps fit their columns", () => {
  it.each(Object.entries(ENGINE_COLUMNS))("%s", (name, stored) => {
    const cap = TEXT_CAPS[name as keyof typeof TEXT_CAPS];
    for (const { column, prefix } of stored) expect(cap, column).toBeLessThanOrEqual(capacity(column, prefix));
  });
});

// --- every string of the models' schemas ---------------------------------------------------------------

type ZodLike = { _zod: { def: Record<string, unknown> & { type: string } } };
const isZod = (v: unknown): v is ZodLike => typeof v === "object" && v !== null && "_zod" in v;

/** Each string leaf of a schema: its path (union options and array items leave no segment) and its cap. */
function strings(s: ZodLike, path: string, out: { path: string; max: number | null; format?: string }[] = []) {
  const def = s._zod.def;
  switch (def.type) {
    case "string": {
      const checks = ((def.checks as ZodLike[] | undefined) ?? []).map(
        (c) => c._zod.def as { check?: string; maximum?: number; format?: string },
      );
      const max = checks.find((c) => c.check === "max_length")?.maximum ?? null;
      const format = (def.format as string | undefined) ?? checks.find((c) => c.check === "string_format")?.format;
      out.push({ path, max, format });
      break;
    }
    case "object":
      for (const [k, v] of Object.entries(def.shape as Record<string, ZodLike>)) strings(v, `${path}.${k}`, out);
      break;
    case "union":
      for (const o of def.options as ZodLike[]) strings(o, path, out);
      break;
    case "array":
      strings(def.element as ZodLike, path, out);
      break;
    case "pipe":
      strings(def.out as ZodLike, path, out);
      break;
    case "optional":
    case "nullable":
    case "default":
    case "catch":
    case "prefault":
      strings(def.innerType as ZodLike, path, out);
      break;
    default:
      break;
  }
  return out;
}

/** Where each model schema's text is stored. Ids (uuid) and timestamps are fixed-length and left out. */
const MODEL_COLUMNS: Record<string, string[]> = {
  "callInput.symptom": ["service_calls.symptom"],
  "callInput.notes": ["service_calls.notes"],
  "callEditInput.symptom": ["service_calls.symptom"],
  "callEditInput.notes": ["service_calls.notes"],
  "customerInput.name": ["customers.name"],
  "customerInput.phone": ["customers.phone"],
  "siteInput.name": ["sites.name"],
  "siteInput.address": ["sites.address"],
  "siteInput.contactName": ["sites.contact_name"],
  "siteInput.contactEmail": ["sites.contact_email"],
  "unitInput.make": ["equipment_units.make"],
  "unitInput.model": ["equipment_units.model"],
  "unitInput.serial": ["equipment_units.serial"],
  "unitInput.installedOn": ["equipment_units.installed_on:date"],
  "meterInput.name": ["meters.name"],
  "meterInput.unit": ["meters.unit"],
  "statusInput.reason": ["runs.abandon_reason", "escalations.reason"],
  "outcomeInput.action": ["runs.action_taken"],
  "outcomeInput.parts.partNumber": ["run_parts.part_number"],
  "outcomeInput.parts.description": ["run_parts.description"],
  "noteInput.node": ["run_notes.node_key"],
  "noteInput.text": ["run_notes.text"],
  nodeKey: ["run_steps.node_key"],
  "stepPayload.entry.node": ["run_steps.node_key"],
  "stepPayload.entry.answer": ["run_steps.answer"],
  "stepPayload.entry.reading": ["run_steps.typed"],
  "stepPayload.entry.value": ["run_steps.typed"],
  "photoFields.node": ["run_photos.node_key"],
  "nameInput.name": ["users.name"],
  "assignInput.dueOn": ["training_assignments.due_on:date"],
  "commentInput.text": ["training_comments.text"],
  "noteInput.note": ["training_reviews.note"],
};

describe("every text of the models' schemas fits its column", () => {
  const modules = import.meta.glob<Record<string, unknown>>("../../app/models/**/*.server.ts", { eager: true });
  const found = Object.values(modules).flatMap((mod) =>
    Object.entries(mod)
      .filter(([, v]) => isZod(v))
      .flatMap(([name, v]) => strings(v as ZodLike, name).map((s) => ({ ...s, path: s.path }))),
  );
  // Leaves of the same path (options of a union) all must fit.
  const texts = found.filter((s) => s.format !== "uuid" && s.format !== "datetime");

  it("the schemas are found (a sanity check on the walk)", () => {
    expect(texts.length).toBeGreaterThan(20);
  });

  it.each(texts.map((t) => [t.path, t] as const))("%s", (path, t) => {
    const stored = MODEL_COLUMNS[path];
    expect(stored, `${path} is not mapped to a column in MODEL_COLUMNS`).toBeDefined();
    for (const column of stored!) {
      if (column.endsWith(":date")) continue; // a date string, checked by its own pattern
      expect(t.max, `${path} has no maximum length`).not.toBeNull();
      expect(t.max!, column).toBeLessThanOrEqual(capacity(column));
    }
  });
});

// --- behaviour ------------------------------------------------------------------------------------------

/** The small tree with every text the engine takes at its cap. */
function atTheCaps(): Tree {
  const t = smallTree("T".repeat(TEXT_CAPS.treeTitle));
  t.symptom = "S".repeat(TEXT_CAPS.symptom);
  t.equipment = "E".repeat(TEXT_CAPS.equipment);
  // Characters of 3 bytes each (the worst case per code unit): "€" is U+20AC, 3 bytes in UTF-8.
  t.description = "€".repeat(TEXT_CAPS.body);
  const q = t.nodes[0]!;
  if (q.kind !== "question") throw new Error("the small tree starts with a question");
  q.title = `${"Q".repeat(TEXT_CAPS.nodeTitle - 1)}?`;
  q.body = "€".repeat(TEXT_CAPS.body);
  q.answers[0]!.label = "y".repeat(TEXT_CAPS.answer);
  const out = t.nodes.find((n) => n.kind === "outcome")!;
  if (out.kind === "outcome") out.remedy = "R".repeat(TEXT_CAPS.remedy);
  return t;
}

describe("autosave at and over the caps (through the API)", () => {
  const save = async (treeId: string, versionId: string, tree: unknown) => {
    const { cookie } = await cookieFor("lead@tinderbox.example");
    return (await apiTreeDraft.action(
      routeArgs(
        requestWith(cookie, `/api/trees/${treeId}/draft`, {
          method: "POST",
          headers: { origin: "http://localhost", "content-type": "application/json" },
          body: JSON.stringify({ versionId, revision: 1, tree, layout: {} }),
        }),
        { treeId },
      ),
    )) as Response;
  };

  it("a tree with every text at its cap is saved and read back whole", async () => {
    const { treeId, versionId } = await createDraftTree(lead, smallTree(`Caps ${crypto.randomUUID().slice(0, 6)}`));
    const tree = atTheCaps();
    const res = await save(treeId, versionId, tree);
    expect(res.status).toBe(200);
    expect((await loadTreeVersion(lead, treeId, "draft")).tree).toEqual(tree);
  });

  it("a 1,000,000-character node body is a 422 naming the field; nothing is saved", async () => {
    const { treeId, versionId } = await createDraftTree(lead, smallTree(`Huge ${crypto.randomUUID().slice(0, 6)}`));
    const tree = smallTree("Huge body");
    tree.nodes[1]!.body = "x".repeat(1_000_000);
    const res = await save(treeId, versionId, tree);
    expect(res.status).toBe(422);
    const body = (await res.json()) as { error: string; code: string; fields: Record<string, string> };
    expect(body.code).toBe("too-long");
    expect(body.error).toMatch(/^tree\.nodes\[1\]\.body: .*20000 characters/);
    expect(Object.keys(body.fields)).toEqual(["tree.nodes[1].body"]);
    expect((await loadTreeVersion(lead, treeId, "draft")).version.revision).toBe(1);
  });

  it("each cap plus one character is refused the same way, for every text of the tree", async () => {
    const { treeId, versionId } = await createDraftTree(lead, smallTree(`Over ${crypto.randomUUID().slice(0, 6)}`));
    const over: [string, (t: Tree) => void][] = [
      ["tree.title", (t) => (t.title = "T".repeat(TEXT_CAPS.treeTitle + 1))],
      ["tree.symptom", (t) => (t.symptom = "S".repeat(TEXT_CAPS.symptom + 1))],
      ["tree.equipment", (t) => (t.equipment = "E".repeat(TEXT_CAPS.equipment + 1))],
      ["tree.description", (t) => (t.description = "D".repeat(TEXT_CAPS.body + 1))],
      ["tree.nodes[0].title", (t) => (t.nodes[0]!.title = "Q".repeat(TEXT_CAPS.nodeTitle + 1))],
      [
        "tree.nodes[0].answers[0].label",
        (t) => ((t.nodes[0] as { answers: { label: string }[] }).answers[0]!.label = "y".repeat(TEXT_CAPS.answer + 1)),
      ],
      ["tree.nodes[2].remedy", (t) => ((t.nodes[2] as { remedy: string }).remedy = "R".repeat(TEXT_CAPS.remedy + 1))],
    ];
    for (const [field, change] of over) {
      const tree = smallTree("Over the cap");
      change(tree);
      const res = await save(treeId, versionId, tree);
      expect(res.status, field).toBe(422);
      expect(Object.keys(((await res.json()) as { fields: object }).fields), field).toEqual([field]);
    }
  });

  it("a JSON body over 4 MB is refused before it is parsed (413)", async () => {
    const { treeId, versionId } = await createDraftTree(lead, smallTree(`Big ${crypto.randomUUID().slice(0, 6)}`));
    const res = await save(treeId, versionId, { ...smallTree("Big"), description: "x".repeat(5 * 1024 * 1024) });
    expect(res.status).toBe(413);
  });
});

describe("route forms with caps of their own", () => {
  it("an invitation's name over users.name's 120 characters is a form error, not a database error", async () => {
    expect(capacity("users.name")).toBe(120);
    const res = (await invite.action(
      routeArgs(
        new Request("http://localhost/invite/x", { method: "POST", body: new URLSearchParams({ name: "N".repeat(121), password: "x" }) }),
        { token: "x" },
      ),
    )) as unknown as {
      init: { status: number };
      data: { errors: Record<string, string> };
    };
    expect(res.init.status).toBe(400);
    expect(res.data.errors.name).toMatch(/120/);
  });
});
