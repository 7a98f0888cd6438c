// Summarises a V8 CPU profile (`node --cpu-prof`, e.g. the app server's under
// `STACK_CPU_PROF=DIR npm run bench:app`): self time by package or source folder, and the
// functions with the most self time. Read-only; prints Markdown-ish text.
//
//   npx tsx scripts/cpu-profile.ts DIR/CPU.*.cpuprofile [top=25]
//
// App code imported: none.
import { readFileSync } from "node:fs";

type Node = { id: number; callFrame: { functionName: string; url: string; lineNumber: number }; hitCount?: number; children?: number[] };
type Profile = { nodes: Node[]; samples: number[]; timeDeltas: number[]; startTime: number; endTime: number };

const [file, topArg] = process.argv.slice(2);
if (!file) {
  console.error("usage: npx tsx scripts/cpu-profile.ts FILE.cpuprofile [top]");
  process.exit(2);
}
const top = Number(topArg ?? 25);
const profile = JSON.parse(readFileSync(file, "utf8")) as Profile;

// Self time per node: samples × the median sampling interval. Not the time deltas themselves: on a
// busy machine the sampler is descheduled too, and a delta of 200 ms would be charged to whatever
// frame happened to be sampled next.
const sorted = [...profile.timeDeltas].sort((a, b) => a - b);
const interval = sorted[sorted.length >> 1] ?? 1000;
const self = new Map<number, number>();
for (const id of profile.samples) self.set(id, (self.get(id) ?? 0) + interval);

/** Where a frame's code lives: an npm package, a folder of the build, or what V8 calls it. */
function place(url: string, name: string): string {
  if (!url) return name.startsWith("(") ? name : "(native)";
  const pkg = /node_modules\/((?:@[^/]+\/)?[^/]+)/.exec(url);
  if (pkg) return pkg[1]!;
  if (url.startsWith("node:")) return `node:${url.slice(5).split("/")[0]}`;
  const built = /\/build\/server\/(.+)$/.exec(url);
  if (built) return `build/server/${built[1]}`;
  return url.replace(/^file:\/\//, "").replace(/^.*\/(app|server|scripts)\//, "$1/");
}

const total = [...self.values()].reduce((a, b) => a + b, 0);
const idle = profile.nodes.filter((n) => n.callFrame.functionName === "(idle)").reduce((a, n) => a + (self.get(n.id) ?? 0), 0);
const busy = total - idle;
const byPlace = new Map<string, number>();
const byFunction = new Map<string, number>();
for (const n of profile.nodes) {
  const t = self.get(n.id) ?? 0;
  if (!t || n.callFrame.functionName === "(idle)") continue;
  const where = place(n.callFrame.url, n.callFrame.functionName);
  byPlace.set(where, (byPlace.get(where) ?? 0) + t);
  const fn = `${n.callFrame.functionName || "(anonymous)"} ${where}:${n.callFrame.lineNumber + 1}`;
  byFunction.set(fn, (byFunction.get(fn) ?? 0) + t);
}
const pct = (t: number) => `${((100 * t) / busy).toFixed(1)} %`;
const rows = (m: Map<string, number>) =>
  [...m]
    .sort((a, b) => b[1] - a[1])
    .slice(0, top)
    .map(([k, t]) => `${pct(t).padStart(7)}  ${(t / 1000).toFixed(0).padStart(7)} ms  ${k}`);
console.log(`${file}: ${(busy / 1000).toFixed(0)} ms busy of ${(total / 1000).toFixed(0)} ms sampled\n`);
console.log("self time by place:");
console.log(rows(byPlace).join("\n"));
console.log("\nself time by function:");
console.log(rows(byFunction).join("\n"));
