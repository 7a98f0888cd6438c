// The engine's weight in the browser: bundle each entry minified for the browser with esbuild,
// then gzip it (node:zlib, level 9). The runner route's whole JS budget is 120 KB gzip.
//
//   npx tsx scripts/engine-size.ts
import { build } from "esbuild";
import { gzipSync } from "node:zlib";

const ENTRIES: [string, string][] = [
  ["app/engine/runtime.ts", "runner slice: units, limits, verdicts, formulas, traversal"],
  ["app/engine/index.ts", "whole engine: + zod schemas, validation, Markdown parse/serialize"],
];

async function size(entry: string, external: string[] = []) {
  const out = await build({
    entryPoints: [entry],
    bundle: true,
    minify: true,
    format: "esm",
    platform: "browser",
    target: "es2022",
    write: false,
    metafile: true,
    external,
    logLevel: "silent",
  });
  const code = out.outputFiles[0]!.contents;
  const byPackage = new Map<string, number>();
  for (const [file, info] of Object.entries(Object.values(out.metafile.outputs)[0]!.inputs)) {
    const pkg = /node_modules\/((?:@[^/]+\/)?[^/]+)/.exec(file)?.[1] ?? "app/engine";
    byPackage.set(pkg, (byPackage.get(pkg) ?? 0) + info.bytesInOutput);
  }
  return { min: code.length, gzip: gzipSync(code, { level: 9 }).length, byPackage };
}

const kb = (n: number) => `${(n / 1024).toFixed(1)} KB`;
for (const [entry, what] of ENTRIES) {
  const s = await size(entry);
  console.log(`${entry} (${what})`);
  console.log(`  minified ${kb(s.min)}, gzip ${kb(s.gzip)}`);
  const parts = [...s.byPackage].sort((a, b) => b[1] - a[1]).map(([p, n]) => `${p} ${kb(n)}`);
  console.log(`  minified share: ${parts.join(", ")}`);
}
