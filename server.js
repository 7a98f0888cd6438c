// Production server: node:http + React Router's request listener (about twice the throughput of
// react-router-serve here), hashed assets served from memory with long cache headers and gzip.
import { createRequestListener } from "@react-router/node";
import { createServer } from "node:http";
import { readFile, stat } from "node:fs/promises";
import { extname, join, normalize } from "node:path";
import { gzipSync } from "node:zlib";

const buildDir = new URL(`./${process.env.BUILD_DIR ?? "build"}/`, import.meta.url);
const root = new URL("client/", buildDir).pathname;
const build = await import(new URL("server/index.js", buildDir).href);
const port = Number(process.env.PORT ?? 3000);
const host = process.env.HOST ?? "0.0.0.0";
const trustProxy = process.env.TRUST_PROXY === "1";

const types = {
  ".js": "text/javascript; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".svg": "image/svg+xml",
  ".png": "image/png",
  ".ico": "image/x-icon",
  ".woff2": "font/woff2",
  ".woff": "font/woff",
  ".json": "application/json",
  ".webmanifest": "application/manifest+json",
  ".txt": "text/plain; charset=utf-8",
};
const compressible = new Set([".js", ".css", ".svg", ".json", ".webmanifest", ".txt"]);
const cache = new Map();

async function loadStatic(pathname) {
  if (cache.has(pathname)) return cache.get(pathname);
  const file = normalize(join(root, decodeURIComponent(pathname)));
  if (!file.startsWith(root)) return null;
  let entry = null;
  try {
    if ((await stat(file)).isFile()) {
      const body = await readFile(file);
      const ext = extname(file);
      entry = {
        body,
        gzip: compressible.has(ext) && body.length > 1024 ? gzipSync(body) : null,
        type: types[ext] ?? "application/octet-stream",
        immutable: pathname.startsWith("/assets/"),
      };
    }
  } catch {
    entry = null;
  }
  if (cache.size < 2000) cache.set(pathname, entry);
  return entry;
}

const app = createRequestListener({
  build,
  mode: process.env.NODE_ENV ?? "production",
  getLoadContext: (request, client) => {
    const forwarded = trustProxy ? request.headers.get("x-forwarded-for")?.split(",")[0]?.trim() : undefined;
    return { clientAddress: forwarded || client.address };
  },
});

const server = createServer(async (req, res) => {
  if (req.method === "GET" || req.method === "HEAD") {
    const pathname = (req.url ?? "/").split("?")[0];
    if (pathname !== "/" && extname(pathname)) {
      const entry = await loadStatic(pathname);
      if (entry) {
        const gz = entry.gzip && /\bgzip\b/.test(req.headers["accept-encoding"] ?? "");
        res.writeHead(200, {
          "content-type": entry.type,
          "cache-control": entry.immutable ? "public, max-age=31536000, immutable" : "public, max-age=3600",
          "x-content-type-options": "nosniff",
          vary: "accept-encoding",
          ...(gz ? { "content-encoding": "gzip" } : {}),
        });
        res.end(req.method === "HEAD" ? undefined : gz ? entry.gzip : entry.body);
        return;
      }
    }
  }
  res.setHeader("x-content-type-options", "nosniff");
  res.setHeader("referrer-policy", "same-origin");
  res.setHeader("x-frame-options", "DENY");
  app(req, res);
});

server.listen(port, host, () => {
  console.log(`› Cluepath listening on http://localhost:${port}`);
});

let closing = false;
function shutdown() {
  if (closing) return;
  closing = true;
  server.close(() => process.exit(0));
  server.closeAllConnections?.();
  setTimeout(() => process.exit(0), 3000).unref();
}
process.on("SIGTERM", shutdown);
process.on("SIGINT", shutdown);
