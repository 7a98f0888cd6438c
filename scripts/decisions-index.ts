// Writes the index of docs/decisions/ into DEVELOPERS.md, between the two marker lines, grouped by
// the number ranges the records are kept in. `npm run docs:decisions` rewrites it; with --check it
// only says whether the index is up to date (a unit test runs that check).
import { readdirSync, readFileSync, writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";

const ROOT = fileURLToPath(new URL("..", import.meta.url));
const GUIDE = `${ROOT}DEVELOPERS.md`;
const BEGIN = "<!-- decisions index: written by npm run docs:decisions -->";
const END = "<!-- end of the decisions index -->";

/** Number ranges, each a part of the product (the first number of each range). */
const GROUPS: [from: number, title: string][] = [
  [1, "The house"],
  [5, "Platform"],
  [14, "Engine"],
  [21, "Authoring (trees, editor, versions)"],
  [31, "Field runs (calls, runner, reports)"],
  [100, "Engine: trade correctness"],
  [120, "Editor and runner screens"],
  [140, "Tests"],
  [160, "Scale-out (Galera, HAProxy)"],
  [180, "Load harnesses"],
  [200, "Server entry, configuration, security headers"],
  [220, "Owner insights"],
  [240, "Hardening"],
  [260, "Accounts"],
  [280, "Training"],
  [300, "Speed of the hot path"],
  [320, "Phone polish"],
  [340, "Offline field mode"],
  [360, "Runner: confirmations and found here before"],
];

export function decisionsIndex(): string {
  const files = readdirSync(`${ROOT}docs/decisions`)
    .filter((f) => /^\d{4}-.+\.md$/.test(f))
    .sort();
  const lines: string[] = [];
  let group = -1;
  for (const file of files) {
    const n = Number(file.slice(0, 4));
    const g = GROUPS.findLastIndex(([from]) => n >= from);
    if (g !== group) {
      if (lines.length) lines.push("");
      lines.push(`${GROUPS[g]?.[1] ?? "Other"}:`, "");
      group = g;
    }
    const title = readFileSync(`${ROOT}docs/decisions/${file}`, "utf8").split("\n")[0]!.replace(/^#\s*/, "");
    lines.push(`- [${title}](docs/decisions/${file})`);
  }
  return [BEGIN, "", ...lines, "", END].join("\n");
}

/** The guide with its index rewritten. */
export function guideWithIndex(guide: string): string {
  const a = guide.indexOf(BEGIN);
  const b = guide.indexOf(END);
  if (a < 0 || b < a) throw new Error(`DEVELOPERS.md has no index markers (${BEGIN} … ${END})`);
  return guide.slice(0, a) + decisionsIndex() + guide.slice(b + END.length);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const guide = readFileSync(GUIDE, "utf8");
  const next = guideWithIndex(guide);
  if (process.argv.includes("--check")) {
    if (next !== guide) {
      console.error("DEVELOPERS.md's decisions index is out of date: run npm run docs:decisions");
      process.exit(1);
    }
  } else {
    writeFileSync(GUIDE, next);
  }
}
