// Roles and where each one lands. Shared by server and client (no secrets here).
export const ROLES = ["technician", "lead", "trainer", "owner"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABEL: Record<Role, string> = {
  technician: "Technician",
  lead: "Lead tech",
  trainer: "Trainer",
  owner: "Owner",
};

export const HOME_PATH: Record<Role, string> = {
  technician: "/calls",
  lead: "/authoring",
  trainer: "/training",
  owner: "/overview",
};

export type NavItem = { to: string; label: string; roles: readonly Role[] };

/**
 * Navigation by role, in the order it is shown. Only surfaces that exist are listed. On a phone the
 * first entries of a role are the bottom bar's tabs and the rest sit in its "More" menu
 * (`splitNav`), so put a new entry where its importance puts it: an everyday page before Outbox,
 * an occasional one (account, audit) at the end.
 */
export const NAV: readonly NavItem[] = [
  { to: "/calls", label: "My calls", roles: ["technician"] },
  { to: "/authoring", label: "Authoring", roles: ["lead"] },
  { to: "/practice", label: "Practice", roles: ["technician"] },
  { to: "/training", label: "Training", roles: ["trainer"] },
  { to: "/overview", label: "Overview", roles: ["owner", "lead"] },
  { to: "/calls/all", label: "Calls", roles: ["lead", "owner"] },
  { to: "/trees", label: "Trees", roles: ["technician", "lead", "trainer", "owner"] },
  { to: "/equipment", label: "Equipment", roles: ["technician", "lead", "trainer", "owner"] },
  { to: "/outbox", label: "Outbox", roles: ["lead", "owner"] },
  // Leads write and review practice too; owners read the trainees' figures.
  { to: "/training", label: "Training", roles: ["lead", "owner"] },
  { to: "/people", label: "People", roles: ["owner"] },
  { to: "/account", label: "Account", roles: ["technician", "lead", "trainer", "owner"] },
  { to: "/audit", label: "Audit", roles: ["owner"] },
];

export function navFor(role: Role): NavItem[] {
  return NAV.filter((item) => item.roles.includes(role));
}

/** Places in the phone's bottom bar: four fit at 390 px with labels of up to about ten letters. */
export const BAR_SLOTS = 4;

/**
 * A role's navigation split for the phone's bottom bar: every entry as a tab when they fit,
 * otherwise the first `slots − 1` as tabs and the rest in a "More" menu (which has any length).
 */
export function splitNav(items: readonly NavItem[], slots = BAR_SLOTS): { tabs: NavItem[]; more: NavItem[] } {
  if (items.length <= slots) return { tabs: [...items], more: [] };
  return { tabs: items.slice(0, slots - 1), more: items.slice(slots - 1) };
}

/** Whether a navigation entry is the current page or a page under it ("/calls" for "/calls/123"). */
export function isCurrent(to: string, pathname: string): boolean {
  return pathname === to || pathname.startsWith(`${to}/`);
}
