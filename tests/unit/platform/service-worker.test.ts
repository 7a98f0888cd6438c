// The service worker served as /sw.js: the files it keeps come from the build's manifest (the
// runner's and the phone page's chunks with their imports and styles, the woff2 fonts those
// styles name, the icons), the script parses, and its version changes exactly when what it keeps
// changes (which is how a phone learns that a new version is ready).
import { mkdirSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Script } from "node:vm";
import type { ServerBuild } from "react-router";
import { describe, expect, it } from "vitest";
import { precacheList, workerSource } from "../../../server/service-worker";

const dir = join(tmpdir(), `cluepath-sw-${process.pid}`);
mkdirSync(join(dir, "assets"), { recursive: true });
writeFileSync(
  join(dir, "assets/root-1.css"),
  "@font-face{src:url(/assets/sans-400.woff2) format('woff2'),url(/assets/sans-400.woff) format('woff')}",
);

function manifest(runnerChunk = "/assets/runs._runId-1.js"): ServerBuild["assets"] {
  const route = (id: string, module: string, extra: object = {}) => ({
    id,
    module,
    hasAction: false,
    hasLoader: true,
    hasClientAction: false,
    hasClientLoader: false,
    hasClientMiddleware: false,
    hasErrorBoundary: false,
    ...extra,
  });
  return {
    url: "/assets/manifest-1.js",
    version: "1",
    entry: { module: "/assets/entry.client-1.js", imports: ["/assets/react-dom-1.js"] },
    routes: {
      root: route("root", "/assets/root-1.js", { css: ["/assets/root-1.css"] }),
      "routes/runs.$runId": route("routes/runs.$runId", runnerChunk, { parentId: "root", imports: ["/assets/limits-1.js"] }),
      "routes/phone": route("routes/phone", "/assets/phone-1.js", { parentId: "root" }),
      "routes/trees.$treeId.edit": route("routes/trees.$treeId.edit", "/assets/trees.edit-1.js", {
        parentId: "root",
        imports: ["/assets/Canvas-1.js"],
      }),
    },
  } as unknown as ServerBuild["assets"];
}

describe("the service worker", () => {
  it("keeps the runner's and the phone page's code, the styles and their woff2 fonts, and the icons — not the editor", () => {
    const list = precacheList(manifest(), dir);
    expect(list).toEqual(
      expect.arrayContaining([
        "/assets/entry.client-1.js",
        "/assets/react-dom-1.js",
        "/assets/runs._runId-1.js",
        "/assets/limits-1.js",
        "/assets/phone-1.js",
        "/assets/root-1.css",
        "/assets/sans-400.woff2",
        "/manifest.webmanifest",
        "/icons/icon-192.png",
      ]),
    );
    expect(list).not.toContain("/assets/sans-400.woff");
    expect(list.filter((u) => /edit|Canvas/.test(u))).toEqual([]);
  });

  it("is a script that parses, with the version and the list filled in", () => {
    const src = workerSource(manifest(), dir);
    expect(() => new Script(src)).not.toThrow();
    expect(src).not.toMatch(/= __PRECACHE__|"__VERSION__"|"__SHELL_HEADER__"/);
    expect(src).toContain('"/assets/runs._runId-1.js"');
    expect(src).toContain('const SHELL_HEADER = "x-cluepath-shell"');
  });

  it("changes its version when a kept file changes, and only then", () => {
    const version = (s: string) => /const VERSION = "([0-9a-f]+)"/.exec(s)?.[1];
    const a = version(workerSource(manifest(), dir));
    expect(a).toMatch(/^[0-9a-f]{16}$/);
    expect(version(workerSource(manifest(), dir))).toBe(a);
    expect(version(workerSource(manifest("/assets/runs._runId-2.js"), dir))).not.toBe(a);
  });
});
