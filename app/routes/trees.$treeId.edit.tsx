import { redirect } from "react-router";
import { z } from "zod";
import { Editor } from "~/components/editor/Editor";
import { EditorError } from "~/components/editor/EditorError";
import { errorWords } from "~/components/errorWords";
import type { Finding } from "~/engine/types";
import { requireUser } from "~/lib/auth.server";
import { fromClient } from "~/lib/http.server";
import { form, page, readForm } from "~/lib/route.server";
import { treeIdOf } from "~/lib/tree-params.server";
import { shopTimeZone } from "~/models/shop.server";
import { openEditor } from "~/models/trees/editor.server";
import { publishDraft } from "~/models/trees/publish.server";
import type { Route } from "./+types/trees.$treeId.edit";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Editing ${data?.tree.title ?? "a tree"} · Cluepath` }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const treeId = treeIdOf(params);
  const [editor, timeZone] = await Promise.all([openEditor(ctx, treeId), shopTimeZone(ctx)]);
  // No open draft (published meanwhile, or never started): the tree page offers to start one.
  if (!editor) throw redirect(`/trees/${treeId}`);
  return { treeId, ...editor, timeZone };
});

const Publish = z.object({
  intent: z.literal("publish", { message: "That action isn't one this page knows." }),
  revision: z.coerce.number({ message: "Reload the editor and publish again." }).int().positive(),
  changeNote: z.string().max(500, "Say what changed in this version (up to 500 characters)."),
});

export const action = form(async ({ request, params, context }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "trees.author");
  const treeId = treeIdOf(params);
  const input = await readForm(request, Publish);
  const { number } = await publishDraft(fromClient(ctx, context), treeId, input.revision, input.changeNote);
  return redirect(`/trees/${treeId}?published=${number}`);
});

export default function EditTree({ loaderData, actionData }: Route.ComponentProps) {
  const publishError = actionData
    ? { message: actionData.message, findings: actionData.details?.findings as Finding[] | undefined }
    : undefined;
  return <Editor {...loaderData} publishError={publishError} />;
}

// A failure here keeps the author's unsaved changes in the browser and says so.
export function ErrorBoundary({ error, params }: Route.ErrorBoundaryProps) {
  const { title, detail, again } = errorWords(error);
  return <EditorError treeId={params.treeId} title={title} detail={detail} again={again} />;
}
