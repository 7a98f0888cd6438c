// Owner insights: summary rows written when a real run ends (see docs/decisions/0220), so the
// overview reads a few narrow tables laid out by shop and time instead of joining a million step
// rows. Everything here can be rebuilt from the raw run rows (`rebuildInsights`); a test does so
// and compares. Practice runs never get a row.
import { boolean, index, int, mysqlEnum, mysqlTable, primaryKey, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import type { EquipmentCategory } from "../../app/engine/types";
import { timestamp, uuidRef } from "./columns";
import { STEP_VERDICTS } from "./runs";

export const INSIGHT_RUN_STATUSES = ["done", "abandoned"] as const;

/**
 * The dimensions every overview filter reads, copied from the run, its unit, site and customer
 * when the run ends: the equipment as it was on that job.
 */
const dims = () => ({
  shopId: uuidRef("shop_id").notNull(),
  endedAt: timestamp("ended_at").notNull(),
  runId: uuidRef("run_id").notNull(),
  treeId: uuidRef("tree_id").notNull(),
  /** Who started the run: the technician on the job (a lead who took it over is counted by `escalated`). */
  technicianId: uuidRef("technician_id").notNull(),
  unitId: uuidRef("unit_id"),
  siteId: uuidRef("site_id"),
  customerId: uuidRef("customer_id"),
  /** The unit's category, or the tree's for a run without a unit. */
  category: varchar("category", { length: 32 }).$type<EquipmentCategory>().notNull(),
  /** '' for a run without a unit. */
  make: varchar("make", { length: 120 }).notNull(),
  model: varchar("model", { length: 120 }).notNull(),
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
    versionId: uuidRef("version_id").notNull(),
    callId: uuidRef("call_id"),
    /** The outcome node reached (done runs). */
    endNode: varchar("end_node", { length: 64 }),
    rootCause: varchar("root_cause", { length: 300 }),
    startedAt: timestamp("started_at").notNull(),
    /** Run start → the step that reached the root cause, in whole seconds (done runs). */
    diagnoseSeconds: int("diagnose_seconds"),
    /** Time on the job as the technician recorded it with the outcome. */
    jobMinutes: int("job_minutes"),
    /** The run was handed to a lead at some point. */
    escalated: boolean("escalated").notNull(),
    /** The run was the first run started on its call (no earlier run on the call). */
    firstOnCall: boolean("first_on_call").notNull(),
    /** A new call was opened on the same unit within 30 days after this run ended (set when that call is opened). */
    cameBack: boolean("came_back").notNull().default(false),
  },
  (t) => [
    primaryKey({ columns: [t.shopId, t.endedAt, t.runId] }),
    uniqueIndex("insight_runs_run_uq").on(t.runId),
    index("insight_runs_unit_idx").on(t.shopId, t.unitId, t.endedAt),
  ],
);

/** One row per reading kept in an ended real run (undone readings left out). */
export const insightReadings = mysqlTable(
  "insight_readings",
  {
    ...dims(),
    seq: int("seq").notNull(),
    nodeKey: varchar("node_key", { length: 64 }).notNull(),
    verdict: mysqlEnum("verdict", STEP_VERDICTS).notNull(),
  },
  (t) => [primaryKey({ columns: [t.shopId, t.endedAt, t.runId, t.seq] }), index("insight_readings_run_idx").on(t.runId)],
);

/** One row per part line recorded with a root cause. */
export const insightParts = mysqlTable(
  "insight_parts",
  {
    ...dims(),
    position: int("position").notNull(),
    partNumber: varchar("part_number", { length: 60 }).notNull(),
    description: varchar("description", { length: 300 }).notNull(),
    quantity: int("quantity").notNull(),
  },
  (t) => [primaryKey({ columns: [t.shopId, t.endedAt, t.runId, t.position] }), index("insight_parts_run_idx").on(t.runId)],
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
