import { useEffect, useRef } from "react";
import { Form, NavLink, Outlet, useLocation, useMatches } from "react-router";
import { signOutOfPhone } from "~/components/runner/offline/signout";
import { requireUser } from "~/lib/auth.server";
import { isCurrent, navFor, ROLE_LABEL, splitNav, type NavItem } from "~/lib/roles";
import type { Route } from "./+types/_shell";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { name: user.name, role: user.role, shopName: user.shopName, shopTown: user.shopTown };
}

const sideLink = ({ isActive }: { isActive: boolean }) =>
  [
    "flex min-h-12 items-center rounded-lg px-3 text-base font-semibold no-underline",
    isActive ? "bg-copper-soft text-copper-dark" : "text-ink hover:bg-paper",
  ].join(" ");

const tabLook = (active: boolean) =>
  [
    "flex min-h-12 w-full items-center justify-center rounded-lg px-1 text-center text-base leading-tight font-semibold no-underline",
    active ? "bg-copper-soft text-copper-dark" : "text-ink hover:bg-paper",
  ].join(" ");

/** Pages as a vertical list of links: the laptop's side column and the phone's "More" menu. */
function NavList({ items, className }: { items: readonly NavItem[]; className: string }) {
  return (
    <ul className={className}>
      {items.map((item) => (
        <li key={item.to}>
          <NavLink to={item.to} className={sideLink}>
            {item.label}
          </NavLink>
        </li>
      ))}
    </ul>
  );
}

/**
 * The phone's "More" tab: a disclosure that opens a list of the rest of the role's pages above the
 * bar. A native <details>, so it opens before the page's script has loaded; Escape, a tap outside
 * it or a page change closes it.
 */
function MoreMenu({ items }: { items: NavItem[] }) {
  const ref = useRef<HTMLDetailsElement>(null);
  const { pathname } = useLocation();
  const here = items.find((i) => isCurrent(i.to, pathname));
  useEffect(() => {
    if (ref.current) ref.current.open = false;
  }, [pathname]);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const outside = (e: PointerEvent) => {
      if (el.open && !el.contains(e.target as Node)) el.open = false;
    };
    const escape = (e: KeyboardEvent) => {
      if (e.key === "Escape" && el.open) {
        el.open = false;
        el.querySelector("summary")?.focus();
      }
    };
    document.addEventListener("pointerdown", outside);
    el.addEventListener("keydown", escape);
    return () => {
      document.removeEventListener("pointerdown", outside);
      el.removeEventListener("keydown", escape);
    };
  }, []);
  return (
    <details ref={ref} className="group relative">
      <summary className={`${tabLook(Boolean(here))} cursor-pointer list-none [&::-webkit-details-marker]:hidden`}>
        <span>
          {here ? here.label : "More"}
          <span aria-hidden="true" className="ml-1 inline-block text-sm group-open:rotate-180">
            ▴
          </span>
          {here && <span className="sr-only"> (more pages)</span>}
        </span>
      </summary>
      <NavList
        items={items}
        className="absolute right-0 bottom-full mb-2 max-h-[70dvh] w-60 overflow-y-auto rounded-xl border border-rule bg-card p-2 shadow-lg"
      />
    </details>
  );
}

export default function Shell({ loaderData }: Route.ComponentProps) {
  const nav = navFor(loaderData.role);
  const { tabs, more } = splitNav(nav);
  // A page can ask for more width (tables, diffs) with `export const handle = { wide: true }`.
  const wide = useMatches().some((m) => (m.handle as { wide?: boolean } | undefined)?.wide);
  return (
    <div className="min-h-dvh pb-20 md:grid md:grid-cols-[14rem_1fr] md:grid-rows-[auto_1fr] md:pb-0">
      <a
        href="#main"
        className="sr-only z-30 rounded-lg border-2 border-focus bg-card px-4 font-semibold focus:not-sr-only focus:fixed focus:top-2 focus:left-2 focus:flex focus:min-h-12 focus:items-center"
      >
        Skip to the page's content
      </a>
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
        {/* Phone: a bar of tabs that always fits, the rest behind "More". */}
        <ul className="grid auto-cols-fr grid-flow-col gap-1 md:hidden">
          {tabs.map((item) => (
            <li key={item.to}>
              <NavLink to={item.to} className={({ isActive }) => tabLook(isActive)}>
                {item.label}
              </NavLink>
            </li>
          ))}
          {more.length > 0 && (
            <li>
              <MoreMenu items={more} />
            </li>
          )}
        </ul>
        {/* Laptop: every page in the side column. */}
        <NavList items={nav} className="hidden flex-col gap-1 md:flex" />
      </nav>
      <main id="main" tabIndex={-1} className={`mx-auto w-full px-4 py-5 focus:outline-none ${wide ? "max-w-6xl" : "max-w-3xl"}`}>
        <Outlet />
      </main>
    </div>
  );
}
