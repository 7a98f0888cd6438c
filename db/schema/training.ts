// Training: practice scenarios on a published tree version (a hidden fault and the world the
// trainee meets), their assignment to technicians, and the trainer's review of each practice run
// (an overall note and comments on steps). Practice runs themselves are ordinary `runs` rows with
// `practice` set and `scenario_id` pointing here; their steps are `run_steps` rows.
import { date, index, int, mysqlEnum, mysqlTable, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import type { Finding } from "../../app/engine/types";
import type { World } from "../../app/engine/training/script";
import { createdAt, json, timestamp, uuidPk, uuidRef } from "./columns";
import { shops, users } from "./platform";
import { runs } from "./runs";
import { trees, treeVersions } from "./trees";

export const SCENARIO_CHECKS = ["ready", "failing"] as const;
export type ScenarioCheckStatus = (typeof SCENARIO_CHECKS)[number];

export const trainingScenarios = mysqlTable(
  "training_scenarios",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    treeId: uuidRef("tree_id")
      .notNull()
      .references(() => trees.id),
    /** The published version the scenario is written on; pinned, like a run's. */
    versionId: uuidRef("version_id")
      .notNull()
      .references(() => treeVersions.id),
    name: varchar("name", { length: 120 }).notNull(),
    /** What the trainee is told at the start: the complaint as the customer would put it. */
    complaint: varchar("complaint", { length: 500 }).notNull(),
    /** The unit as the trainee would find it: make, model, where it stands. */
    unitText: varchar("unit_text", { length: 300 }).notNull(),
    /** The hidden fault: an outcome node of the version. */
    faultNode: varchar("fault_node", { length: 64 }).notNull(),
    /** What the trainee meets at each scripted step. */
    world: json<World>("world").notNull(),
    /** The engine's check of the script, stored with the script it judged. */
    checkStatus: mysqlEnum("check_status", SCENARIO_CHECKS).notNull(),
    findings: json<Finding[]>("findings").notNull(),
    /** The scenario this one was copied from (onto a newer version of the tree). */
    copiedFrom: uuidRef("copied_from"),
    createdBy: uuidRef("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at").notNull(),
    /** Set when a copy on a newer version takes its place: no new assignments; its runs keep it. */
    retiredAt: timestamp("retired_at"),
  },
  (t) => [index("training_scenarios_shop_idx").on(t.shopId, t.retiredAt), index("training_scenarios_version_idx").on(t.versionId)],
);

/** A scenario given to one technician to practise, optionally by a date. */
export const trainingAssignments = mysqlTable(
  "training_assignments",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    scenarioId: uuidRef("scenario_id")
      .notNull()
      .references(() => trainingScenarios.id),
    traineeId: uuidRef("trainee_id")
      .notNull()
      .references(() => users.id),
    assignedBy: uuidRef("assigned_by")
      .notNull()
      .references(() => users.id),
    dueOn: date("due_on", { mode: "string" }),
    /** The practice run taken for it (the latest, when one was abandoned and taken again). */
    runId: uuidRef("run_id").references(() => runs.id),
    createdAt: createdAt(),
    /** Withdrawn by a trainer before it was taken. */
    withdrawnAt: timestamp("withdrawn_at"),
  },
  (t) => [
    index("training_assignments_trainee_idx").on(t.traineeId, t.withdrawnAt),
    index("training_assignments_scenario_idx").on(t.scenarioId),
    index("training_assignments_shop_idx").on(t.shopId),
  ],
);

/** The trainer's review of one practice run: an overall note, and when it was marked reviewed. */
export const trainingReviews = mysqlTable(
  "training_reviews",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    runId: uuidRef("run_id")
      .notNull()
      .references(() => runs.id),
    reviewerId: uuidRef("reviewer_id")
      .notNull()
      .references(() => users.id),
    note: text("note").notNull(),
    reviewedAt: timestamp("reviewed_at").notNull(),
  },
  (t) => [uniqueIndex("training_reviews_run_uq").on(t.runId), index("training_reviews_shop_idx").on(t.shopId)],
);

/** A trainer's comment on one step of a practice run (by the step's seq in the run's log). */
export const trainingComments = mysqlTable(
  "training_comments",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    runId: uuidRef("run_id")
      .notNull()
      .references(() => runs.id),
    seq: int("seq").notNull(),
    nodeKey: varchar("node_key", { length: 64 }).notNull(),
    text: text("text").notNull(),
    authorId: uuidRef("author_id")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index("training_comments_run_idx").on(t.runId, t.seq)],
);
