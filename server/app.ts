// The request handler of Cluepath's server, the same under `npm run dev` (loaded through Vite in
// middleware mode by server.js) and in production (built into build/server/index.js). In order,
// every request gets: a request id (X-Request-Id) and one log line; the build's static files
// (production only) and the service worker (/sw.js, server/service-worker.ts); a 400 for an address
// that cannot be read; the same-origin check for every
// state-changing method; React Router with the client's address in the load context; security
// headers; every Set-Cookie of the answer; brotli or gzip where the client accepts it; and a 500
// answer (never a stopped process) for an error.
import { createReadableStreamFromReadable } from "@react-router/node";
import { randomUUID } from "node:crypto";
import type { IncomingMessage, ServerResponse } from "node:http";
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import { fileURLToPath } from "node:url";
import { createRequestHandler, matchRoutes, type AppLoadContext, type RouteObject, type ServerBuild } from "react-router";
import * as serverBuild from "virtual:react-router/server-build";
import { closeDb } from "../app/lib/db.server";
import { env, loadConfig, type Env } from "../app/lib/env.server";
import { answeringOutages } from "../app/lib/errors.server";
import { CROSS_SITE_MESSAGE, SAFE_METHODS, crossSiteReason } from "../app/lib/http.server";
import { log, safeError } from "../app/lib/log.server";
import { baseSecurityHeaders } from "../app/lib/security-headers.server";
import {
  compressible,
  compressionStages,
  compressWhole,
  MIN_BYTES,
  negotiateEncoding,
  streamsAsRendered,
  varyOnEncoding,
} from "./compression";
import { WORKER_HEADERS, workerSource } from "./service-worker";
import { staticFiles } from "./static";

export { loadConfig, log, safeError, type Env };
// The build's own exports stay readable from build/server/index.js (assets, routes…): tools and
// tests that inspect the build keep working.
export * from "virtual:react-router/server-build";

export type AppOptions = { dev: boolean };
export type NodeHandler = (req: IncomingMessage, res: ServerResponse) => Promise<void>;

/** Closes what the app holds open (the database pool) before the process exits. */
export function close(): Promise<void> {
  return closeDb();
}

/** The Node request handler for this build. */
export function createApp({ dev }: AppOptions): NodeHandler {
  const config = env();
  const build = answeringOutagesIn(serverBuild as unknown as ServerBuild);
  const handle = createRequestHandler(build, dev ? "development" : "production");
  const routes = routeTree(build);
  const clientDir = fileURLToPath(new URL("../client/", import.meta.url));
  const serveStatic = dev ? null : staticFiles(clientDir);
  // The service worker, made from this build's manifest on first request (production only).
  let worker: string | null = null;

  return async function app(req, res) {
    const started = performance.now();
    const requestId = requestIdOf(req, config);
    const pathname = (req.url ?? "/").split("?")[0] ?? "/";
    const tls = isTls(req, config);
    const headers: Record<string, string> = { "x-request-id": requestId };
    let route = "(static)";
    res.once("close", () => {
      const line = {
        reqId: requestId,
        method: req.method,
        route,
        status: res.statusCode,
        ms: Math.round((performance.now() - started) * 10) / 10,
      };
      if (!res.writableFinished) log().info({ ...line, aborted: true }, "request");
      else log().info(line, "request");
    });

    try {
      if (serveStatic) {
        const outcome = await serveStatic(req, res, pathname, { ...headers, "x-content-type-options": "nosniff" });
        if (outcome === "served") return;
        if (outcome === "bad-request") return fail(res, 400, "This address is not valid.", headers, pathname);
        if (pathname === "/sw.js" && (req.method === "GET" || req.method === "HEAD")) {
          route = "/sw.js";
          worker ??= workerSource(build.assets, clientDir);
          res.writeHead(200, { ...headers, ...WORKER_HEADERS });
          res.end(req.method === "HEAD" ? undefined : worker);
          return;
        }
      }
      route = routePattern(routes, pathname);
      Object.assign(headers, baseSecurityHeaders({ tls, pathname }));

      const host = req.headers.host;
      if (!req.url?.startsWith("/") || !host || !/^[A-Za-z0-9.-]+(:\d{1,5})?$|^\[[0-9A-Fa-f:.]+\](:\d{1,5})?$/.test(host)) {
        return fail(res, 400, "This request is not valid.", headers, pathname);
      }
      const origin = `${tls ? "https" : "http"}://${host}`;
      const method = (req.method ?? "GET").toUpperCase();
      if (!SAFE_METHODS.has(method)) {
        const reason = crossSiteReason({ get: (name) => headerValue(req, name) }, origin);
        if (reason) {
          log().warn({ reqId: requestId, method, route, reason }, "cross-site request refused");
          return fail(res, 403, CROSS_SITE_MESSAGE, headers, "/api/");
        }
      }

      const controller = new AbortController();
      res.once("close", () => {
        if (!res.writableFinished) controller.abort();
      });
      let request: Request;
      try {
        request = toRequest(req, origin, method, controller.signal);
      } catch {
        return fail(res, 400, "This request is not valid.", headers, pathname);
      }
      const context: AppLoadContext = { clientAddress: clientAddressOf(req, config), requestId, dev };
      const response = await handle(request, context);
      await send(req, res, response, headers);
    } catch (error) {
      log().error({ reqId: requestId, method: req.method, route, err: safeError(error) }, "request failed");
      if (!res.headersSent) fail(res, 500, "Cluepath hit an unexpected error. Try again in a moment.", headers, pathname);
      else res.destroy();
    }
  };
}

/** Routes whose actions are pages' forms: not the JSON API and not Auth.js's own endpoints. */
function isPage(path: string | undefined): boolean {
  return !path?.startsWith("api/") && !path?.startsWith("auth/");
}

function isFormBody(contentType: string | null): boolean {
  return contentType !== null && /^\s*(application\/x-www-form-urlencoded|multipart\/form-data)\b/i.test(contentType);
}

/** A GET to a JSON route that only takes POST: 405 with Allow, in JSON like every API answer. */
const postOnly = () => Response.json({ error: "Use POST." }, { status: 405, headers: { allow: "POST" } });

/**
 * A page's action reads a form (React Router posts <Form> as one): a body of another type is
 * refused with 415 before the action runs, and a request with no body type reads as an empty form,
 * so no body makes an action fail while reading it. JSON routes (/api/) check their own bodies.
 */
function formOnly<A extends { request: Request }>(args: A): A {
  const type = args.request.headers.get("content-type");
  if (isFormBody(type)) return args;
  if (type !== null) throw Response.json({ error: "Send this as a form: Cluepath's pages post forms." }, { status: 415 });
  const headers = new Headers(args.request.headers);
  headers.set("content-type", "application/x-www-form-urlencoded");
  return {
    ...args,
    request: new Request(args.request.url, { method: args.request.method, headers, body: "", signal: args.request.signal }),
  };
}

/**
 * Every loader and action of the build answers a database outage with 503 (errors.server.ts); a
 * page's action takes forms only (formOnly); an API route with an action but no loader answers GET
 * with 405.
 */
function answeringOutagesIn(build: ServerBuild): ServerBuild {
  const routes: ServerBuild["routes"] = {};
  for (const [id, route] of Object.entries(build.routes)) {
    if (!route) continue;
    const { loader, action } = route.module;
    routes[id] = {
      ...route,
      module: {
        ...route.module,
        ...(loader ? { loader: (args: Parameters<typeof loader>[0]) => answeringOutages(() => loader(args)) } : {}),
        ...(!loader && action && route.path?.startsWith("api/") ? { loader: postOnly } : {}),
        ...(action
          ? { action: (args: Parameters<typeof action>[0]) => answeringOutages(() => action(isPage(route.path) ? formOnly(args) : args)) }
          : {}),
      },
    };
  }
  return { ...build, routes };
}

type RouteNode = { id: string; path?: string; index?: boolean; caseSensitive?: boolean; children: RouteNode[] };

function routeTree(build: ServerBuild): RouteNode[] {
  const nodes = new Map<string, RouteNode>();
  for (const r of Object.values(build.routes))
    if (r) nodes.set(r.id, { id: r.id, path: r.path, index: r.index, caseSensitive: r.caseSensitive, children: [] });
  const roots: RouteNode[] = [];
  for (const r of Object.values(build.routes)) {
    if (!r) continue;
    const parent = r.parentId ? nodes.get(r.parentId) : undefined;
    (parent ? parent.children : roots).push(nodes.get(r.id)!);
  }
  return roots;
}

/** The route's pattern (/runs/:runId), not the address: ids and tokens stay out of the log. */
function routePattern(routes: RouteNode[], pathname: string): string {
  const data = pathname.endsWith(".data");
  const path = data ? pathname.slice(0, -".data".length).replace(/\/_root$/, "/") || "/" : pathname;
  let matches: ReturnType<typeof matchRoutes>;
  try {
    matches = matchRoutes(routes as RouteObject[], path);
  } catch {
    matches = null;
  }
  if (!matches) return "(no route)";
  const pattern =
    "/" +
    matches
      .map((m) => m.route.path ?? "")
      .filter(Boolean)
      .join("/");
  return data ? `${pattern} (data)` : pattern;
}

function headerValue(req: IncomingMessage, name: string): string | null {
  const v = req.headers[name];
  return v === undefined ? null : Array.isArray(v) ? v.join(", ") : v;
}

/** Over TLS: the socket itself, or (behind a trusted proxy) X-Forwarded-Proto's first value. */
function isTls(req: IncomingMessage, config: Env): boolean {
  if ((req.socket as { encrypted?: boolean }).encrypted) return true;
  return config.TRUST_PROXY && headerValue(req, "x-forwarded-proto")?.split(",")[0]?.trim().toLowerCase() === "https";
}

function clientAddressOf(req: IncomingMessage, config: Env): string | undefined {
  const forwarded = config.TRUST_PROXY ? headerValue(req, "x-forwarded-for")?.split(",")[0]?.trim() : undefined;
  return forwarded || req.socket.remoteAddress;
}

/** A trusted proxy's X-Request-Id when it looks like one, else a new UUID. */
function requestIdOf(req: IncomingMessage, config: Env): string {
  const given = config.TRUST_PROXY ? headerValue(req, "x-request-id") : null;
  return given && /^[A-Za-z0-9._:-]{8,128}$/.test(given) ? given : randomUUID();
}

function toRequest(req: IncomingMessage, origin: string, method: string, signal: AbortSignal): Request {
  const headers = new Headers();
  for (let i = 0; i + 1 < req.rawHeaders.length; i += 2) headers.append(req.rawHeaders[i]!, req.rawHeaders[i + 1]!);
  const init: RequestInit & { duplex?: "half" } = { method, headers, signal };
  if (method !== "GET" && method !== "HEAD") {
    init.body = createReadableStreamFromReadable(req);
    init.duplex = "half";
  }
  // origin + path: a path starting with // stays a path, never another host.
  return new Request(`${origin}${req.url}`, init);
}

/**
 * Writes a fetch Response: each Set-Cookie as its own header, the body streamed with back-pressure,
 * compressed when the client accepts it and the body is worth it (compression.ts). Pages and data
 * requests are compressed as they stream; other answers (JSON) are read whole, compressed in one
 * go when they reach MIN_BYTES, and sent with their length.
 */
async function send(req: IncomingMessage, res: ServerResponse, response: Response, base: Record<string, string>): Promise<void> {
  const textual = compressible(response.headers, response.status);
  let encoding = textual && response.body && req.method !== "HEAD" ? negotiateEncoding(headerValue(req, "accept-encoding")) : null;
  let whole: Buffer | null = null;
  if (encoding && !streamsAsRendered(response.headers)) {
    whole = Buffer.from(await response.arrayBuffer());
    if (whole.length < MIN_BYTES) encoding = null;
    else whole = await compressWhole(whole, encoding);
  }
  const raw: string[] = [];
  const own = new Set<string>();
  response.headers.forEach((value, name) => {
    if (name === "set-cookie" || (textual && name === "vary") || ((encoding || whole) && name === "content-length")) return;
    raw.push(name, value);
    own.add(name);
  });
  for (const cookie of response.headers.getSetCookie()) raw.push("set-cookie", cookie);
  if (textual) raw.push("vary", varyOnEncoding(response.headers.get("vary")));
  if (encoding) raw.push("content-encoding", encoding);
  if (whole) raw.push("content-length", String(whole.length));
  for (const [name, value] of Object.entries(base)) if (!own.has(name)) raw.push(name, value);
  res.writeHead(response.status, response.statusText || undefined, raw);
  if (whole) {
    res.end(whole);
    return;
  }
  if (!response.body || req.method === "HEAD") {
    await response.body?.cancel().catch(() => {});
    res.end();
    return;
  }
  try {
    const body = Readable.fromWeb(response.body as import("node:stream/web").ReadableStream);
    await (encoding ? pipeline(body, ...compressionStages(encoding), res) : pipeline(body, res));
  } catch (error) {
    // The client went away mid-answer: nothing to send it; anything else is worth a line.
    if (!res.destroyed || !(error as { code?: string }).code?.startsWith("ERR_STREAM_PREMATURE_CLOSE")) {
      log().warn({ err: safeError(error) }, "answer cut short");
    }
  }
}

/** An answer made here: JSON `{ error }` for API addresses (and refusals), plain text otherwise. */
function fail(res: ServerResponse, status: number, message: string, headers: Record<string, string>, pathname: string): void {
  const api = pathname.startsWith("/api/");
  res.writeHead(status, {
    ...headers,
    "content-type": api ? "application/json; charset=utf-8" : "text/plain; charset=utf-8",
    "cache-control": "no-store",
  });
  res.end(api ? JSON.stringify({ error: message }) : message);
}
