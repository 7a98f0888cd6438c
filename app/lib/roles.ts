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

/** Navigation by role, in the order it is shown. Only surfaces that exist are listed. */
export const NAV: readonly NavItem[] = [
  { to: "/calls", label: "My calls", roles: ["technician"] },
  { to: "/authoring", label: "Authoring", roles: ["lead"] },
  { to: "/training", label: "Training", roles: ["trainer"] },
  { to: "/overview", label: "Overview", roles: ["owner"] },
  { to: "/calls/all", label: "Calls", roles: ["lead", "owner"] },
  { to: "/trees", label: "Trees", roles: ["technician", "lead", "trainer", "owner"] },
  { to: "/equipment", label: "Equipment", roles: ["technician", "lead", "trainer", "owner"] },
  { to: "/outbox", label: "Outbox", roles: ["lead", "owner"] },
  { to: "/people", label: "People", roles: ["owner"] },
  { to: "/audit", label: "Audit", roles: ["owner"] },
];

export function navFor(role: Role): NavItem[] {
  return NAV.filter((item) => item.roles.includes(role));
}
