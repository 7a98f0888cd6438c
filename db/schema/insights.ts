// Owner insights: summary rows written when a real run ends (see docs/decisions/0220), so the
// overview reads a few narrow tables laid out by shop and time instead of joining a million step
// rows. The rows carry small integer keys (insight_keys) rather than ids and text, so a year of a
// busy shop is a few megabytes to scan. Everything here can be rebuilt from the raw run rows
// (`rebuildInsights`); a test does so and compares. Practice runs never get a row.
import { boolean, index, int, mysqlEnum, mysqlTable, primaryKey, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import type { EquipmentCategory } from "../../app/engine/types";
import { timestamp, uuidRef } from "./columns";
import { STEP_VERDICTS } from "./runs";

export const INSIGHT_RUN_STATUSES = ["done", "abandoned"] as const;
export const INSIGHT_KEY_KINDS = ["tree", "technician", "unit", "site", "customer", "equipment", "cause", "node", "part"] as const;

/**
 * A shop's dictionary of what the summary rows refer to: a tree, technician, unit, site or
 * customer (name = its id), an equipment kind (category, make and model as on the unit when the
 * run ended), a root cause (its text), a step (tree id + node key) or a part (number + description).
 */
export const insightKeys = mysqlTable(
  "insight_keys",
  {
    id: int("id").autoincrement().primaryKey(),
    shopId: uuidRef("shop_id").notNull(),
    kind: mysqlEnum("kind", INSIGHT_KEY_KINDS).notNull(),
    name: varchar("name", { length: 400 }).notNull(),
    /** Equipment keys only. */
    category: varchar("category", { length: 32 }).$type<EquipmentCategory>(),
    make: varchar("make", { length: 120 }),
    model: varchar("model", { length: 120 }),
    /** Step and part keys: the tree id / part number and the node key / description, for labels. */
    a: varchar("a", { length: 64 }),
    b: varchar("b", { length: 300 }),
  },
  (t) => [uniqueIndex("insight_keys_name_uq").on(t.shopId, t.kind, t.name)],
);

/** What every filter reads, as keys. */
const dims = () => ({
  shopId: uuidRef("shop_id").notNull(),
  endedAt: timestamp("ended_at").notNull(),
  runId: uuidRef("run_id").notNull(),
  treeK: int("tree_k").notNull(),
  /** Who started the run: the technician on the job (a lead who took it over is counted by `escalated`). */
  technicianK: int("technician_k").notNull(),
  /** The unit's category, make and model when the run ended (the tree's category for a run without a unit). */
  equipmentK: int("equipment_k").notNull(),
  unitK: int("unit_k"),
  siteK: int("site_k"),
  customerK: int("customer_k"),
});

/**
 * One row per real run that ended (root cause recorded, or abandoned). The primary key starts with
 * the shop and the end time, so a period of one shop is one contiguous range of the clustered index.
 */
export const insightRuns = mysqlTable(
  "insight_runs",
  {
    ...dims(),
    status: mysqlEnum("status", INSIGHT_RUN_STATUSES).notNull(),
    /** The root cause (done runs). */
    causeK: int("cause_k"),
    /** The outcome node reached (done runs), for "found here before". */
    endNode: varchar("end_node", { length: 64 }),
    /** Run start → the step that reached the root cause, in whole seconds (done runs). */
    diagnoseSeconds: int("diagnose_seconds"),
    /** Time on the job as the technician recorded it with the outcome. */
    jobMinutes: int("job_minutes"),
    /** The run was handed to a lead at some point. */
    escalated: boolean("escalated").notNull(),
    /** The run belongs to a service call. */
    onCall: boolean("on_call").notNull(),
    /** The run was the first run started on its call (no earlier run on the call). */
    firstOnCall: boolean("first_on_call").notNull(),
    /** A new call was opened on the same unit within 30 days after this run ended (set when that call is opened). */
    cameBack: boolean("came_back").notNull().default(false),
  },
  (t) => [
    primaryKey({ columns: [t.shopId, t.endedAt, t.runId] }),
    uniqueIndex("insight_runs_run_uq").on(t.runId),
    index("insight_runs_unit_idx").on(t.shopId, t.unitK, t.endedAt),
  ],
);

/** One row per reading kept in an ended real run (undone readings left out). */
export const insightReadings = mysqlTable(
  "insight_readings",
  {
    ...dims(),
    seq: int("seq").notNull(),
    nodeK: int("node_k").notNull(),
    verdict: mysqlEnum("verdict", STEP_VERDICTS).notNull(),
  },
  (t) => [primaryKey({ columns: [t.shopId, t.endedAt, t.runId, t.seq] })],
);

/** One row per part line recorded with a root cause. */
export const insightParts = mysqlTable(
  "insight_parts",
  {
    ...dims(),
    position: int("position").notNull(),
    partK: int("part_k").notNull(),
    quantity: int("quantity").notNull(),
  },
  (t) => [primaryKey({ columns: [t.shopId, t.endedAt, t.runId, t.position] })],
);

/**
 * "Found here before": how many completed real runs of a tree (any version) left a question or
 * measurement step by each branch ("answer:<label>" or a verdict), counting each run's last visit.
 */
export const insightStepTallies = mysqlTable(
  "insight_step_tallies",
  {
    shopId: uuidRef("shop_id").notNull(),
    treeId: uuidRef("tree_id").notNull(),
    nodeKey: varchar("node_key", { length: 64 }).notNull(),
    branch: varchar("branch", { length: 220 }).notNull(),
    runs: int("runs").notNull(),
  },
  (t) => [primaryKey({ columns: [t.shopId, t.treeId, t.nodeKey, t.branch] })],
);

/** Completed real runs of a tree per make and model and the outcome node they reached. */
export const insightCauseTallies = mysqlTable(
  "insight_cause_tallies",
  {
    shopId: uuidRef("shop_id").notNull(),
    treeId: uuidRef("tree_id").notNull(),
    make: varchar("make", { length: 120 }).notNull(),
    model: varchar("model", { length: 120 }).notNull(),
    endNode: varchar("end_node", { length: 64 }).notNull(),
    runs: int("runs").notNull(),
  },
  (t) => [primaryKey({ columns: [t.shopId, t.treeId, t.make, t.model, t.endNode] })],
);
