// @ts-check
// Cluepath's server entry (React Router's custom-server way). The request handling itself is
// server/app.ts, the same code in both modes:
//   NODE_ENV=production  imports it from the build (build/server/index.js) and serves build/client;
//   otherwise (npm run dev)  loads it through Vite in middleware mode, with hot reload.
// The configuration is checked before listening: a bad value stops the start with a message that
// names the variable. Plain node:http, no framework server: about twice react-router-serve's
// throughput here (DESIGN.md's stack notes).
import { existsSync } from "node:fs";
import { createServer } from "node:http";

const production = process.env.NODE_ENV === "production";
const buildDir = process.env.BUILD_DIR ?? "build";

/** @typedef {import("./server/app")} AppModule */

/**
 * @param {unknown} error
 * @returns {never}
 */
function stop(error) {
  const message =
    error instanceof Error && error.name === "ConfigError"
      ? error.message
      : error instanceof Error
        ? (error.stack ?? error.message)
        : String(error);
  console.error(message);
  process.exit(1);
}

const server = createServer();
/** @type {AppModule} */
let appModule;
/** @type {(() => Promise<void>) | undefined} */
let closeDev;

try {
  if (production) {
    const entry = new URL(`./${buildDir}/server/index.js`, import.meta.url);
    if (!existsSync(entry)) throw new Error(`No build in ${buildDir}/: run \`npm run build\` first (or set BUILD_DIR).`);
    appModule = await import(entry.href);
    appModule.loadConfig();
    const app = appModule.createApp({ dev: false });
    server.on("request", app);
  } else {
    const vite = await import("vite");
    const devServer = await vite.createServer({ server: { middlewareMode: true, hmr: { server } }, appType: "custom" });
    closeDev = () => devServer.close();
    /** @returns {Promise<AppModule>} */
    const load = async () => /** @type {AppModule} */ (await devServer.ssrLoadModule("./server/app.ts"));
    appModule = await load();
    appModule.loadConfig();
    /** @type {WeakMap<AppModule, import("./server/app").NodeHandler>} */
    const apps = new WeakMap();
    server.on("request", (req, res) => {
      devServer.middlewares(req, res, async () => {
        try {
          // Re-read on every request: Vite hands back the same module until a file changes.
          const mod = await load();
          let app = apps.get(mod);
          if (!app) apps.set(mod, (app = mod.createApp({ dev: true })));
          await app(req, res);
        } catch (error) {
          if (error instanceof Error) devServer.ssrFixStacktrace(error);
          console.error(error);
          if (!res.headersSent) res.writeHead(500, { "content-type": "text/plain; charset=utf-8" });
          res.end("The dev server could not load the app; see its console.");
        }
      });
    });
  }
} catch (error) {
  stop(error);
}

const config = appModule.loadConfig();
const log = appModule.log();

// No request may stop the process: a stray rejection or exception is logged and the server goes on.
process.on("unhandledRejection", (reason) => log.error({ err: appModule.safeError(reason) }, "unhandled rejection"));
process.on("uncaughtException", (error) => log.error({ err: appModule.safeError(error) }, "uncaught exception"));

server.on("clientError", (error, socket) => {
  // Malformed HTTP (bad request line or headers) never reaches a handler: answer 400 and close.
  if (socket.writable && !(/** @type {{ code?: string }} */ (error).code === "ECONNRESET"))
    socket.end("HTTP/1.1 400 Bad Request\r\nConnection: close\r\n\r\n");
  else socket.destroy();
});
server.listen(config.PORT, config.HOST, () => {
  log.info(
    { port: config.PORT, host: config.HOST, mode: production ? "production" : "development" },
    `Cluepath listening on http://localhost:${config.PORT}`,
  );
});

let closing = false;
function shutdown() {
  if (closing) return;
  closing = true;
  setTimeout(() => process.exit(0), 3000).unref();
  server.close(async () => {
    await Promise.allSettled([appModule.close(), closeDev?.()]);
    process.exit(0);
  });
  server.closeIdleConnections();
  setTimeout(() => server.closeAllConnections(), 1000).unref();
}
process.on("SIGTERM", shutdown);
process.on("SIGINT", shutdown);
