import { Form, Link } from "react-router";
import { categoryLabel } from "~/components/editor/kinds";
import { Field } from "~/components/Field";
import { SelectField } from "~/components/FormFields";
import { CategoryOptions, NewTreeLinks } from "~/components/TreeLinks";
import { requireUser } from "~/lib/auth.server";
import { atShop } from "~/lib/display";
import { can } from "~/lib/policy";
import { page } from "~/lib/route.server";
import { libraryQueryOf } from "~/lib/tree-params.server";
import { shopTimeZone } from "~/models/shop.server";
import { listLibrary, type LibraryRow } from "~/models/trees/library.server";
import type { Route } from "./+types/trees._index";

export const meta: Route.MetaFunction = () => [{ title: "Trees · Cluepath" }];
export const handle = { wide: true };

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const query = libraryQueryOf(new URL(request.url));
  const [rows, tz] = await Promise.all([listLibrary(ctx, query), shopTimeZone(ctx)]);
  return {
    query,
    canEdit: can(ctx, "trees.author"),
    rows: rows.map((r) => ({
      ...r,
      lastChangeText: atShop(r.lastChange, tz, "date"),
      draftText: r.draft ? atShop(r.draft.updatedAt, tz, "date") : null,
    })),
  };
});

const COLUMNS = [
  { key: "title", label: "Title" },
  { key: "category", label: "Category" },
  { key: "symptom", label: "Symptom" },
  { key: "version", label: "Published" },
  { key: null, label: "Draft" },
  { key: "changed", label: "Last change" },
  { key: null, label: "By" },
] as const;

function Published({ r }: { r: LibraryRow }) {
  if (r.current) return <>Version {r.current.number}</>;
  if (r.retired) return <span className="font-semibold text-out">Retired</span>;
  return <span className="text-ink-soft">Not yet</span>;
}

export default function Trees({ loaderData }: Route.ComponentProps) {
  const { rows, query, canEdit } = loaderData;
  const sort = query.sort ?? "title";
  const dir = query.dir ?? (sort === "changed" ? "desc" : "asc");
  const sortHref = (key: string) => {
    const p = new URLSearchParams();
    if (query.q) p.set("q", query.q);
    if (query.category) p.set("category", query.category);
    if (query.state) p.set("state", query.state);
    p.set("sort", key);
    p.set("dir", key === sort && dir === "asc" ? "desc" : "asc");
    return `?${p}`;
  };
  const filtered = Boolean(query.q || query.category || query.state);
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-bold">Trees</h1>
          <p className="text-ink-soft">The shop's diagnostic procedures, from symptom to root cause.</p>
        </div>
        {canEdit && <NewTreeLinks />}
      </div>

      <Form
        method="get"
        role="search"
        aria-label="Find trees"
        className="card grid gap-3 sm:grid-cols-2 sm:items-end lg:grid-cols-[1fr_11rem_11rem_12rem_auto]"
      >
        <Field label="Search" name="q" type="search" defaultValue={query.q ?? ""} placeholder="Title, symptom or equipment" />
        <SelectField label="Category" name="category" defaultValue={query.category ?? ""}>
          <CategoryOptions all="All categories" />
        </SelectField>
        <SelectField label="State" name="state" defaultValue={query.state ?? ""}>
          <option value="">Any state</option>
          <option value="published">Published</option>
          <option value="draft">With an open draft</option>
          <option value="retired">Retired</option>
        </SelectField>
        <SelectField label="Sort by" name="sort" defaultValue={query.sort ?? "title"}>
          <option value="title">Title</option>
          <option value="category">Category</option>
          <option value="symptom">Symptom</option>
          <option value="changed">Last change, newest first</option>
          <option value="version">Published version</option>
        </SelectField>
        <button className="btn-quiet">Show</button>
      </Form>

      <p aria-live="polite" className="text-ink-soft">
        {rows.length} tree{rows.length === 1 ? "" : "s"}
        {filtered && (
          <>
            {" "}
            match · <Link to="/trees">clear the search</Link>
          </>
        )}
      </p>

      {rows.length > 0 && (
        <>
          <table className="hidden w-full border-collapse overflow-hidden rounded-xl bg-card text-left md:table">
            <caption className="sr-only">The shop's trees; column headings sort the table.</caption>
            <thead className="border-b border-rule bg-paper text-sm">
              <tr>
                {COLUMNS.map((c) => (
                  <th
                    key={c.label}
                    scope="col"
                    className="px-3 py-2 font-semibold"
                    aria-sort={c.key && c.key === sort ? (dir === "asc" ? "ascending" : "descending") : undefined}
                  >
                    {c.key ? (
                      <Link to={sortHref(c.key)} className="tap font-semibold text-ink no-underline hover:underline">
                        {c.label}
                        {c.key === sort && <span aria-hidden="true">{dir === "asc" ? " ▲" : " ▼"}</span>}
                      </Link>
                    ) : (
                      c.label
                    )}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.treeId} className="border-b border-rule align-top last:border-0">
                  <td className="px-3 py-2 font-semibold">
                    <Link to={`/trees/${r.treeId}`} className="tap">
                      {r.title}
                    </Link>
                  </td>
                  <td className="px-3 py-2">{categoryLabel(r.category)}</td>
                  <td className="px-3 py-2 text-base">{r.symptom}</td>
                  <td className="px-3 py-2 whitespace-nowrap">
                    <Published r={r} />
                  </td>
                  <td className="px-3 py-2 whitespace-nowrap">
                    {r.draft ? <>Open since {r.draftText}</> : <span className="text-ink-soft">None</span>}
                  </td>
                  <td className="px-3 py-2 whitespace-nowrap">{r.lastChangeText}</td>
                  <td className="px-3 py-2">{r.lastAuthor}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <ul className="space-y-2 md:hidden" aria-label="Trees">
            {rows.map((r) => (
              <li key={r.treeId} className="card space-y-1">
                <Link to={`/trees/${r.treeId}`} className="tap text-lg font-semibold">
                  {r.title}
                </Link>
                <p className="text-base">{r.symptom}</p>
                <p className="text-sm text-ink-soft">
                  {categoryLabel(r.category)} · <Published r={r} />
                  {r.draft && <> · draft open</>} · changed {r.lastChangeText} by {r.lastAuthor}
                </p>
              </li>
            ))}
          </ul>
        </>
      )}
      {rows.length === 0 && (
        <p className="card">
          {filtered
            ? "No tree matches. Try fewer words or another category."
            : canEdit
              ? "No trees yet. Start one, or import a tree file."
              : "No trees published yet."}
        </p>
      )}
    </div>
  );
}
