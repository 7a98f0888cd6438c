import { Form, Link, redirect, useNavigation } from "react-router";
import { requireUser } from "~/lib/auth.server";
import { authorize } from "~/lib/policy";
import { Refusal } from "~/lib/refusal";
import { form, page } from "~/lib/route.server";
import { idOf } from "~/lib/tree-params.server";
import { readUploadForm } from "~/lib/upload.server";
import { listLibrary } from "~/models/trees/library.server";
import { importTree, type ImportProblem } from "~/models/trees/transfer.server";
import type { Route } from "./+types/trees.import";

export const meta: Route.MetaFunction = () => [{ title: "Import a tree file · Cluepath" }];

const MAX_TREE_FILE = 1024 * 1024;

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  // Importing makes a draft: the page is for those who may write trees.
  authorize(ctx, "trees.author");
  const trees = await listLibrary(ctx, { sort: "title" });
  return {
    trees: trees.map((t) => ({ id: t.treeId, title: t.title, draft: t.draft !== null })),
    into: new URL(request.url).searchParams.get("into") ?? "",
  };
});

export const action = form(async ({ request }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "trees.author");
  const upload = await readUploadForm(request, {
    maxBytes: MAX_TREE_FILE,
    tooLarge: "That file is larger than 1 MB; a tree file is a few kilobytes.",
    malformed: "Choose a tree file (.md) to import.",
  });
  const file = upload.get("file");
  if (!(file instanceof File) || file.size === 0) throw new Refusal("invalid", "Choose a tree file (.md) to import.");
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(await file.arrayBuffer()).replace(/^\uFEFF/, "");
  } catch {
    throw new Refusal("wrong-type", "That file isn't plain text (UTF-8). Export the tree as Markdown and try again.");
  }
  const intoRaw = String(upload.get("into") ?? "");
  const into = intoRaw ? idOf(intoRaw, "That tree") : undefined;
  const { treeId } = await importTree(ctx, text, { into, filename: file.name });
  return redirect(`/trees/${treeId}/edit`);
});

export default function ImportTree({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const problems = actionData?.details?.parseErrors as ImportProblem[] | undefined;
  const draftOf = actionData?.details?.draftOf as string | undefined;
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Import a tree file</h1>
      <p className="text-ink-soft">
        A tree file is Markdown in Cluepath's tree format (what “Download .md” gives you). It becomes a draft: check it in the editor, then
        publish it.
      </p>
      {actionData && (
        <section role="alert" aria-labelledby="import-problem" className="card space-y-2 border-out bg-out-soft">
          <h2 id="import-problem" className="font-bold text-out">
            {actionData.message}
          </h2>
          {problems && (
            <ol className="space-y-2">
              {problems.map((e, i) => (
                <li key={i} className="rounded-lg bg-card p-2">
                  <p className="font-semibold">
                    Line {e.line}, column {e.column}: {e.message}
                  </p>
                  {e.source && <pre className="mt-1 overflow-x-auto rounded bg-paper px-2 py-1 text-sm">{`${e.line} | ${e.source}`}</pre>}
                </li>
              ))}
            </ol>
          )}
          {draftOf && (
            <p>
              <Link to={`/trees/${draftOf}/edit`}>Open that draft</Link>
            </p>
          )}
        </section>
      )}
      <Form method="post" encType="multipart/form-data" className="card space-y-4">
        <div>
          <label htmlFor="import-file" className="field-label">
            Tree file
          </label>
          <input
            id="import-file"
            name="file"
            type="file"
            accept=".md,.markdown,text/markdown,text/plain"
            required
            className="block w-full text-base file:mr-3 file:min-h-11 file:rounded-lg file:border file:border-rule file:bg-card file:px-4"
          />
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
