// `node server.js` from the production build, started by a test with its own settings on a free
// port (browser tests and server tests), and a session signed in through /login as a browser would.
import { spawn, type ChildProcess } from "node:child_process";
import { connect, createServer, type Server, type Socket } from "node:net";
import { expect } from "vitest";
import { DEMO_PASSWORD } from "../../db/demo";
import { freePort } from "./e2e-setup";

export const SERVER_TEST_SECRET = "server-test-secret-server-test-secret-0";

export type Started = { url: string; port: number; output: () => string; stop: () => Promise<void>; child: ChildProcess };

/** `node server.js` from the build with these settings (PORT: a free one unless given); resolves once /healthz answers at all. */
export async function startServer(env: Record<string, string>): Promise<Started> {
  const port = env.PORT ? Number(env.PORT) : await freePort();
  let output = "";
  const child = spawn(process.execPath, ["server.js"], {
    env: {
      ...process.env,
      HOST: "127.0.0.1",
      PORT: String(port),
      DATABASE_URL: process.env.E2E_DATABASE_URL!,
      NODE_ENV: "production",
      SECURE_COOKIES: "0",
      AUTH_SECRET: SERVER_TEST_SECRET,
      ...env,
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  child.stdout!.on("data", (d) => (output += d));
  child.stderr!.on("data", (d) => (output += d));
  const url = `http://127.0.0.1:${port}`;
  for (let i = 0; i < 150; i++) {
    if (child.exitCode !== null) throw new Error(`server exited early:\n${output}`);
    if (await fetch(`${url}/healthz`).catch(() => null)) break;
    await new Promise((r) => setTimeout(r, 100));
  }
  const stop = async () => {
    if (child.exitCode === null) {
      child.kill("SIGTERM");
      await new Promise((r) => child.once("exit", r));
    }
  };
  return { url, port, output: () => output, stop, child };
}

/** A session cookie for a demo user, signed in through the /login form as a browser would. */
export async function signIn(url: string, email: string): Promise<string> {
  const res = await fetch(`${url}/login`, {
    method: "POST",
    headers: { origin: url, "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ email, password: DEMO_PASSWORD }),
    redirect: "manual",
  });
  expect(res.status).toBe(302);
  const session = res.headers.getSetCookie().find((c) => c.includes("session-token="));
  expect(session).toBeDefined();
  return session!.split(";")[0]!;
}

/** A TCP relay to MariaDB that the test can cut (refusing and dropping connections) and restore. */
export class DatabaseRelay {
  private server: Server | undefined;
  private sockets = new Set<Socket>();
  constructor(
    readonly port: number,
    private target: { host: string; port: number },
  ) {}
  async up() {
    if (this.server) return;
    this.server = createServer((client) => {
      const upstream = connect(this.target.port, this.target.host);
      for (const s of [client, upstream]) {
        this.sockets.add(s);
        s.on("close", () => this.sockets.delete(s));
        s.on("error", () => {});
      }
      client.pipe(upstream).pipe(client);
      client.on("close", () => upstream.destroy());
      upstream.on("close", () => client.destroy());
    });
    await new Promise<void>((r) => this.server!.listen(this.port, "127.0.0.1", () => r()));
  }
  async down() {
    for (const s of this.sockets) s.destroy();
    await new Promise((r) => (this.server ? this.server.close(r) : r(null)));
    this.server = undefined;
  }
}

/** A relay to the browser tests' database, up, and the database URL that goes through it. */
export async function relayedDatabase(): Promise<{ relay: DatabaseRelay; url: string }> {
  const target = new URL(process.env.E2E_DATABASE_URL!);
  const relay = new DatabaseRelay(await freePort(), { host: target.hostname, port: Number(target.port) });
  await relay.up();
  const viaRelay = new URL(target);
  viaRelay.port = String(relay.port);
  return { relay, url: viaRelay.toString() };
}
