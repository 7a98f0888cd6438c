import { data, redirect } from "react-router";
import { z } from "zod";
import { Editor } from "~/components/editor/Editor";
import { requireRole } from "~/lib/auth.server";
import { notFound } from "~/lib/http.server";
import { treeIdOf } from "~/lib/tree-params.server";
import { getTree, loadTreeVersion, publishDraft, validateDraft } from "~/models/trees.server";
import type { Route } from "./+types/trees.$treeId.edit";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Editing ${data?.tree.title ?? "a tree"} · Cluepath` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireRole(request, ["lead"]);
  const treeId = treeIdOf(params);
  const [t, draft] = await Promise.all([getTree(user.ctx, treeId), loadTreeVersion(user.ctx, treeId, "draft")]);
  if (!t) notFound("That tree");
  // No open draft (published meanwhile, or never started): the tree page offers to start one.
  if (!draft) throw redirect(`/trees/${treeId}`);
  const numbers = t.versions.map((v) => v.number ?? 0);
  const v = (await validateDraft(user.ctx, treeId))!;
  return {
    treeId,
    versionId: draft.version.id,
    revision: draft.version.revision,
    tree: draft.tree,
    layout: draft.layout,
    validation: { revision: v.revision, findings: v.findings, errors: v.errors, warnings: v.warnings, sameAs: v.sameAs },
    nextNumber: Math.max(0, ...numbers) + 1,
    basedOn: t.draft?.basedOnNumber ?? null,
  };
}

const Publish = z.object({ intent: z.literal("publish"), revision: z.coerce.number().int().positive(), changeNote: z.string().max(500) });

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireRole(request, ["lead"]);
  const treeId = treeIdOf(params);
  const parsed = Publish.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ message: "Say what changed in this version (up to 500 characters)." }, { status: 400 });
  const r = await publishDraft(user.ctx, treeId, parsed.data.revision, parsed.data.changeNote);
  if (r.ok) return redirect(`/trees/${treeId}?published=${r.number}`);
  switch (r.reason) {
    case "no-note":
      return data({ message: "Say what changed in this version, so technicians and trainers know." }, { status: 400 });
    case "conflict":
      return data({ message: "The draft changed since your last save was checked. Wait for it to save, then publish again." }, { status: 409 });
    case "unchanged":
      return data({ message: `This draft says exactly what version ${r.sameAs} says; change something before publishing.` }, { status: 409 });
    case "invalid":
      return data({ message: "The draft still has errors, so it was not published:", findings: r.findings }, { status: 422 });
    default:
      return data({ message: "There is no open draft to publish (it may have been published already)." }, { status: 404 });
  }
}

export default function EditTree({ loaderData, actionData }: Route.ComponentProps) {
  return <Editor {...loaderData} publishError={actionData} />;
}
