// A run's view as JSON text, for the runner page and GET /api/runs/:id. Server only.
import type { RunView } from "./run-log";

/** The pinned version's part of the view (tree, step bodies, description) as JSON text, by its tree object. */
const versionJson = new WeakMap<object, string>();

export type VersionPart = Pick<RunView, "tree" | "bodies" | "description">;

/**
 * The version's part of a view as JSON text: most of what a run's page and API answer carry, and
 * the same for every run on a published version, so it is serialised once per version (its content
 * is cached by the run models' version cache and keeps its identity), not on every request.
 */
export function versionPartJson(view: VersionPart): string {
  let json = versionJson.get(view.tree);
  if (json === undefined) {
    json = JSON.stringify({ tree: view.tree, bodies: view.bodies, description: view.description });
    versionJson.set(view.tree, json);
  }
  return json;
}

/** The view as JSON text for GET /api/runs/:id, with the version's part serialised once (versionPartJson). */
export function runViewJson(view: RunView): string {
  const { tree: _t, bodies: _b, description: _d, ...rest } = view;
  return `${versionPartJson(view).slice(0, -1)},${JSON.stringify(rest).slice(1)}`;
}
