import { Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { categoryLabel } from "~/components/editor/kinds";
import { requireUser } from "~/lib/auth.server";
import { fromClient } from "~/lib/http.server";
import { atShop } from "~/lib/display";
import { can } from "~/lib/policy";
import { form, page, readForm } from "~/lib/route.server";
import { treeIdOf } from "~/lib/tree-params.server";
import { shopTimeZone } from "~/models/shop.server";
import { discardDraft, startDraft } from "~/models/trees/drafts.server";
import { retireVersion } from "~/models/trees/publish.server";
import { getTree } from "~/models/trees/versions.server";
import type { Route } from "./+types/trees.$treeId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.tree.title ?? "Tree"} · Cluepath` }];
export const handle = { wide: true };

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const treeId = treeIdOf(params);
  const [t, tz] = await Promise.all([getTree(ctx, treeId), shopTimeZone(ctx)]);
  const url = new URL(request.url);
  return {
    tree: {
      id: t.tree.id,
      title: t.current?.title ?? t.versions.at(-1)?.title ?? t.tree.title,
      category: t.tree.category,
      symptom: t.tree.symptom,
    },
    current: t.current ? { number: t.current.number!, publishedText: atShop(t.current.publishedAt, tz) } : null,
    draft: t.draft
      ? { updatedText: atShop(t.draft.updatedAt, tz), by: t.draft.updatedByName ?? t.draft.authorName, basedOn: t.draft.basedOnNumber }
      : null,
    versions: t.versions.map((v) => ({
      id: v.id,
      number: v.number,
      state: v.state,
      title: v.title,
      changeNote: v.changeNote,
      authorName: v.authorName,
      publishedText: atShop(v.publishedAt, tz),
      retiredText: atShop(v.retiredAt, tz),
      updatedText: atShop(v.updatedAt, tz),
    })),
    canEdit: can(ctx, "trees.author"),
    published: url.searchParams.get("published"),
  };
});

const Intent = z.discriminatedUnion(
  "intent",
  [
    z.object({ intent: z.literal("start-draft"), from: z.coerce.number().int().positive().optional() }),
    z.object({ intent: z.literal("retire"), number: z.coerce.number({ message: "Say which version to retire." }).int().positive() }),
    z.object({ intent: z.literal("discard") }),
  ],
  { error: "That action isn't one this page knows." },
);

export const action = form(async ({ request, params, context }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "trees.author");
  const treeId = treeIdOf(params);
  const input = await readForm(request, Intent);
  if (input.intent === "start-draft") {
    await startDraft(ctx, treeId, input.from);
    return redirect(`/trees/${treeId}/edit`);
  }
  if (input.intent === "retire") {
    await retireVersion(fromClient(ctx, context), treeId, input.number);
    return { message: `Version ${input.number} is retired: new runs can't start on it. Runs that used it keep it.` };
  }
  const { treeDeleted } = await discardDraft(ctx, treeId);
  return treeDeleted ? redirect("/trees") : { message: "The draft was discarded. The published versions are unchanged." };
});

const STATE_LABEL = { draft: "Draft", published: "Published", retired: "Retired" } as const;
const STATE_STYLE = {
  draft: "bg-marginal-soft text-marginal",
  published: "bg-within-soft text-within",
  retired: "bg-paper text-ink-soft border border-rule",
} as const;

export default function TreePage({ loaderData, actionData }: Route.ComponentProps) {
  const { tree, current, draft, versions, canEdit, published } = loaderData;
  const busy = useNavigation().state !== "idle";
  const numbered = versions.filter((v) => v.number !== null);
  const latest = numbered.at(-1);
  return (
    <div className="space-y-5">
      <div>
        <p className="text-sm text-ink-soft">
          <Link to="/trees">Trees</Link> · {categoryLabel(tree.category)}
        </p>
        <h1 className="text-2xl font-bold">{tree.title}</h1>
        <p className="text-ink-soft">{tree.symptom}</p>
      </div>

      {published && (
        <p role="status" className="rounded-lg bg-within-soft p-3 font-semibold text-within">
          Version {published} is published. New runs start on it.
        </p>
      )}
      {actionData?.message && (
        <p role="status" className="rounded-lg bg-copper-soft p-3 font-semibold">
          {actionData.message}
        </p>
      )}

      <section className="card space-y-3" aria-label="Where this tree stands">
        <p className="text-lg">
          {current ? (
            <>
              New runs start on <strong>version {current.number}</strong>, published {current.publishedText}.
            </>
          ) : numbered.length ? (
            <strong className="text-out">Every version is retired: new runs can't start on this tree.</strong>
          ) : (
            <>Not published yet: technicians can't use it until the draft is published.</>
          )}
        </p>
        {draft && (
          <p>
            A draft is open{draft.basedOn !== null && <> (started from version {draft.basedOn})</>}, last saved {draft.updatedText} by{" "}
            {draft.by}.
          </p>
        )}
        <div className="flex flex-wrap gap-2">
          {numbered.length > 0 && latest && (
            <Link to={`/trees/${tree.id}/versions/${current?.number ?? latest.number}`} className="btn-quiet">
              Read version {current?.number ?? latest.number}
            </Link>
          )}
          {canEdit &&
            (draft ? (
              <Link to={`/trees/${tree.id}/edit`} className="btn-primary">
                Open the draft
              </Link>
            ) : (
              latest && (
                <Form method="post">
                  <input type="hidden" name="intent" value="start-draft" />
                  <button className="btn-primary" disabled={busy}>
                    Edit: start a draft from version {latest.number}
                  </button>
                </Form>
              )
            ))}
          {canEdit && !draft && (
            <Link to={`/trees/import?into=${tree.id}`} className="btn-quiet">
              Import a file as the next draft
            </Link>
          )}
        </div>
        {canEdit && draft && (
          <details className="rounded-lg border border-rule p-3">
            <summary className="cursor-pointer font-semibold">Discard the draft…</summary>
            <Form method="post" className="mt-2 space-y-2">
              <p>
                {numbered.length
                  ? "The draft's changes are thrown away. Published versions stay as they are."
                  : "This tree was never published, so discarding the draft deletes the tree."}
              </p>
              <input type="hidden" name="intent" value="discard" />
              <button className="btn min-h-11 bg-out text-white" disabled={busy}>
                Discard the draft
              </button>
            </Form>
          </details>
        )}
      </section>

      <section className="space-y-2" aria-labelledby="versions-heading">
        <h2 id="versions-heading" className="text-xl font-bold">
          Versions
        </h2>
        <ol className="space-y-2">
          {[...versions].reverse().map((v) => (
            <li key={v.id} className="card space-y-2">
              <div className="flex flex-wrap items-center gap-2">
                <h3 className="text-lg font-bold">{v.number === null ? "Draft" : `Version ${v.number}`}</h3>
                <span className={`rounded-md px-2 py-0.5 text-sm font-semibold ${STATE_STYLE[v.state]}`}>{STATE_LABEL[v.state]}</span>
                {current?.number === v.number && v.number !== null && (
                  <span className="text-sm font-semibold text-within">new runs start here</span>
                )}
              </div>
              {v.changeNote && <p>{v.changeNote}</p>}
              <p className="text-sm text-ink-soft">
                {v.number === null ? (
                  <>
                    Started by {v.authorName}; last saved {v.updatedText}
                  </>
                ) : (
                  <>
                    By {v.authorName}; published {v.publishedText}
                  </>
                )}
                {v.state === "retired" && <> · retired {v.retiredText}</>}
              </p>
              <div className="flex flex-wrap gap-x-4 gap-y-2">
                {(v.number !== null || canEdit) && <Link to={`/trees/${tree.id}/versions/${v.number ?? "draft"}`}>Read</Link>}
                {(v.number !== null || canEdit) && (
                  <a href={`/trees/${tree.id}/versions/${v.number ?? "draft"}/export`} download>
                    Download .md
                  </a>
                )}
                {v.number !== null && v.number > 1 && (
                  <Link to={`/trees/${tree.id}/diff?from=${v.number - 1}&to=${v.number}`}>Changes from version {v.number - 1}</Link>
                )}
                {v.number === null && latest && (
                  <Link to={`/trees/${tree.id}/diff?from=${latest.number}&to=draft`}>Changes from version {latest.number}</Link>
                )}
                {canEdit && !draft && v.number !== null && v.number !== latest?.number && (
                  <Form method="post" className="inline">
                    <input type="hidden" name="intent" value="start-draft" />
                    <input type="hidden" name="from" value={v.number} />
                    <button className="font-semibold text-copper-dark underline underline-offset-2" disabled={busy}>
                      Start a draft from this version
                    </button>
                  </Form>
                )}
              </div>
              {canEdit && v.state === "published" && (
                <details>
                  <summary className="cursor-pointer font-semibold text-out">Retire version {v.number}…</summary>
                  <Form method="post" className="mt-2 space-y-2">
                    <p>
                      New runs can't start on a retired version; runs that used it keep it and its record. This can't be undone; publish a
                      new version to replace it.
                    </p>
                    <input type="hidden" name="intent" value="retire" />
                    <input type="hidden" name="number" value={v.number!} />
                    <button className="btn min-h-11 bg-out text-white" disabled={busy}>
                      Retire version {v.number}
                    </button>
                  </Form>
                </details>
              )}
            </li>
          ))}
        </ol>
      </section>

      {versions.length > 1 && (
        <Form
          method="get"
          action={`/trees/${tree.id}/diff`}
          className="card flex flex-wrap items-end gap-3"
          aria-label="Compare two versions"
        >
          <CompareSelect
            name="from"
            label="Compare"
            versions={versions}
            canEdit={canEdit}
            initial={numbered.at(-2)?.number ?? numbered[0]?.number ?? "draft"}
          />
          <CompareSelect
            name="to"
            label="with"
            versions={versions}
            canEdit={canEdit}
            initial={draft && canEdit ? "draft" : (latest?.number ?? "draft")}
          />
          <button className="btn-quiet">Show the changes</button>
        </Form>
      )}
    </div>
  );
}

function CompareSelect({
  name,
  label,
  versions,
  canEdit,
  initial,
}: {
  name: string;
  label: string;
  versions: { number: number | null }[];
  canEdit: boolean;
  initial: number | string;
}) {
  return (
    <div>
      <label htmlFor={`compare-${name}`} className="field-label">
        {label}
      </label>
      <select id={`compare-${name}`} name={name} className="field-input" defaultValue={String(initial)}>
        {versions
          .filter((v) => v.number !== null || canEdit)
          .map((v) => (
            <option key={v.number ?? "draft"} value={v.number ?? "draft"}>
              {v.number === null ? "the draft" : `version ${v.number}`}
            </option>
          ))}
      </select>
    </div>
  );
}
