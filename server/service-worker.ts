// /sw.js: the service worker (server/worker.js) with this build's version and the files it keeps
// on the phone — the client entry, the route manifest, the root's, the runner's and the phone
// page's chunks with what they import, their styles, the fonts those styles name, and the icons.
// Made once per process from the build's manifest; a new build changes the version, which is how
// phones learn of it ("a new version is ready").
import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { ServerBuild } from "react-router";
import { SHELL_HEADER } from "../app/lib/field-kit";
import template from "./worker.js?raw";

/** The routes whose code the phone keeps: the root, the runner and the phone page. */
export const OFFLINE_ROUTES = ["root", "routes/runs.$runId", "routes/phone"];
/** Public files the installed app shows (manifest and icons). */
const PUBLIC = [
  "/manifest.webmanifest",
  "/icon.svg",
  "/icons/icon-192.png",
  "/icons/icon-512.png",
  "/icons/maskable-512.png",
  "/icons/apple-touch-icon.png",
];

/** The files to keep, in the order the worker caches them. */
export function precacheList(assets: ServerBuild["assets"], clientDir: string): string[] {
  const out = new Set<string>([assets.url, assets.entry.module, ...assets.entry.imports]);
  for (const id of OFFLINE_ROUTES) {
    const r = assets.routes[id];
    if (!r) throw new Error(`the build has no route ${id}`);
    for (const u of [r.module, ...(r.imports ?? []), ...(r.css ?? [])]) if (u) out.add(u);
  }
  // Fonts and images the kept styles name (url(/assets/…)).
  for (const css of [...out].filter((u) => u.endsWith(".css"))) {
    const text = readFileSync(join(clientDir, css), "utf8");
    // Every browser that runs service workers reads woff2; the woff fallbacks stay on the server.
    for (const m of text.matchAll(/url\((\/assets\/[^)"']+)\)/g)) if (!m[1]!.endsWith(".woff")) out.add(m[1]!);
  }
  for (const p of PUBLIC) out.add(p);
  return [...out];
}

/** The worker's source for this build. */
export function workerSource(assets: ServerBuild["assets"], clientDir: string): string {
  const list = precacheList(assets, clientDir);
  const version = createHash("sha256").update(template).update(JSON.stringify(list)).digest("hex").slice(0, 16);
  return template
    .replace('"__VERSION__"', JSON.stringify(version))
    .replace("= __PRECACHE__;", `= ${JSON.stringify(list)};`)
    .replace('"__SHELL_HEADER__"', JSON.stringify(SHELL_HEADER));
}

/** Headers for /sw.js: always checked for a new version; allowed to fetch from this origin only. */
export const WORKER_HEADERS = {
  "content-type": "text/javascript; charset=utf-8",
  "cache-control": "no-cache",
  "content-security-policy": "default-src 'self'",
  "x-content-type-options": "nosniff",
};
