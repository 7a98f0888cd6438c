import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { Form, Link } from "react-router";
import { DiffView } from "~/components/DiffView";
import { requireUser } from "~/lib/auth.server";
import { can } from "~/lib/policy";
import { page } from "~/lib/route.server";
import type { TreeDiff } from "~/lib/tree-diff";
import { treeIdOf, versionRefOf } from "~/lib/tree-params.server";
import { diffVersions, getTree } from "~/models/trees/versions.server";
import type { Route } from "./+types/trees.$treeId.diff";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Changes · ${data?.title ?? "Tree"} · Cluepath` }];
export const handle = { wide: true };

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const url = new URL(request.url);
  const treeId = treeIdOf(params);
  const { ctx } = await requireUser(request);
  const t = await getTree(ctx, treeId);
  // The draft is offered for comparison to those who may read it.
  const canSeeDraft = can(ctx, "trees.author");
  const refs = t.versions.filter((v) => v.number !== null || canSeeDraft).map((v) => v.number ?? ("draft" as const));
  const from = url.searchParams.has("from") ? versionRefOf(url.searchParams.get("from")) : (refs.at(-2) ?? refs[0] ?? 1);
  const to = url.searchParams.has("to") ? versionRefOf(url.searchParams.get("to")) : (refs.at(-1) ?? 1);
  const d = await diffVersions(ctx, treeId, from, to);
  return { treeId, title: t.tree.title, refs, from, to, diff: d.diff };
});

type Ref = number | "draft";
const label = (r: Ref) => (r === "draft" ? "the draft" : `version ${r}`);

async function fetchDiff(treeId: string, from: Ref, to: Ref): Promise<{ diff: TreeDiff }> {
  const res = await fetch(`/api/trees/${treeId}/diff?from=${from}&to=${to}`);
  if (!res.ok) throw new Error(((await res.json().catch(() => ({}))) as { error?: string }).error ?? "The comparison could not be loaded.");
  return res.json();
}

export default function TreeDiffPage({ loaderData }: Route.ComponentProps) {
  const { treeId, title, refs } = loaderData;
  const [from, setFrom] = useState<Ref>(loaderData.from);
  const [to, setTo] = useState<Ref>(loaderData.to);
  const initial = from === loaderData.from && to === loaderData.to ? { diff: loaderData.diff } : undefined;
  const q = useQuery({
    queryKey: ["tree-diff", treeId, from, to],
    queryFn: () => fetchDiff(treeId, from, to),
    initialData: initial,
    placeholderData: keepPreviousData,
    staleTime: 60_000,
  });
  const pick = (which: "from" | "to", v: string) => {
    const r: Ref = v === "draft" ? "draft" : Number(v);
    const next = { from, to, [which]: r };
    if (which === "from") setFrom(r);
    else setTo(r);
    window.history.replaceState(window.history.state, "", `?from=${next.from}&to=${next.to}`);
  };
  const select = (which: "from" | "to", value: Ref, text: string) => (
    <div>
      <label htmlFor={`diff-${which}`} className="field-label">
        {text}
      </label>
      <select id={`diff-${which}`} name={which} className="field-input" value={String(value)} onChange={(e) => pick(which, e.target.value)}>
        {refs.map((r) => (
          <option key={r} value={r}>
            {label(r)}
          </option>
        ))}
      </select>
    </div>
  );
  return (
    <div className="space-y-4">
      <div>
        <p className="text-sm text-ink-soft">
          <Link to={`/trees/${treeId}`}>{title}</Link>
        </p>
        <h1 className="text-2xl font-bold">What changed</h1>
      </div>
      <Form method="get" className="card flex flex-wrap items-end gap-3" aria-label="Versions to compare">
        {select("from", from, "From")}
        {select("to", to, "To")}
        <noscript>
          <button className="btn-quiet">Compare</button>
        </noscript>
      </Form>
      <div aria-live="polite" aria-busy={q.isFetching}>
        {q.isError && <p className="field-error">{q.error.message}</p>}
        {q.data && <DiffView diff={q.data.diff} fromLabel={label(from)} toLabel={label(to)} />}
      </div>
    </div>
  );
}
