// How the tree library is asked for (search, filters, sort) and how a version is named in URLs.
// Shared by the routes that parse them and the model that answers.
import type { EquipmentCategory, Tree } from "../engine/types";

/** "draft" or a version number, as the routes and the API name a version. */
export type VersionRef = number | "draft";

export const LIBRARY_STATES = ["published", "draft", "retired"] as const;
export const LIBRARY_SORTS = ["title", "category", "symptom", "changed", "version"] as const;

export type LibraryQuery = {
  search?: string;
  category?: EquipmentCategory;
  /** published: new runs can start on it; draft: has an open draft; retired: every version retired. */
  state?: (typeof LIBRARY_STATES)[number];
  sort?: (typeof LIBRARY_SORTS)[number];
  dir?: "asc" | "desc";
};

/** Where an image of a tree's step bodies is served (and how step bodies link to it). */
export function treeImageUrl(treeId: string, imageId: string): string {
  return `/trees/${treeId}/images/${imageId}`;
}

/** What a new tree starts from: its identity and no steps yet (the editor adds the first). */
export function emptyTree(fields: Pick<Tree, "title" | "category" | "symptom">): Tree {
  return { title: fields.title, category: fields.category, symptom: fields.symptom, start: "start", nodes: [] };
}
