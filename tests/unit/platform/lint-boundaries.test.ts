// The architecture's import boundaries, as eslint.config.js encodes them, checked on small sources
// placed (virtually) in each layer: each forbidden import is reported, each allowed one is not.
import { ESLint } from "eslint";
import { describe, expect, it } from "vitest";

const eslint = new ESLint();

async function refused(filePath: string, source: string): Promise<string[]> {
  const [result] = await eslint.lintText(source, { filePath });
  return result!.messages.filter((m) => m.ruleId === "no-restricted-imports").map((m) => m.message);
}
const imports = (spec: string) => `import x from "${spec}";\nexport default x;\n`;

describe("import boundaries (DESIGN.md: house rules that the code enforces)", () => {
  it("app/engine imports no React, router, database, Node I/O, server module or other app layer", { timeout: 60_000 }, async () => {
    for (const spec of [
      "react",
      "react-router",
      "@react-router/node",
      "drizzle-orm",
      "drizzle-orm/mysql2",
      "mysql2/promise",
      "node:fs",
      "fs",
      "path",
      "../lib/db.server",
      "~/lib/roles",
      "../lib/run-log",
      "../../db/schema",
      "../components/Field",
    ]) {
      expect((await refused("app/engine/verdict.ts", imports(spec))).length, spec).toBeGreaterThan(0);
    }
    for (const spec of ["./units", "../types", "js-quantities", "zod/mini", "jsep"]) {
      expect(await refused("app/engine/markdown/parse.ts", imports(spec)), spec).toEqual([]);
    }
  });

  it("models import no components or routes; lib imports no models", { timeout: 60_000 }, async () => {
    expect(await refused("app/models/calls.server.ts", imports("~/components/Field"))).toHaveLength(1);
    expect(await refused("app/models/calls.server.ts", imports("../routes/call"))).toHaveLength(1);
    expect(await refused("app/models/runs/steps.server.ts", imports("../components/runner/Runner"))).toHaveLength(1);
    expect(await refused("app/models/calls.server.ts", imports("../lib/db.server"))).toEqual([]);
    expect(await refused("app/lib/mail.server.ts", imports("../models/calls.server"))).toHaveLength(1);
    expect((await refused("app/lib/display.ts", imports("~/models/shop.server"))).length).toBeGreaterThan(0);
    expect(await refused("app/lib/display.ts", imports("./run-log"))).toEqual([]);
  });

  it("client code imports no *.server module; route modules and server files may", { timeout: 60_000 }, async () => {
    expect(await refused("app/components/runner/Runner.tsx", imports("~/lib/db.server"))).toHaveLength(1);
    expect(await refused("app/components/Field.tsx", imports("../lib/auth.server.ts"))).toHaveLength(1);
    expect(await refused("app/lib/display.ts", imports("./env.server"))).toHaveLength(1);
    expect(await refused("app/components/Field.tsx", imports("../lib/forms"))).toEqual([]);
    expect(await refused("app/routes/calls._index.tsx", imports("~/lib/auth.server"))).toEqual([]);
    expect(await refused("app/lib/route.server.ts", imports("./http.server"))).toEqual([]);
  });
});
