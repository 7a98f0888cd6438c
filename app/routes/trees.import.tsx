import { data, Form, Link, redirect, useNavigation } from "react-router";
import { requireRole } from "~/lib/auth.server";
import { idOf } from "~/lib/tree-params.server";
import { readUploadForm } from "~/lib/upload.server";
import { importTree, listLibrary } from "~/models/trees.server";
import type { Route } from "./+types/trees.import";

export const meta: Route.MetaFunction = () => [{ title: "Import a tree file · Cluepath" }];

const MAX_TREE_FILE = 1024 * 1024;

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, ["lead"]);
  const trees = await listLibrary(user.ctx, { sort: "title" });
  return { trees: trees.map((t) => ({ id: t.treeId, title: t.title, draft: t.draft !== null })), into: new URL(request.url).searchParams.get("into") ?? "" };
}

type Failure = { message: string; errors?: { line: number; column: number; message: string; source: string }[]; draftOf?: string };

export async function action({ request }: Route.ActionArgs) {
  const user = await requireRole(request, ["lead"]);
  const fail = (status: number, f: Failure) => data(f, { status });
  const upload = await readUploadForm(request, MAX_TREE_FILE);
  if (!upload.ok) return fail(upload.status, { message: upload.status === 413 ? "That file is larger than 1 MB; a tree file is a few kilobytes." : "Choose a tree file (.md) to import." });
  const file = upload.form.get("file");
  if (!(file instanceof File) || file.size === 0) return fail(400, { message: "Choose a tree file (.md) to import." });
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(await file.arrayBuffer()).replace(/^\uFEFF/, "");
  } catch {
    return fail(415, { message: "That file isn't plain text (UTF-8). Export the tree as Markdown and try again." });
  }
  const intoRaw = String(upload.form.get("into") ?? "");
  const into = intoRaw ? idOf(intoRaw, "That tree") : undefined;
  const result = await importTree(user.ctx, text, into);
  if (result.ok) return redirect(`/trees/${result.treeId}/edit`);
  if (result.reason === "parse") {
    const lines = text.replace(/\r\n?/g, "\n").split("\n");
    return fail(422, {
      message: `${file.name} can't be read as a tree, so nothing was saved. Fix ${result.errors.length === 1 ? "this line" : `these ${result.errors.length} lines`} and upload it again:`,
      errors: result.errors.map((e) => ({ ...e, source: lines[e.line - 1] ?? "" })),
    });
  }
  if (result.reason === "draft-open") return fail(409, { message: "That tree already has an open draft. Publish or discard it first, or import as a new tree.", draftOf: into });
  return fail(404, { message: "That tree was not found." });
}

export default function ImportTree({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Import a tree file</h1>
      <p className="text-ink-soft">
        A tree file is Markdown in Cluepath's tree format (what “Download .md” gives you). It becomes a draft: check it in the editor, then publish it.
      </p>
      {actionData && (
        <section role="alert" aria-labelledby="import-problem" className="card space-y-2 border-out bg-out-soft">
          <h2 id="import-problem" className="font-bold text-out">
            {actionData.message}
          </h2>
          {actionData.errors && (
            <ol className="space-y-2">
              {actionData.errors.map((e, i) => (
                <li key={i} className="rounded-lg bg-card p-2">
                  <p className="font-semibold">
                    Line {e.line}, column {e.column}: {e.message}
                  </p>
                  {e.source && <pre className="mt-1 overflow-x-auto rounded bg-paper px-2 py-1 text-sm">{`${e.line} | ${e.source}`}</pre>}
                </li>
              ))}
            </ol>
          )}
          {actionData.draftOf && (
            <p>
              <Link to={`/trees/${actionData.draftOf}/edit`}>Open that draft</Link>
            </p>
          )}
        </section>
      )}
      <Form method="post" encType="multipart/form-data" className="card space-y-4">
        <div>
          <label htmlFor="import-file" className="field-label">
            Tree file
          </label>
          <input id="import-file" name="file" type="file" accept=".md,.markdown,text/markdown,text/plain" required className="block w-full text-base file:mr-3 file:min-h-11 file:rounded-lg file:border file:border-rule file:bg-card file:px-4" />
        </div>
        <div>
          <label htmlFor="import-into" className="field-label">
            Make it
          </label>
          <select id="import-into" name="into" className="field-input" defaultValue={loaderData.into}>
            <option value="">A new tree</option>
            {loaderData.trees.map((t) => (
              <option key={t.id} value={t.id} disabled={t.draft}>
                The next draft of “{t.title}”{t.draft ? " (has an open draft)" : ""}
              </option>
            ))}
          </select>
        </div>
        <button className="btn-primary" disabled={busy}>
          Import as a draft
        </button>
      </Form>
    </div>
  );
}
