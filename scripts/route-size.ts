// The JavaScript a page downloads, from the production build: for each route, the chunks its
// document loads (the client entry, the route manifest, the root and the route's own chunks with
// everything they import), gzipped (node:zlib, level 9), split into what every page loads and what
// the route adds. kB = 1000 bytes.
//
//   npm run build && npx tsx scripts/route-size.ts [route-id …]
import { readFileSync } from "node:fs";
import { pathToFileURL } from "node:url";
import { gzipSync } from "node:zlib";

type RouteAssets = { module: string; imports?: string[] };
type Manifest = { url: string; entry: { module: string; imports: string[] }; routes: Record<string, RouteAssets & { parentId?: string }> };

const dir = process.env.BUILD_DIR ?? "build";
const build = (await import(pathToFileURL(`${dir}/server/index.js`).href)) as { assets: Manifest };
const { assets } = build;

const gz = new Map<string, number>();
function size(url: string): number {
  let n = gz.get(url);
  if (n === undefined) {
    n = gzipSync(readFileSync(`${dir}/client${url}`), { level: 9 }).length;
    gz.set(url, n);
  }
  return n;
}

/** The chunks a route's document loads: its module, its parents' and all they import. */
function chunksOf(routeId: string): Set<string> {
  const out = new Set<string>();
  for (let id: string | undefined = routeId; id; id = assets.routes[id]?.parentId) {
    const r = assets.routes[id];
    if (!r) throw new Error(`no route ${id} in the build`);
    out.add(r.module);
    for (const i of r.imports ?? []) out.add(i);
  }
  return out;
}

const shared = new Set([assets.url, assets.entry.module, ...assets.entry.imports, ...chunksOf("root")]);
const sum = (s: Iterable<string>) => [...s].reduce((t, u) => t + size(u), 0);
const kb = (n: number) => `${(n / 1000).toFixed(1)} kB`;

const ids = process.argv.slice(2).length
  ? process.argv.slice(2)
  : ["routes/runs.$runId", "routes/calls._index", "routes/phone", "routes/trees._index"];
console.log(`every page: ${kb(sum(shared))}`);
for (const id of ids) {
  if (!assets.routes[id]) {
    console.log(`${id}: not in this build`);
    continue;
  }
  const own = [...chunksOf(id)].filter((u) => !shared.has(u));
  console.log(`${id}: own ${kb(sum(own))} + every page's ${kb(sum(shared))} = ${kb(sum(own) + sum(shared))}`);
  for (const u of own.sort((a, b) => size(b) - size(a))) console.log(`    ${u.replace("/assets/", "")} ${kb(size(u))}`);
}
