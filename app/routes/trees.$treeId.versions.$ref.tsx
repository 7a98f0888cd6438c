import { Link } from "react-router";
import { categoryLabel, KIND_LABEL, KIND_MARK } from "~/components/editor/kinds";
import { Markdown } from "~/components/Markdown";
import { branchName, nodeBranches } from "~/engine/graph";
import { requireUser } from "~/lib/auth.server";
import { atShop } from "~/lib/display";
import { page } from "~/lib/route.server";
import { nodeFields } from "~/lib/tree-diff";
import { treeIdOf, versionRefOf } from "~/lib/tree-params.server";
import { shopTimeZone } from "~/models/shop.server";
import { loadTreeVersion } from "~/models/trees/versions.server";
import type { Route } from "./+types/trees.$treeId.versions.$ref";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.tree.title ?? "Tree"} · ${data?.label ?? ""} · Cluepath` }];

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const ref = versionRefOf(params.ref);
  const { ctx } = await requireUser(request);
  const treeId = treeIdOf(params);
  const [{ version, tree }, tz] = await Promise.all([loadTreeVersion(ctx, treeId, ref), shopTimeZone(ctx)]);
  return {
    treeId,
    ref,
    label: version.number === null ? "Draft" : `Version ${version.number}`,
    state: version.state,
    changeNote: version.changeNote,
    when: atShop(version.publishedAt ?? version.updatedAt, tz),
    tree,
  };
});

const HIDDEN_FIELDS = new Set(["kind", "title", "body", "answers"]);

export default function TreeVersion({ loaderData }: Route.ComponentProps) {
  const { tree, treeId, ref, label, state, changeNote } = loaderData;
  const titles = new Map(tree.nodes.map((n) => [n.id, n.title]));
  return (
    <article className="space-y-4">
      <header className="space-y-1">
        <p className="text-sm text-ink-soft">
          <Link to={`/trees/${treeId}`}>{tree.title}</Link> · {label} ·{" "}
          {state === "draft" ? `saved ${loaderData.when}` : `published ${loaderData.when}`}
          {state === "retired" && " · retired"}
        </p>
        <h1 className="text-2xl font-bold">{tree.title}</h1>
        <p className="text-ink-soft">
          {categoryLabel(tree.category)} · {tree.symptom}
          {tree.equipment && <> · {tree.equipment}</>}
        </p>
        {changeNote && <p className="text-base">Change note: {changeNote}</p>}
        <p>
          <a href={`/trees/${treeId}/versions/${ref}/export`} download>
            Download as a tree file (.md)
          </a>
        </p>
      </header>
      {tree.description && (
        <section className="card">
          <Markdown>{tree.description}</Markdown>
        </section>
      )}
      <ol className="space-y-3">
        {tree.nodes.map((n) => (
          <li key={n.id} id={`node-${n.id}`} className="card scroll-mt-4 space-y-2">
            <h2 className="text-lg font-bold">
              <span aria-hidden="true" className="mr-2 inline-flex size-7 items-center justify-center rounded border border-ink text-base">
                {KIND_MARK[n.kind]}
              </span>
              <span className="text-ink-soft">{KIND_LABEL[n.kind]}:</span> {n.title}
              {n.id === tree.start && (
                <span className="ml-2 rounded bg-copper-soft px-1.5 text-sm font-semibold text-copper-dark">first</span>
              )}
            </h2>
            <dl className="grid gap-x-3 gap-y-1 text-base sm:grid-cols-[10rem_1fr]">
              {nodeFields(n)
                .filter(([k]) => !HIDDEN_FIELDS.has(k) && !k.startsWith("branch:"))
                .map(([k, l, v]) => (
                  <div key={k} className="contents">
                    <dt className="font-semibold">{l}</dt>
                    <dd className="whitespace-pre-wrap">{v}</dd>
                  </div>
                ))}
            </dl>
            {n.body && <Markdown>{n.body}</Markdown>}
            {nodeBranches(n).length > 0 && (
              <ul className="flex flex-wrap gap-2" aria-label="Leads to">
                {nodeBranches(n).map(({ key, branch }) => (
                  <li key={key}>
                    <a
                      href={`#node-${branch.to}`}
                      className="inline-block rounded-lg border border-rule bg-paper px-2 py-1 text-base no-underline"
                    >
                      <strong>{branchName(key)}</strong> → {titles.get(branch.to) ?? `missing ‘${branch.to}’`}
                      {branch.recheck && ` (re-check up to ${branch.recheck.max}×)`}
                    </a>
                  </li>
                ))}
              </ul>
            )}
          </li>
        ))}
      </ol>
    </article>
  );
}
