import { double, index, int, mysqlEnum, mysqlTable, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import type { EquipmentCategory, NodeKind } from "../../app/engine/types";
import { createdAt, json, timestamp, uuidPk, uuidRef } from "./columns";
import { shops, users } from "./platform";

export const VERSION_STATES = ["draft", "published", "retired"] as const;
export type VersionState = (typeof VERSION_STATES)[number];

/** A tree's stable identity in a shop. Its content lives in versions. */
export const trees = mysqlTable(
  "trees",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    title: varchar("title", { length: 200 }).notNull(),
    category: varchar("category", { length: 32 }).$type<EquipmentCategory>().notNull(),
    symptom: varchar("symptom", { length: 300 }).notNull(),
    createdBy: uuidRef("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at").notNull(),
  },
  (t) => [index("trees_shop_idx").on(t.shopId)],
);

/**
 * One version of a tree. A draft changes (its revision counts saves, for optimistic concurrency);
 * a published or retired version never changes again — the model layer refuses it.
 */
export const treeVersions = mysqlTable(
  "tree_versions",
  {
    id: uuidPk(),
    treeId: uuidRef("tree_id")
      .notNull()
      .references(() => trees.id),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    /** 1, 2, 3… once published; null while a draft. */
    number: int("number"),
    state: mysqlEnum("state", VERSION_STATES).notNull(),
    title: varchar("title", { length: 200 }).notNull(),
    category: varchar("category", { length: 32 }).$type<EquipmentCategory>().notNull(),
    symptom: varchar("symptom", { length: 300 }).notNull(),
    equipment: varchar("equipment", { length: 300 }),
    description: text("description"),
    startKey: varchar("start_key", { length: 64 }).notNull(),
    changeNote: varchar("change_note", { length: 500 }),
    authorId: uuidRef("author_id")
      .notNull()
      .references(() => users.id),
    /** Who saved it last (a draft can have more than one editor). */
    updatedBy: uuidRef("updated_by"),
    publishedBy: uuidRef("published_by"),
    basedOnId: uuidRef("based_on_id"),
    /**
     * The tree's id while this version is its open draft, else null. The unique index makes "one
     * open draft per tree" a fact of the database, even for two editors clicking at once.
     */
    openDraftOf: uuidRef("open_draft_of"),
    revision: int("revision").notNull().default(1),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at").notNull(),
    publishedAt: timestamp("published_at"),
    retiredAt: timestamp("retired_at"),
  },
  (t) => [
    index("tree_versions_tree_idx").on(t.treeId),
    uniqueIndex("tree_versions_tree_number_uq").on(t.treeId, t.number),
    uniqueIndex("tree_versions_open_draft_uq").on(t.openDraftOf),
  ],
);

/** A node of a version: the common fields as columns, the kind's own fields in `data`. */
export const treeNodes = mysqlTable(
  "tree_nodes",
  {
    id: uuidPk(),
    versionId: uuidRef("version_id")
      .notNull()
      .references(() => treeVersions.id),
    shopId: uuidRef("shop_id").notNull(),
    /** The author's node id ("check-fan-cap"), unique within a valid version. */
    nodeKey: varchar("node_key", { length: 64 }).notNull(),
    position: int("position").notNull(),
    kind: varchar("kind", { length: 16 }).$type<NodeKind>().notNull(),
    title: varchar("title", { length: 300 }).notNull(),
    body: text("body"),
    data: json<Record<string, unknown>>("data").notNull(),
    /** Where the editor's canvas shows it; null until placed. */
    x: double("x"),
    y: double("y"),
  },
  (t) => [index("tree_nodes_version_idx").on(t.versionId, t.position), index("tree_nodes_key_idx").on(t.versionId, t.nodeKey)],
);

/** A branch of a version: from a node, by an answer / verdict / "next", to a node. */
export const treeBranches = mysqlTable(
  "tree_branches",
  {
    id: uuidPk(),
    versionId: uuidRef("version_id")
      .notNull()
      .references(() => treeVersions.id),
    shopId: uuidRef("shop_id").notNull(),
    fromKey: varchar("from_key", { length: 64 }).notNull(),
    /** "answer:<label>", "low" | "within" | "high" | "marginal", or "next". */
    branchKey: varchar("branch_key", { length: 220 }).notNull(),
    position: int("position").notNull(),
    toKey: varchar("to_key", { length: 64 }).notNull(),
    recheckMax: int("recheck_max"),
    recheckOnExceed: varchar("recheck_on_exceed", { length: 64 }),
  },
  (t) => [index("tree_branches_version_idx").on(t.versionId, t.fromKey)],
);

/**
 * An image used in a tree's step bodies (a wiring diagram, a photo of the part). The bytes live in
 * object storage under a server-made key; bodies link to /trees/:treeId/images/:id.
 */
export const treeImages = mysqlTable(
  "tree_images",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    treeId: uuidRef("tree_id")
      .notNull()
      .references(() => trees.id),
    objectKey: varchar("object_key", { length: 200 }).notNull(),
    mime: varchar("mime", { length: 40 }).notNull(),
    bytes: int("bytes").notNull(),
    /** The uploader's file name, shown and used as the download name; never part of the key. */
    filename: varchar("filename", { length: 200 }).notNull(),
    createdBy: uuidRef("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index("tree_images_tree_idx").on(t.shopId, t.treeId)],
);
