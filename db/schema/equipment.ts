import { date, index, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import { createdAt, json, uuidPk, uuidRef } from "./columns";
import { shops } from "./platform";

import type { EquipmentCategory } from "../../app/engine/types";
export { CATEGORIES as EQUIPMENT_CATEGORIES, type EquipmentCategory } from "../../app/engine/types";

/** Ratings read off the unit's nameplate, kept as entered (value + unit). */
export type NameplateRatings = Record<string, { value: number; unit: string }>;

export const customers = mysqlTable(
  "customers",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    name: varchar("name", { length: 160 }).notNull(),
    phone: varchar("phone", { length: 40 }),
    createdAt: createdAt(),
  },
  (t) => [index("customers_shop_idx").on(t.shopId)],
);

export const sites = mysqlTable(
  "sites",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    customerId: uuidRef("customer_id")
      .notNull()
      .references(() => customers.id),
    name: varchar("name", { length: 160 }).notNull(),
    address: varchar("address", { length: 300 }).notNull(),
    contactName: varchar("contact_name", { length: 120 }).notNull(),
    contactEmail: varchar("contact_email", { length: 254 }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("sites_shop_idx").on(t.shopId), index("sites_customer_idx").on(t.customerId)],
);

export const equipmentUnits = mysqlTable(
  "equipment_units",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    siteId: uuidRef("site_id")
      .notNull()
      .references(() => sites.id),
    category: varchar("category", { length: 32 }).$type<EquipmentCategory>().notNull(),
    make: varchar("make", { length: 120 }).notNull(),
    model: varchar("model", { length: 120 }).notNull(),
    serial: varchar("serial", { length: 120 }).notNull(),
    installedOn: date("installed_on", { mode: "string" }),
    nameplate: json<NameplateRatings>("nameplate").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("equipment_units_shop_idx").on(t.shopId), index("equipment_units_site_idx").on(t.siteId)],
);
