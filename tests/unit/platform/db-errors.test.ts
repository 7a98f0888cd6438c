import mysql from "mysql2/promise";
import { createServer } from "node:net";
import { describe, expect, it } from "vitest";
import { answeringOutages, isDatabaseUnavailable } from "../../../app/lib/errors.server";

async function closedPort(): Promise<number> {
  return new Promise((resolve) => {
    const s = createServer();
    s.listen(0, "127.0.0.1", () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

describe("database outages are told apart from other failures", () => {
  it("a real refused connection (mysql2, nothing listening) is an outage, and becomes a 503 JSON answer", async () => {
    const port = await closedPort();
    const error = await mysql.createConnection({ host: "127.0.0.1", port, user: "root", connectTimeout: 1000 }).catch((e: unknown) => e);
    expect((error as { code?: string }).code).toBe("ECONNREFUSED");
    expect(isDatabaseUnavailable(error)).toBe(true);
    // Drizzle wraps the driver's error as `cause`.
    expect(isDatabaseUnavailable(new Error("Failed query: select 1\nparams: ", { cause: error }))).toBe(true);

    const thrown = await answeringOutages(() => Promise.reject(error)).catch((e: unknown) => e);
    expect(thrown).toBeInstanceOf(Response);
    expect((thrown as Response).status).toBe(503);
    expect(await (thrown as Response).json()).toEqual({
      error: expect.stringContaining("can't reach its database"),
      code: "db_unavailable",
    });
  });

  it("a lost connection, a server shutting down and a Galera node not ready are outages; SQL errors and others are not", () => {
    expect(isDatabaseUnavailable(Object.assign(new Error("Connection lost"), { code: "PROTOCOL_CONNECTION_LOST" }))).toBe(true);
    expect(isDatabaseUnavailable(Object.assign(new Error("shutdown"), { errno: 1053 }))).toBe(true);
    expect(isDatabaseUnavailable(Object.assign(new Error("WSREP has not yet prepared node for application use"), { errno: 1047 }))).toBe(
      true,
    );
    expect(isDatabaseUnavailable(new Error("Can't add new command when connection is in closed state"))).toBe(true);
    expect(isDatabaseUnavailable(Object.assign(new Error("Duplicate entry"), { code: "ER_DUP_ENTRY", errno: 1062 }))).toBe(false);
    expect(isDatabaseUnavailable(Object.assign(new Error("Deadlock"), { code: "ER_LOCK_DEADLOCK", errno: 1213 }))).toBe(false);
    expect(isDatabaseUnavailable(new TypeError("x is undefined"))).toBe(false);
    expect(isDatabaseUnavailable(Response.json({}, { status: 404 }))).toBe(false);
  });

  it("passes other errors and thrown answers through unchanged", async () => {
    const notFound = Response.json({ error: "nope" }, { status: 404 });
    await expect(answeringOutages(() => Promise.reject(notFound))).rejects.toBe(notFound);
    const bug = new TypeError("bug");
    await expect(answeringOutages(() => Promise.reject(bug))).rejects.toBe(bug);
    await expect(answeringOutages(() => 42)).resolves.toBe(42);
  });
});
