// Route parameters for trees, parsed once for the UI and API routes. A malformed id or version is
// a 404, like an unknown one.
import { z } from "zod";
import { CATEGORIES } from "~/engine/types";
import { notFound } from "./refusal";
import { LIBRARY_SORTS, LIBRARY_STATES, type LibraryQuery, type VersionRef } from "./tree-library";

const Id = z.string().regex(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/);
const Ref = z.union([z.literal("draft"), z.coerce.number().int().positive().max(1_000_000)]);

export function treeIdOf(params: { treeId?: string }): string {
  const r = Id.safeParse(params.treeId);
  return r.success ? r.data : notFound("That tree");
}

export function idOf(raw: string | undefined, what: string): string {
  const r = Id.safeParse(raw);
  return r.success ? r.data : notFound(what);
}

/** "draft" or a version number from a route parameter or query value. */
export function versionRefOf(raw: string | null | undefined): VersionRef {
  const r = Ref.safeParse(raw);
  return r.success ? r.data : notFound("That version");
}

const Library = z.object({
  q: z.string().trim().max(200).optional().catch(undefined),
  category: z.enum(CATEGORIES).optional().catch(undefined),
  state: z.enum(LIBRARY_STATES).optional().catch(undefined),
  sort: z.enum(LIBRARY_SORTS).optional().catch(undefined),
  dir: z.enum(["asc", "desc"]).optional().catch(undefined),
});

/** The library's search, filters and sort from a URL; values that don't fit are left out. */
export function libraryQueryOf(url: URL): LibraryQuery & { q?: string } {
  const p = Library.parse(Object.fromEntries(url.searchParams));
  return { search: p.q || undefined, q: p.q, category: p.category, state: p.state, sort: p.sort, dir: p.dir };
}
