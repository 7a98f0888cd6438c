// Field work: service calls, the shop's meters, runs of a tree version and every step of a run as
// its own row (so training review and owner analytics can query steps, not parse blobs).
import { boolean, double, index, int, mysqlEnum, mysqlTable, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import type { Meter, NodeKind, Quantity } from "../../app/engine/types";
import type { ComputedLimits } from "../../app/engine/limits";
import { createdAt, json, timestamp, uuidPk, uuidRef } from "./columns";
import { equipmentUnits } from "./equipment";
import { shops, users } from "./platform";
import { trees, treeVersions } from "./trees";

import { CALL_PRIORITIES, CALL_STATUSES } from "../../app/lib/calls";
export { CALL_PRIORITIES, CALL_STATUSES, type CallPriority, type CallStatus } from "../../app/lib/calls";

/** A meter function and range the shop owns, with its stated accuracy ±(percent % of reading + counts). */
export const meters = mysqlTable(
  "meters",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    name: varchar("name", { length: 120 }).notNull(),
    /** The function: which quantity this range measures. */
    quantity: varchar("quantity", { length: 16 }).$type<Quantity>().notNull(),
    /** Unit of the range and the resolution ("V", "µF", "°F"). */
    unit: varchar("unit", { length: 16 }).notNull(),
    rangeMax: double("range_max").notNull(),
    resolution: double("resolution").notNull(),
    percent: double("percent").notNull(),
    counts: int("counts").notNull(),
    retiredAt: timestamp("retired_at"),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at").notNull(),
  },
  (t) => [index("meters_shop_idx").on(t.shopId)],
);

export const serviceCalls = mysqlTable(
  "service_calls",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    /** 1, 2, 3… per shop, for people to say on the phone. */
    number: int("number").notNull(),
    unitId: uuidRef("unit_id")
      .notNull()
      .references(() => equipmentUnits.id),
    symptom: varchar("symptom", { length: 300 }).notNull(),
    priority: mysqlEnum("priority", CALL_PRIORITIES).notNull(),
    status: mysqlEnum("status", CALL_STATUSES).notNull(),
    assignedTo: uuidRef("assigned_to").references(() => users.id),
    notes: text("notes"),
    openedBy: uuidRef("opened_by")
      .notNull()
      .references(() => users.id),
    openedAt: timestamp("opened_at").notNull(),
    closedAt: timestamp("closed_at"),
    updatedAt: timestamp("updated_at").notNull(),
  },
  (t) => [
    uniqueIndex("service_calls_shop_number_uq").on(t.shopId, t.number),
    index("service_calls_shop_status_idx").on(t.shopId, t.status),
    index("service_calls_assigned_idx").on(t.assignedTo, t.status),
    index("service_calls_unit_idx").on(t.unitId),
    // Owner insights: "no new call on the same unit within 30 days" probes this per closed call.
    index("service_calls_unit_opened_idx").on(t.shopId, t.unitId, t.openedAt),
  ],
);

/**
 * active → paused ⇄ active; active → escalated → (a lead takes over) active; active → done when the
 * outcome is recorded; abandoned from any open state. Reaching an outcome or escalate node keeps the
 * run active (end_kind set) so a mis-tap can still be undone.
 */
export const RUN_STATUSES = ["active", "paused", "escalated", "abandoned", "done"] as const;
export type RunStatus = (typeof RUN_STATUSES)[number];

export const runs = mysqlTable(
  "runs",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    callId: uuidRef("call_id").references(() => serviceCalls.id),
    unitId: uuidRef("unit_id").references(() => equipmentUnits.id),
    treeId: uuidRef("tree_id")
      .notNull()
      .references(() => trees.id),
    /** The published version current when the run started; never changes. */
    versionId: uuidRef("version_id")
      .notNull()
      .references(() => treeVersions.id),
    /** Who holds the run now (a lead after taking it over). */
    technicianId: uuidRef("technician_id")
      .notNull()
      .references(() => users.id),
    startedBy: uuidRef("started_by")
      .notNull()
      .references(() => users.id),
    /** Training runs against a scenario (later issue); kept out of owner analytics. */
    practice: boolean("practice").notNull().default(false),
    scenarioId: varchar("scenario_id", { length: 36 }),
    status: mysqlEnum("status", RUN_STATUSES).notNull(),
    /** Log entries so far; the next step's seq. */
    stepCount: int("step_count").notNull().default(0),
    currentNode: varchar("current_node", { length: 64 }),
    /** Set while the walk stands at an end: "outcome", "escalate" or "recheck-limit". */
    endKind: varchar("end_kind", { length: 16 }),
    endNode: varchar("end_node", { length: 64 }),
    /** The outcome's title, copied when the outcome is recorded. */
    rootCause: varchar("root_cause", { length: 300 }),
    actionTaken: text("action_taken"),
    minutesOnJob: int("minutes_on_job"),
    abandonReason: varchar("abandon_reason", { length: 500 }),
    startedAt: timestamp("started_at").notNull(),
    pausedAt: timestamp("paused_at"),
    completedAt: timestamp("completed_at"),
    updatedAt: timestamp("updated_at").notNull(),
  },
  (t) => [
    index("runs_shop_status_idx").on(t.shopId, t.status),
    index("runs_call_idx").on(t.callId),
    index("runs_unit_idx").on(t.unitId),
    index("runs_technician_idx").on(t.technicianId),
    index("runs_version_idx").on(t.versionId),
  ],
);

export const STEP_TYPES = ["answer", "reading", "nameplate", "acknowledge", "continue", "undo"] as const;
export type StepType = (typeof STEP_TYPES)[number];
export const STEP_VERDICTS = ["low", "within", "high", "marginal"] as const;

/** One log entry of a run, with what the engine made of it on the server. */
export const runSteps = mysqlTable(
  "run_steps",
  {
    id: uuidPk(),
    runId: uuidRef("run_id")
      .notNull()
      .references(() => runs.id),
    shopId: uuidRef("shop_id").notNull(),
    /** Position in the run's log: 0, 1, 2… (the engine's entry index). */
    seq: int("seq").notNull(),
    /** Made on the phone per step; a retry with the same key gets the stored result. */
    idempotencyKey: varchar("idempotency_key", { length: 36 }).notNull(),
    /** SHA-256 of the canonical payload, to tell a retry from a different step under the same key. */
    payloadHash: varchar("payload_hash", { length: 64 }).notNull(),
    type: mysqlEnum("type", STEP_TYPES).notNull(),
    /** Null for undo. */
    nodeKey: varchar("node_key", { length: 64 }),
    kind: varchar("kind", { length: 16 }).$type<NodeKind>(),
    answer: varchar("answer", { length: 220 }),
    /** A reading or nameplate value as typed ("1470 nF"). */
    typed: varchar("typed", { length: 120 }),
    /** In the node's display unit. */
    value: double("value"),
    unit: varchar("unit", { length: 16 }),
    siValue: double("si_value"),
    siUnit: varchar("si_unit", { length: 16 }),
    verdict: mysqlEnum("verdict", STEP_VERDICTS),
    /** On a practice reading: the trainee's own call, the branch the run followed (the verdict is the engine's). */
    call: mysqlEnum("trainee_call", STEP_VERDICTS),
    limitsLo: double("limits_lo"),
    limitsHi: double("limits_hi"),
    /** The limits the engine applied, as computed (text, derivation, formulas). */
    limits: json<ComputedLimits>("limits"),
    /** The engine's sentence: "1.47 µF — within 1.41–1.59 µF (1.5 µF ± 6 %; meter ±0.035 µF)". */
    message: varchar("message", { length: 600 }),
    meterId: uuidRef("meter_id").references(() => meters.id),
    /** The accuracy used for the verdict, kept so a later edit of the meter list changes nothing. */
    meter: json<Meter>("meter"),
    /**
     * The technician confirmed an implausible reading the engine asked about ("That is 0.208 V —
     * did you mean 208 V?"): kept as a record; a replayed log is not asked again (decision 0103).
     */
    confirmed: boolean("confirmed").notNull().default(false),
    uncertainty: double("uncertainty"),
    branch: varchar("branch", { length: 220 }),
    toNode: varchar("to_node", { length: 64 }),
    /** On an undo row: the seq of the step it took back. */
    undoesSeq: int("undoes_seq"),
    /** On a step that a later undo took back. */
    undone: boolean("undone").notNull().default(false),
    enteredBy: uuidRef("entered_by")
      .notNull()
      .references(() => users.id),
    /** The phone's clock when the step was taken (it may reach the server later). */
    clientAt: timestamp("client_at"),
    recordedAt: createdAt(),
  },
  (t) => [
    uniqueIndex("run_steps_run_seq_uq").on(t.runId, t.seq),
    uniqueIndex("run_steps_run_key_uq").on(t.runId, t.idempotencyKey),
    index("run_steps_shop_node_idx").on(t.shopId, t.nodeKey),
  ],
);

/** A technician's note on a step of a run (any step, taken or not). */
export const runNotes = mysqlTable(
  "run_notes",
  {
    id: uuidPk(),
    runId: uuidRef("run_id")
      .notNull()
      .references(() => runs.id),
    shopId: uuidRef("shop_id").notNull(),
    nodeKey: varchar("node_key", { length: 64 }).notNull(),
    idempotencyKey: varchar("idempotency_key", { length: 36 }).notNull(),
    text: text("text").notNull(),
    authorId: uuidRef("author_id")
      .notNull()
      .references(() => users.id),
    /** The phone's clock when the note was written (it may reach the server later, from a queue). */
    clientAt: timestamp("client_at"),
    createdAt: createdAt(),
  },
  (t) => [index("run_notes_run_idx").on(t.runId), uniqueIndex("run_notes_run_key_uq").on(t.runId, t.idempotencyKey)],
);

/** A photo on a step of a run. The bytes live in object storage under a server-made key. */
export const runPhotos = mysqlTable(
  "run_photos",
  {
    id: uuidPk(),
    runId: uuidRef("run_id")
      .notNull()
      .references(() => runs.id),
    shopId: uuidRef("shop_id").notNull(),
    nodeKey: varchar("node_key", { length: 64 }).notNull(),
    idempotencyKey: varchar("idempotency_key", { length: 36 }).notNull(),
    objectKey: varchar("object_key", { length: 200 }).notNull(),
    contentType: varchar("content_type", { length: 40 }).notNull(),
    bytes: int("bytes").notNull(),
    uploadedBy: uuidRef("uploaded_by")
      .notNull()
      .references(() => users.id),
    /** The phone's clock when the photo was taken (it may reach the server later, from a queue). */
    clientAt: timestamp("client_at"),
    createdAt: createdAt(),
    deletedAt: timestamp("deleted_at"),
  },
  (t) => [index("run_photos_run_idx").on(t.runId), uniqueIndex("run_photos_run_key_uq").on(t.runId, t.idempotencyKey)],
);

export const runParts = mysqlTable(
  "run_parts",
  {
    id: uuidPk(),
    runId: uuidRef("run_id")
      .notNull()
      .references(() => runs.id),
    shopId: uuidRef("shop_id").notNull(),
    position: int("position").notNull(),
    partNumber: varchar("part_number", { length: 60 }).notNull(),
    description: varchar("description", { length: 300 }).notNull(),
    quantity: int("quantity").notNull(),
  },
  (t) => [index("run_parts_run_idx").on(t.runId), index("run_parts_shop_part_idx").on(t.shopId, t.partNumber)],
);

/** A run handed to a lead. Open until a lead takes it over or the run is abandoned. */
export const escalations = mysqlTable(
  "escalations",
  {
    id: uuidPk(),
    runId: uuidRef("run_id")
      .notNull()
      .references(() => runs.id),
    shopId: uuidRef("shop_id").notNull(),
    reason: varchar("reason", { length: 500 }).notNull(),
    /** The node the run stood at, and whether the tree itself sent it ("escalate" end). */
    nodeKey: varchar("node_key", { length: 64 }),
    fromTree: boolean("from_tree").notNull().default(false),
    raisedBy: uuidRef("raised_by")
      .notNull()
      .references(() => users.id),
    raisedAt: timestamp("raised_at").notNull(),
    takenBy: uuidRef("taken_by").references(() => users.id),
    takenAt: timestamp("taken_at"),
    closedAt: timestamp("closed_at"),
  },
  (t) => [index("escalations_shop_idx").on(t.shopId, t.closedAt), index("escalations_run_idx").on(t.runId)],
);

/** The service report of a finished run, and where it was e-mailed. */
export const reports = mysqlTable(
  "reports",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    number: int("number").notNull(),
    runId: uuidRef("run_id")
      .notNull()
      .references(() => runs.id),
    callId: uuidRef("call_id").references(() => serviceCalls.id),
    createdBy: uuidRef("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    sentTo: varchar("sent_to", { length: 254 }),
    sentAt: timestamp("sent_at"),
    sendCount: int("send_count").notNull().default(0),
    messageId: varchar("message_id", { length: 300 }),
  },
  (t) => [uniqueIndex("reports_shop_number_uq").on(t.shopId, t.number), uniqueIndex("reports_run_uq").on(t.runId)],
);
