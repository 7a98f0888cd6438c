// Database outages, told apart from every other failure. A loader or action that fails because
// MariaDB cannot be reached (refused, reset, lost, timed out, shutting down, a Galera node not
// ready, or no pool connection free in time) answers 503 instead of a generic 500: JSON
// `{ error, code }` for API routes, the error page in the user's words for pages. The server entry
// applies this to every route (server/app.ts); route code may call it too. Failures of the model
// (not found, not allowed, invalid) are mapped elsewhere, by the models' own failure shape.
export const DB_UNAVAILABLE = "db_unavailable";
export const DB_UNAVAILABLE_MESSAGE = "Cluepath can't reach its database; what you typed is kept — try again in a minute.";

/** Node socket errors and mysql2 client errors that mean "no usable connection". */
const CONNECTION_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "ETIMEDOUT",
  "EHOSTUNREACH",
  "ENETUNREACH",
  "ENOTFOUND",
  "EAI_AGAIN",
  "EPIPE",
  "PROTOCOL_CONNECTION_LOST",
  "PROTOCOL_SEQUENCE_TIMEOUT",
  "PROTOCOL_ENQUEUE_AFTER_FATAL_ERROR",
  "POOL_ACQUIRE_TIMEOUT",
]);

/** MariaDB server errors that mean the server is there but cannot serve now. */
const SERVER_ERRNOS = new Set([
  1040, // ER_CON_COUNT_ERROR: too many connections
  1047, // ER_UNKNOWN_COM_ERROR: a Galera node that has not joined the cluster ("WSREP has not yet prepared node")
  1053, // ER_SERVER_SHUTDOWN
  1927, // ER_CONNECTION_KILLED
  2002, // CR_CONNECTION_ERROR
  2003, // CR_CONN_HOST_ERROR
  2006, // CR_SERVER_GONE_ERROR
  2013, // CR_SERVER_LOST
]);

/** True when `error` (or what it wraps: Drizzle wraps mysql2's error as `cause`) is a database outage. */
export function isDatabaseUnavailable(error: unknown): boolean {
  for (let e: unknown = error, depth = 0; e && typeof e === "object" && depth < 5; e = (e as { cause?: unknown }).cause, depth++) {
    const { code, errno, message } = e as { code?: unknown; errno?: unknown; message?: unknown };
    if (typeof code === "string" && CONNECTION_CODES.has(code)) return true;
    if (typeof errno === "number" && SERVER_ERRNOS.has(errno)) return true;
    // mysql2 says this, without a code, for a command sent on a connection that already died.
    if (typeof message === "string" && message.includes("connection is in closed state")) return true;
  }
  return false;
}

/** The 503 answer: `{ error, code }` as JSON, which the page error boundary shows in the user's words. */
export function databaseUnavailable(): Response {
  return Response.json(
    { error: DB_UNAVAILABLE_MESSAGE, code: DB_UNAVAILABLE },
    { status: 503, headers: { "retry-after": "30", "cache-control": "no-store" } },
  );
}

/** Runs a loader or action; a database outage becomes the 503 answer (thrown, as React Router expects). */
export async function answeringOutages<T>(run: () => Promise<T> | T): Promise<T> {
  try {
    return await run();
  } catch (error) {
    if (isDatabaseUnavailable(error)) throw databaseUnavailable();
    throw error;
  }
}
