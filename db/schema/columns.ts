import { customType, datetime, varchar } from "drizzle-orm/mysql-core";

/**
 * MariaDB stores JSON as LONGTEXT with a json_valid CHECK, so mysql2 hands back strings.
 * This column type serialises on write and parses on read, so callers only see objects.
 */
export const json = <T>(name: string) =>
  customType<{ data: T; driverData: string }>({
    dataType: () => "json",
    toDriver: (value) => JSON.stringify(value),
    fromDriver: (value) => (typeof value === "string" ? (JSON.parse(value) as T) : (value as T)),
  })(name);

/** Random UUID primary keys: not guessable, made in the app so $returningId() works. */
export const uuidPk = () =>
  varchar("id", { length: 36 })
    .primaryKey()
    .$defaultFn(() => crypto.randomUUID());

export const uuidRef = (name: string) => varchar(name, { length: 36 });

export const timestamp = (name: string) => datetime(name, { mode: "date", fsp: 3 });

export const createdAt = () =>
  timestamp("created_at")
    .notNull()
    .$defaultFn(() => new Date());
