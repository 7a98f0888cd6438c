import { Link } from "react-router";
import { NewTreeLinks } from "~/components/TreeLinks";
import { requireUser } from "~/lib/auth.server";
import { atShop } from "~/lib/display";
import { authorize } from "~/lib/policy";
import { page } from "~/lib/route.server";
import { shopTimeZone } from "~/models/shop.server";
import { listLibrary } from "~/models/trees/library.server";
import type { Route } from "./+types/authoring";

export const meta: Route.MetaFunction = () => [{ title: "Authoring · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  // The authors' home: the library's drafts and recent changes.
  authorize(ctx, "trees.author");
  const [rows, tz] = await Promise.all([listLibrary(ctx, { sort: "changed" }), shopTimeZone(ctx)]);
  const item = (r: (typeof rows)[number]) => ({
    treeId: r.treeId,
    title: r.title,
    symptom: r.symptom,
    current: r.current?.number ?? null,
    when: atShop(r.draft?.updatedAt ?? r.lastChange, tz),
    by: r.lastAuthor,
  });
  return {
    drafts: rows.filter((r) => r.draft).map(item),
    recent: rows
      .filter((r) => !r.draft)
      .slice(0, 5)
      .map(item),
    total: rows.length,
  };
});

export default function LeadHome({ loaderData }: Route.ComponentProps) {
  const { drafts, recent, total } = loaderData;
  return (
    <div className="space-y-5">
      <h1 className="text-2xl font-bold">Authoring</h1>
      <p className="text-ink-soft">Write and publish the shop's diagnostic trees, and pick up calls that technicians hand over.</p>
      <NewTreeLinks>
        <Link to="/trees" className="btn-quiet">
          All {total} trees
        </Link>
      </NewTreeLinks>
      <section aria-labelledby="drafts-heading" className="space-y-2">
        <h2 id="drafts-heading" className="text-lg font-bold">
          Drafts in progress
        </h2>
        {drafts.length === 0 ? (
          <p className="card text-ink-soft">No open drafts. Open a tree and choose “Edit” to start one.</p>
        ) : (
          <ul className="space-y-2">
            {drafts.map((d) => (
              <li key={d.treeId} className="card flex flex-wrap items-center justify-between gap-2">
                <div className="min-w-0">
                  <p className="font-semibold">{d.title}</p>
                  <p className="text-sm text-ink-soft">
                    {d.current ? `Draft after version ${d.current}` : "Never published"} · saved {d.when} by {d.by}
                  </p>
                </div>
                <Link to={`/trees/${d.treeId}/edit`} className="btn-quiet min-h-11 text-base">
                  Continue editing
                </Link>
              </li>
            ))}
          </ul>
        )}
      </section>
      <section aria-labelledby="recent-heading" className="space-y-2">
        <h2 id="recent-heading" className="text-lg font-bold">
          Recently changed
        </h2>
        <ul className="space-y-2">
          {recent.map((r) => (
            <li key={r.treeId} className="card">
              <Link to={`/trees/${r.treeId}`} className="font-semibold">
                {r.title}
              </Link>
              <p className="text-sm text-ink-soft">
                {r.current ? `Version ${r.current}` : "Retired"} · {r.when} by {r.by}
              </p>
            </li>
          ))}
        </ul>
      </section>
      <section aria-labelledby="handed-heading" className="card">
        <h2 id="handed-heading" className="text-lg font-bold">
          Handed-over calls
        </h2>
        <p className="text-ink-soft">
          Calls technicians hand to a lead are under <Link to="/escalations">Escalations</Link>.
        </p>
      </section>
    </div>
  );
}
