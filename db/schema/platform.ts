import { bigint, boolean, index, mysqlEnum, mysqlTable, uniqueIndex, varchar, int } from "drizzle-orm/mysql-core";
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
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    userId: uuidRef("user_id")
      .notNull()
      .references(() => users.id),
    role: mysqlEnum("role", ROLES).notNull(),
    createdAt: createdAt(),
    /** Set while the owner has turned this person's access to the shop off; their work stays. */
    deactivatedAt: timestamp("deactivated_at"),
  },
  (t) => [uniqueIndex("memberships_shop_user_uq").on(t.shopId, t.userId)],
);

export const invitations = mysqlTable(
  "invitations",
  {
    id: uuidPk(),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    email: varchar("email", { length: 254 }).notNull(),
    role: mysqlEnum("role", ROLES).notNull(),
    /** SHA-256 of the token in the link; the token itself is never stored. */
    tokenHash: varchar("token_hash", { length: 64 }).notNull(),
    invitedBy: uuidRef("invited_by")
      .notNull()
      .references(() => users.id),
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
    userId: uuidRef("user_id")
      .notNull()
      .references(() => users.id),
    shopId: uuidRef("shop_id")
      .notNull()
      .references(() => shops.id),
    sessionVersion: int("session_version").notNull(),
    createdAt: createdAt(),
    expiresAt: timestamp("expires_at").notNull(),
    revokedAt: timestamp("revoked_at"),
    /** For the person's list of sessions: last request, at most every few minutes (LAST_SEEN_MINUTES). */
    lastSeenAt: timestamp("last_seen_at"),
    /** The browser's User-Agent at sign-in, shortened; shown as "Chrome on Android". */
    userAgent: varchar("user_agent", { length: 400 }),
    /** The client's address at sign-in. */
    address: varchar("address", { length: 64 }),
  },
  (t) => [index("sessions_user_idx").on(t.userId)],
);

/** Links to set a new password ("forgot your password?", or sent by an owner). Single use, short-lived. */
export const passwordResets = mysqlTable(
  "password_resets",
  {
    id: uuidPk(),
    userId: uuidRef("user_id")
      .notNull()
      .references(() => users.id),
    /** SHA-256 of the token in the link; the token itself is never stored. */
    tokenHash: varchar("token_hash", { length: 64 }).notNull(),
    /** The owner who sent it; null when the person asked for it themselves. */
    requestedBy: uuidRef("requested_by").references(() => users.id),
    createdAt: createdAt(),
    expiresAt: timestamp("expires_at").notNull(),
    /** Set when the link is used, or when another link or a password change makes it void. */
    usedAt: timestamp("used_at"),
  },
  (t) => [uniqueIndex("password_resets_token_uq").on(t.tokenHash), index("password_resets_user_idx").on(t.userId)],
);

export const ATTEMPT_PURPOSES = ["sign-in", "password-reset"] as const;
export type AttemptPurpose = (typeof ATTEMPT_PURPOSES)[number];

/** Sign-in attempts, for the rate limit. Keyed by normalised e-mail and client address. */
export const signInAttempts = mysqlTable(
  "sign_in_attempts",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    email: varchar("email", { length: 254 }).notNull(),
    address: varchar("address", { length: 64 }).notNull(),
    succeeded: boolean("succeeded").notNull(),
    at: timestamp("at").notNull(),
    /** Which limit the attempt counts against: signing in, or asking for a password-reset link. */
    purpose: mysqlEnum("purpose", ATTEMPT_PURPOSES).notNull().default("sign-in"),
  },
  (t) => [index("sign_in_attempts_email_at_idx").on(t.email, t.at), index("sign_in_attempts_address_at_idx").on(t.address, t.at)],
);
