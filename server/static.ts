// The production build's client files (build/client), served from memory: hashed assets under
// /assets/ with year-long immutable caching, the rest for an hour, gzip when it pays. Under
// `npm run dev` Vite serves these instead.
import type { IncomingMessage, ServerResponse } from "node:http";
import { readFile, stat } from "node:fs/promises";
import { extname, join, normalize, sep } from "node:path";
import { gzipSync } from "node:zlib";

const TYPES: Record<string, string> = {
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
const COMPRESSIBLE = new Set([".js", ".css", ".svg", ".json", ".webmanifest", ".txt"]);

type Entry = { body: Buffer; gzip: Buffer | null; type: string; immutable: boolean };

/** What happened to a request: answered from the files, refused as a bad address, or not a file. */
export type StaticOutcome = "served" | "bad-request" | "not-a-file";

export function staticFiles(rootDir: string) {
  const root = normalize(rootDir.endsWith(sep) ? rootDir : rootDir + sep);
  const cache = new Map<string, Entry | null>();

  async function load(pathname: string): Promise<Entry | null | "bad"> {
    if (cache.has(pathname)) return cache.get(pathname) ?? null;
    let decoded: string;
    try {
      decoded = decodeURIComponent(pathname);
    } catch {
      return "bad"; // malformed percent-encoding (URIError)
    }
    if (decoded.includes("\0")) return "bad";
    const file = normalize(join(root, decoded));
    if (!file.startsWith(root)) return null;
    let entry: Entry | null = null;
    try {
      if ((await stat(file)).isFile()) {
        const body = await readFile(file);
        const ext = extname(file);
        entry = {
          body,
          gzip: COMPRESSIBLE.has(ext) && body.length > 1024 ? gzipSync(body) : null,
          type: TYPES[ext] ?? "application/octet-stream",
          immutable: pathname.startsWith("/assets/"),
        };
      }
    } catch {
      entry = null;
    }
    if (cache.size < 2000) cache.set(pathname, entry);
    return entry;
  }

  /** GET/HEAD of a path with a file extension is looked up in the build; anything else is not ours. */
  return async function serve(
    req: IncomingMessage,
    res: ServerResponse,
    pathname: string,
    headers: Record<string, string>,
  ): Promise<StaticOutcome> {
    if ((req.method !== "GET" && req.method !== "HEAD") || pathname === "/" || !extname(pathname)) return "not-a-file";
    const entry = await load(pathname);
    if (entry === "bad") return "bad-request";
    if (!entry) return "not-a-file";
    const gz = entry.gzip !== null && /\bgzip\b/.test(req.headers["accept-encoding"] ?? "");
    res.writeHead(200, {
      ...headers,
      "content-type": entry.type,
      "content-length": String(gz ? entry.gzip!.length : entry.body.length),
      "cache-control": entry.immutable ? "public, max-age=31536000, immutable" : "public, max-age=3600",
      vary: "accept-encoding",
      ...(gz ? { "content-encoding": "gzip" } : {}),
    });
    res.end(req.method === "HEAD" ? undefined : gz ? entry.gzip : entry.body);
    return "served";
  };
}
