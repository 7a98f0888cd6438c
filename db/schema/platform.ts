import {
  bigint,
  boolean,
  index,
  mysqlEnum,
  mysqlTable,
  uniqueIndex,
  varchar,
  int,
} from "drizzle-orm/mysql-core";
import { createdAt, json, timestamp, uuidPk, uuidRef } from "./columns";

import { ROLES } from "../../app/lib/roles";
export { ROLES, type Role } from "../../app/lib/roles";

export type ShopSettings = { timeZone: string; reportFooter?: string };

export const shops = mysqlTable("shops", {
  id: uuidPk(),
  name: varchar("name", { length: 120 }).notNull(),
  town: varchar("town", { length: 120 }).notNull(),
  settings: json<ShopSettings>("settings").notNull(),
  createdAt: createdAt(),
});

export const users = mysqlTable(
  "users",
  {
    id: uuidPk(),
    email: varchar("email", { length: 254 }).notNull(),
    name: varchar("name", { length: 120 }).notNull(),
    passwordHash: varchar("password_hash", { length: 255 }).notNull(),
    /** Bumped on password change: every session made before it stops working. */
    sessionVersion: int("session_version").notNull().default(1),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("users_email_uq").on(t.email)],
);

export const memberships = mysqlTable(
  "memberships",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id").notNull().references(() => shops.id),
    userId: uuidRef("user_id").notNull().references(() => users.id),
    role: mysqlEnum("role", ROLES).notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("memberships_shop_user_uq").on(t.shopId, t.userId)],
);

export const invitations = mysqlTable(
  "invitations",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id").notNull().references(() => shops.id),
    email: varchar("email", { length: 254 }).notNull(),
    role: mysqlEnum("role", ROLES).notNull(),
    /** SHA-256 of the token in the link; the token itself is never stored. */
    tokenHash: varchar("token_hash", { length: 64 }).notNull(),
    invitedBy: uuidRef("invited_by").notNull().references(() => users.id),
    createdAt: createdAt(),
    expiresAt: timestamp("expires_at").notNull(),
    acceptedAt: timestamp("accepted_at"),
    revokedAt: timestamp("revoked_at"),
  },
  (t) => [uniqueIndex("invitations_token_uq").on(t.tokenHash), index("invitations_shop_idx").on(t.shopId)],
);

/** One row per sign-in. The JWT cookie names the row; sign-out revokes it. */
export const sessions = mysqlTable(
  "sessions",
  {
    id: varchar("id", { length: 64 }).primaryKey(),
    userId: uuidRef("user_id").notNull().references(() => users.id),
    shopId: uuidRef("shop_id").notNull().references(() => shops.id),
    sessionVersion: int("session_version").notNull(),
    createdAt: createdAt(),
    expiresAt: timestamp("expires_at").notNull(),
    revokedAt: timestamp("revoked_at"),
  },
  (t) => [index("sessions_user_idx").on(t.userId)],
);

/** Sign-in attempts, for the rate limit. Keyed by normalised e-mail and client address. */
export const signInAttempts = mysqlTable(
  "sign_in_attempts",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    email: varchar("email", { length: 254 }).notNull(),
    address: varchar("address", { length: 64 }).notNull(),
    succeeded: boolean("succeeded").notNull(),
    at: timestamp("at").notNull(),
  },
  (t) => [index("sign_in_attempts_email_at_idx").on(t.email, t.at), index("sign_in_attempts_address_at_idx").on(t.address, t.at)],
);
