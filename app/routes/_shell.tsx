import { Form, NavLink, Outlet, useMatches } from "react-router";
import { signOutOfPhone } from "~/components/runner/offline/signout";
import { requireUser } from "~/lib/auth.server";
import { navFor, ROLE_LABEL } from "~/lib/roles";
import type { Route } from "./+types/_shell";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { name: user.name, role: user.role, shopName: user.shopName, shopTown: user.shopTown };
}

const linkClass = ({ isActive }: { isActive: boolean }) =>
  [
    "flex min-h-12 items-center justify-center rounded-lg px-3 text-base font-semibold no-underline md:justify-start",
    isActive ? "bg-copper-soft text-copper-dark" : "text-ink hover:bg-paper",
  ].join(" ");

export default function Shell({ loaderData }: Route.ComponentProps) {
  const nav = navFor(loaderData.role);
  // A page can ask for more width (tables, diffs) with `export const handle = { wide: true }`.
  const wide = useMatches().some((m) => (m.handle as { wide?: boolean } | undefined)?.wide);
  return (
    <div className="min-h-dvh pb-20 md:grid md:grid-cols-[14rem_1fr] md:grid-rows-[auto_1fr] md:pb-0">
      <header className="flex items-center justify-between gap-3 border-b border-rule bg-card px-4 py-2 md:col-span-2">
        <div className="min-w-0">
          <p className="text-xl font-bold leading-tight">
            Clue<span className="text-copper">path</span>
          </p>
          <p className="truncate text-sm text-ink-soft">
            {loaderData.shopName} · {loaderData.shopTown}
          </p>
        </div>
        <div className="flex items-center gap-3">
          <p className="hidden text-right text-sm sm:block">
            <span className="block font-semibold">{loaderData.name}</span>
            <span className="text-ink-soft">{ROLE_LABEL[loaderData.role]}</span>
          </p>
          <Form method="post" action="/logout" onSubmit={signOutOfPhone}>
            <button type="submit" className="btn-quiet min-h-11 px-3 text-base">
              Sign out
            </button>
          </Form>
        </div>
      </header>
      <nav
        aria-label="Main"
        className="fixed inset-x-0 bottom-0 z-10 border-t border-rule bg-card px-2 py-1 md:static md:border-t-0 md:border-r md:px-3 md:py-4"
      >
        <ul className="flex gap-1 overflow-x-auto md:flex-col md:overflow-visible">
          {nav.map((item) => (
            <li key={item.to} className="min-w-[5.5rem] flex-1 shrink-0 md:min-w-0 md:flex-none">
              <NavLink to={item.to} className={linkClass}>
                {item.label}
              </NavLink>
            </li>
          ))}
        </ul>
      </nav>
      <main className={`mx-auto w-full px-4 py-5 ${wide ? "max-w-6xl" : "max-w-3xl"}`}>
        <Outlet />
      </main>
    </div>
  );
}
