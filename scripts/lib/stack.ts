// A throwaway Cluepath stack on loopback for the load harnesses (bench:app, chaos): its own MariaDB
// (scripts/db with DB_DIR/DB_PORT), migrated and seeded with the demo data, a production build,
// and `node server.js` on it. Everything lives in one temporary folder that stop() removes.
//
// STACK_CPU_PROF=DIR runs the app server under `node --cpu-prof`, its profile written to DIR when
// the stack stops (open it in Chrome's DevTools, or summarise it with scripts/cpu-profile.ts).
//
// Ports: STACK_PORT_BASE=B gives the app B, MariaDB B+1 (and leaves B+2, B+3 for the S3 fake and the
// mail catcher, which these harnesses do not need); without it the OS picks free ports.
//
// App code used: none. The database is prepared by running db/migrate.ts and db/seed.ts as
// commands, and sign-in goes through the /login form like a browser.
import { spawn, execFile, type ChildProcess } from "node:child_process";
import { cpSync, mkdirSync, mkdtempSync, readFileSync, renameSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import { promisify } from "node:util";
import mysql from "mysql2/promise";

export const ROOT = new URL("../../", import.meta.url).pathname.replace(/\/$/, "");
const run = promisify(execFile);

export function log(message: string): void {
  process.stderr.write(`› ${message}\n`);
}

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.listen(0, "127.0.0.1", () => {
      const a = s.address();
      s.close(() => (a && typeof a === "object" ? resolve(a.port) : reject(new Error("no free port"))));
    });
  });
}

/** CPU seconds (user + system) a process has used so far, from /proc/PID/stat. */
export function cpuSeconds(pid: number): number {
  const stat = readFileSync(`/proc/${pid}/stat`, "utf8");
  const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
  // Fields 14 and 15 of stat(5) (utime, stime) are the 12th and 13th after the command name.
  return (Number(fields[11]) + Number(fields[12])) / 100; // CLK_TCK is 100 on Linux
}

export type StackOptions = {
  /** Names the temporary folder and the database. */
  name: string;
  /** Extra routes built into a copy of the app: URL path → the route module's file name and source. */
  extraRoutes?: Record<string, { file: string; source: string }>;
};

export class Stack {
  readonly dir: string;
  readonly appPort: number;
  readonly dbPort: number;
  readonly baseUrl: string;
  readonly dbUrl: string;
  private readonly dbDir: string;
  private buildDir = "";
  private server: ChildProcess | null = null;
  private serverLog = "";
  private adminPool: mysql.Pool | null = null;
  private readonly authSecret = crypto.randomUUID() + crypto.randomUUID();

  private constructor(dir: string, appPort: number, dbPort: number, dbName: string) {
    this.dir = dir;
    this.appPort = appPort;
    this.dbPort = dbPort;
    this.dbDir = join(dir, "db");
    this.baseUrl = `http://127.0.0.1:${appPort}`;
    this.dbUrl = `mysql://root@127.0.0.1:${dbPort}/${dbName}`;
  }

  /** Starts MariaDB, migrates and seeds, builds, and starts one app server. */
  static async start(options: StackOptions): Promise<Stack> {
    const base = Number(process.env.STACK_PORT_BASE);
    const [appPort, dbPort] = base > 0 ? [base, base + 1] : [await freePort(), await freePort()];
    const dir = mkdtempSync(join(tmpdir(), `cluepath-${options.name}-`));
    const stack = new Stack(dir, appPort, dbPort, `cluepath_${options.name.replace(/\W/g, "_")}`);
    const stop = () => {
      void stack.stop().finally(() => process.exit(130));
    };
    process.once("SIGINT", stop);
    process.once("SIGTERM", stop);
    try {
      await stack.startDb();
      log("migrating and seeding the demo data");
      const env = { ...process.env, DATABASE_URL: stack.dbUrl };
      await run(process.execPath, ["--import", "tsx", "db/migrate.ts"], { cwd: ROOT, env });
      await run(process.execPath, ["--import", "tsx", "db/seed.ts"], { cwd: ROOT, env });
      await stack.build(options.extraRoutes);
      await stack.startServer();
    } catch (e) {
      await stack.stop();
      throw e;
    }
    return stack;
  }

  // --- MariaDB -------------------------------------------------------------------------------

  private dbEnv() {
    return { ...process.env, DB_DIR: this.dbDir, DB_PORT: String(this.dbPort), DB_NAME: new URL(this.dbUrl).pathname.slice(1) };
  }

  async startDb(): Promise<void> {
    const started = Date.now();
    await run(join(ROOT, "scripts/db"), ["start"], { cwd: ROOT, env: this.dbEnv() });
    log(`MariaDB up on 127.0.0.1:${this.dbPort} in ${((Date.now() - started) / 1000).toFixed(1)} s`);
  }

  async stopDb(): Promise<void> {
    await this.adminPool?.end().catch(() => {});
    this.adminPool = null;
    await run(join(ROOT, "scripts/db"), ["stop"], { cwd: ROOT, env: this.dbEnv() }).catch(() => {});
  }

  dbPid(): number {
    return Number(readFileSync(join(this.dbDir, "mariadb.pid"), "utf8").trim());
  }

  /** SIGKILL to mariadbd, then waits until the process is gone. */
  async killDb(): Promise<void> {
    const pid = this.dbPid();
    process.kill(pid, "SIGKILL");
    while (alive(pid)) await sleep(20);
    await this.adminPool?.end().catch(() => {});
    this.adminPool = null;
  }

  /** A small pool of the harness's own (root) connections, for setup and counters. */
  sql(): mysql.Pool {
    return (this.adminPool ??= mysql.createPool({ uri: this.dbUrl, connectionLimit: 4, timezone: "Z", multipleStatements: false }));
  }

  // --- build ---------------------------------------------------------------------------------

  /** The production build's client folder (build/client), for harnesses that weigh it. */
  get clientDir(): string {
    if (!this.buildDir) throw new Error("no build yet");
    return join(this.buildDir, "client");
  }

  /**
   * A production build in the temporary folder. With extra routes it builds a copy of app/ (and
   * db/, public/) whose routes.ts is the app's own list plus those routes; the app itself is not
   * touched.
   */
  private async build(extraRoutes?: StackOptions["extraRoutes"]): Promise<void> {
    const started = Date.now();
    const out = join(this.dir, "build");
    let projectDir = ROOT;
    // Packages for the build and for the built server, which both live in the temporary folder.
    symlinkSync(join(ROOT, "node_modules"), join(this.dir, "node_modules"));
    if (extraRoutes && Object.keys(extraRoutes).length) {
      projectDir = join(this.dir, "src");
      mkdirSync(projectDir);
      // The app's own build configuration (its server entry is server/app.ts); BUILD_DIR below points
      // the output here.
      for (const part of ["app", "db", "server", "public", "package.json", "tsconfig.json", "vite.config.ts", "react-router.config.ts"])
        cpSync(join(ROOT, part), join(projectDir, part), { recursive: true });
      renameSync(join(projectDir, "app/routes.ts"), join(projectDir, "app/routes.app.ts"));
      const lines = Object.entries(extraRoutes).map(([path, r]) => {
        writeFileSync(join(projectDir, "app/routes", r.file), r.source);
        return `  route(${JSON.stringify(path.replace(/^\//, ""))}, ${JSON.stringify(`routes/${r.file}`)}),`;
      });
      writeFileSync(
        join(projectDir, "app/routes.ts"),
        `import { route, type RouteConfig } from "@react-router/dev/routes";\nimport app from "./routes.app";\n\nexport default [\n  ...app,\n${lines.join("\n")}\n] satisfies RouteConfig;\n`,
      );
    }
    const buildLog = join(this.dir, "build.log");
    try {
      const r = await run(join(ROOT, "node_modules/.bin/react-router"), ["build"], {
        cwd: projectDir,
        env: { ...process.env, BUILD_DIR: out, NODE_ENV: "production" },
        maxBuffer: 64 * 1024 * 1024,
      });
      writeFileSync(buildLog, r.stdout + r.stderr);
    } catch (e) {
      const err = e as { stdout?: string; stderr?: string };
      throw new Error(`the production build failed:\n${err.stdout ?? ""}${err.stderr ?? ""}`, { cause: e });
    }
    this.buildDir = out;
    log(
      `production build${projectDir === ROOT ? "" : " (the app plus the harness's own routes)"} in ${((Date.now() - started) / 1000).toFixed(1)} s`,
    );
  }

  // --- app server ----------------------------------------------------------------------------

  get serverPid(): number {
    const pid = this.server?.pid;
    if (!pid || this.server?.exitCode !== null) throw new Error("the app server is not running");
    return pid;
  }

  /** `node server.js` on the build; resolves once /healthz answers 200. */
  async startServer(): Promise<void> {
    const started = Date.now();
    // STACK_CPU_PROF=DIR: the server runs under `node --cpu-prof` and writes its profile there on exit.
    const profile = process.env.STACK_CPU_PROF ? ["--cpu-prof", `--cpu-prof-dir=${process.env.STACK_CPU_PROF}`] : [];
    const child = spawn(process.execPath, [...profile, "server.js"], {
      cwd: ROOT,
      env: {
        ...process.env,
        NODE_ENV: "production",
        PORT: String(this.appPort),
        HOST: "127.0.0.1",
        DATABASE_URL: this.dbUrl,
        AUTH_SECRET: this.authSecret,
        SECURE_COOKIES: "0",
        // server.js reads BUILD_DIR relative to itself.
        BUILD_DIR: relative(ROOT, this.buildDir),
        // Unused by the measured paths; pointed at this stack's own (closed) ports all the same.
        S3_ENDPOINT: `http://127.0.0.1:${this.appPort + 2}`,
        SMTP_URL: `smtp://127.0.0.1:${this.appPort + 3}`,
      },
      stdio: ["ignore", "pipe", "pipe"],
    });
    this.server = child;
    this.serverLog = "";
    const keep = (d: Buffer) => {
      this.serverLog = (this.serverLog + d.toString()).slice(-20_000);
    };
    child.stdout?.on("data", keep);
    child.stderr?.on("data", keep);
    for (let i = 0; i < 300; i++) {
      if (child.exitCode !== null) throw new Error(`the app server exited:\n${this.serverLog}`);
      if (await answers(`${this.baseUrl}/healthz`)) {
        log(`app server up on ${this.baseUrl} (pid ${child.pid}) in ${((Date.now() - started) / 1000).toFixed(1)} s`);
        return;
      }
      await sleep(100);
    }
    throw new Error(`the app server did not answer /healthz:\n${this.serverLog}`);
  }

  /** SIGKILL (or another signal) to the app server, then waits for it to exit. */
  async killServer(signal: NodeJS.Signals = "SIGKILL"): Promise<void> {
    const child = this.server;
    if (!child || child.exitCode !== null || child.signalCode !== null) return;
    const exited = new Promise((r) => child.once("exit", r));
    child.kill(signal);
    await exited;
  }

  serverOutput(): string {
    return this.serverLog;
  }

  // --- sessions ------------------------------------------------------------------------------

  /** Signs in through the /login form as a browser does; returns the Cookie header to send. */
  async signIn(email: string, password: string): Promise<string> {
    const res = await fetch(`${this.baseUrl}/login`, {
      method: "POST",
      redirect: "manual",
      headers: { origin: this.baseUrl, "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ email, password }),
    });
    const cookies = res.headers.getSetCookie().map((c) => c.split(";")[0]!);
    if (res.status !== 302 || !cookies.some((c) => c.includes("session-token=")))
      throw new Error(`sign-in as ${email} answered ${res.status}`);
    return cookies.join("; ");
  }

  // --- teardown ------------------------------------------------------------------------------

  async stop(): Promise<void> {
    await this.killServer("SIGTERM").catch(() => {});
    await this.stopDb();
    rmSync(this.dir, { recursive: true, force: true });
  }
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

async function answers(url: string): Promise<boolean> {
  try {
    return (await fetch(url, { signal: AbortSignal.timeout(2000) })).ok;
  } catch {
    return false;
  }
}
