// Tree files CLI for authors who keep trees in git.
//
//   npm run trees -- validate <files…>   findings as file:line: severity message; exit 1 on errors
//   npm run trees -- format <file>       the canonical form on stdout
import { readFileSync } from "node:fs";
import { parseTree, serializeTree, validateTree } from "../app/engine/index";
import type { Finding } from "../app/engine/index";
import type { SourceMap } from "../app/engine/index";

function usage(): never {
  process.stderr.write("usage:\n  npm run trees -- validate <files…>\n  npm run trees -- format <file>\n");
  process.exit(2);
}

function read(file: string): string | null {
  try {
    return readFileSync(file, "utf8");
  } catch (e) {
    process.stderr.write(`${file}: can't read it (${(e as NodeJS.ErrnoException).code ?? String(e)})\n`);
    return null;
  }
}

function lineOf(f: Finding, map: SourceMap): number {
  if (f.nodeIndex === undefined) return map.title;
  const n = map.nodes[f.nodeIndex];
  if (!n) return map.title;
  return (f.field !== undefined ? n.fields[f.field] : undefined) ?? n.heading;
}

function validate(files: string[]): number {
  if (files.length === 0) usage();
  let failed = 0;
  for (const file of files) {
    const src = read(file);
    if (src === null) {
      failed++;
      continue;
    }
    const parsed = parseTree(src);
    if (!parsed.ok) {
      for (const e of parsed.errors) process.stdout.write(`${file}:${e.line}:${e.column}: error ${e.message}\n`);
      process.stdout.write(`${file}: ${parsed.errors.length} parse error${parsed.errors.length === 1 ? "" : "s"}\n`);
      failed++;
      continue;
    }
    const result = validateTree(parsed.tree);
    const rows = result.findings.map((f) => ({ f, line: lineOf(f, parsed.map) })).sort((a, b) => a.line - b.line);
    for (const { f, line } of rows) {
      process.stdout.write(`${file}:${line}: ${f.severity} ${f.message} [${f.code}]\n`);
    }
    const summary = `${result.errors} error${result.errors === 1 ? "" : "s"}, ${result.warnings} warning${result.warnings === 1 ? "" : "s"}`;
    process.stdout.write(`${file}: ${result.ok ? "ok" : "not ready to publish"} (${parsed.tree.nodes.length} steps; ${summary})\n`);
    if (!result.ok) failed++;
  }
  return failed ? 1 : 0;
}

function format(files: string[]): number {
  if (files.length !== 1) usage();
  const file = files[0]!;
  const src = read(file);
  if (src === null) return 1;
  const parsed = parseTree(src);
  if (!parsed.ok) {
    for (const e of parsed.errors) process.stderr.write(`${file}:${e.line}:${e.column}: error ${e.message}\n`);
    return 1;
  }
  process.stdout.write(serializeTree(parsed.tree));
  return 0;
}

const [cmd, ...args] = process.argv.slice(2);
let code: number;
if (cmd === "validate") code = validate(args);
else if (cmd === "format") code = format(args);
else usage();
process.exitCode = code;
