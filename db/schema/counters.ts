// Numbers people say (call 1042, report R-0007), one counter row per shop and kind. A creation takes
// its number by incrementing the row inside its own transaction (`UPDATE … SET last =
// LAST_INSERT_ID(last + 1)`), so concurrent creations queue on the row instead of colliding on a
// unique index; on a Galera cluster a conflict between nodes is a deadlock that writeTx retries.
// The unique indexes on the numbered tables stay as the last guard (docs/decisions/0241).
import { int, mysqlTable, primaryKey, varchar } from "drizzle-orm/mysql-core";
import { uuidRef } from "./columns";
import { shops } from "./platform";

export const COUNTERS = ["call", "report"] as const;
export type Counter = (typeof COUNTERS)[number];
/**
 * Rows that number nothing and serve as a shop's queue: "insights" is taken by every transaction
 * that writes a shop's summary rows (app/models/insights/_facts.server.ts).
 */
export const QUEUES = ["insights"] as const;
export type Queue = (typeof QUEUES)[number];

export const shopCounters = mysqlTable(
  "shop_counters",
  {
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    name: varchar("name", { length: 16 }).$type<Counter | Queue>().notNull(),
    /** The last number given out. */
    last: int("last").notNull(),
  },
  (t) => [primaryKey({ columns: [t.shopId, t.name] })],
);
