// The app's routes as app/routes.ts declares them, flattened to full URL patterns, with what the
// production build says each one answers. Used by the route sweep and the bundle checks, so a
// route added to app/routes.ts (or a module renamed) is followed without editing the tests.
import { pathToFileURL } from "node:url";
import type { RouteConfigEntry } from "@react-router/dev/routes";
import routeConfig from "../../app/routes";

export type AppRoute = {
  /** React Router's route id: the explicit id, or the module's file without its extension. */
  id: string;
  /** The full URL pattern with a leading slash, e.g. `/api/runs/:runId/steps`; "/" for the index. */
  pattern: string;
  file: string;
  /** Names of the dynamic segments, in order (`*` for a splat). */
  params: string[];
  /** Only a layout (no path of its own): never requested directly. */
  layoutOnly: boolean;
};

function flatten(entries: RouteConfigEntry[], prefix: string, out: AppRoute[]): AppRoute[] {
  for (const e of entries) {
    const path = e.path ? `${prefix}/${e.path}`.replace(/\/+/g, "/") : prefix;
    const pattern = path || "/";
    out.push({
      id: e.id ?? e.file.replace(/\.[jt]sx?$/, ""),
      pattern,
      file: e.file,
      params: [...pattern.matchAll(/:(\w+)|\*/g)].map((m) => m[1] ?? "*"),
      layoutOnly: !e.path && !e.index,
    });
    if (e.children) flatten(e.children, path, out);
  }
  return out;
}

/** Every route of app/routes.ts, layouts included (marked). */
export async function appRoutes(): Promise<AppRoute[]> {
  return flatten(await routeConfig, "", []);
}

/** The route whose URL pattern is `pattern` (throws when app/routes.ts has none). */
export async function routeAt(pattern: string): Promise<AppRoute> {
  const r = (await appRoutes()).find((x) => x.pattern === pattern && !x.layoutOnly);
  if (!r) throw new Error(`app/routes.ts has no route at ${pattern}`);
  return r;
}

type BuiltRoute = { id: string; module: Record<string, unknown> };
type BuiltAsset = { module: string; imports?: string[] };
export type ServerBuild = { routes: Record<string, BuiltRoute>; assets: { routes: Record<string, BuiltAsset> } };

/** The production server build (`npm run build`), as server.js loads it. */
export async function serverBuild(): Promise<ServerBuild> {
  const dir = process.env.BUILD_DIR ?? "build";
  return (await import(pathToFileURL(`${dir}/server/index.js`).href)) as ServerBuild;
}
