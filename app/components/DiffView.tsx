// Shows a TreeDiff: the tree's own fields, then nodes added, removed and changed (with each
// changed field's before and after, as written in the tree file).
import type { FieldChange, NodeRef, TreeDiff } from "~/lib/tree-diff";

function Change({ c }: { c: FieldChange }) {
  return (
    <div className="grid gap-1 sm:grid-cols-[10rem_1fr_1fr] sm:gap-3">
      <dt className="font-semibold">{c.label}</dt>
      <dd className="whitespace-pre-wrap rounded bg-out-soft/60 px-2 py-1 text-base">
        <span className="sr-only">Before: </span>
        {c.before === null ? <em className="text-ink-soft">not set</em> : <del className="no-underline">{c.before}</del>}
      </dd>
      <dd className="whitespace-pre-wrap rounded bg-within-soft/70 px-2 py-1 text-base">
        <span className="sr-only">After: </span>
        {c.after === null ? <em className="text-ink-soft">not set</em> : <ins className="no-underline">{c.after}</ins>}
      </dd>
    </div>
  );
}

function NodeList({ heading, nodes }: { heading: string; nodes: NodeRef[] }) {
  if (!nodes.length) return null;
  return (
    <section className="card space-y-1">
      <h3 className="font-bold">{heading}</h3>
      <ul className="list-disc pl-5">
        {nodes.map((n) => (
          <li key={n.id}>
            {n.name} <code className="text-sm text-ink-soft">{n.id}</code>
          </li>
        ))}
      </ul>
    </section>
  );
}

export function DiffView({ diff, fromLabel, toLabel }: { diff: TreeDiff; fromLabel: string; toLabel: string }) {
  if (diff.same)
    return (
      <p className="card">
        {fromLabel} and {toLabel} have the same content.
      </p>
    );
  return (
    <div className="space-y-4">
      <p className="text-ink-soft">
        From {fromLabel} to {toLabel}: {diff.added.length} added, {diff.removed.length} removed, {diff.changed.length} changed,{" "}
        {diff.unchanged} the same.
      </p>
      <p className="hidden text-sm text-ink-soft sm:grid sm:grid-cols-[10rem_1fr_1fr] sm:gap-3" aria-hidden="true">
        <span />
        <span>{fromLabel}</span>
        <span>{toLabel}</span>
      </p>
      {diff.tree.length > 0 && (
        <section className="card space-y-2">
          <h3 className="font-bold">Tree details</h3>
          <dl className="space-y-2">
            {diff.tree.map((c) => (
              <Change key={c.field} c={c} />
            ))}
          </dl>
        </section>
      )}
      <NodeList heading="Added" nodes={diff.added} />
      <NodeList heading="Removed" nodes={diff.removed} />
      {diff.changed.map((n) => (
        <section key={n.id} className="card space-y-2">
          <h3 className="font-bold">
            Changed: {n.name} <code className="text-sm font-normal text-ink-soft">{n.id}</code>
          </h3>
          <dl className="space-y-2">
            {n.fields.map((c) => (
              <Change key={c.field} c={c} />
            ))}
          </dl>
        </section>
      ))}
    </div>
  );
}
