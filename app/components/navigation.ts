import type { Role } from "~/lib/roles";

export type NavItem = { to: string; label: string; roles: Role[] };

/** What each role may open; the server checks the same roles on every route. */
export const NAV_ITEMS: NavItem[] = [
  { to: "/", label: "Home", roles: [] },
  { to: "/events/new", label: "New report", roles: ["officer"] },
  { to: "/events", label: "Events", roles: ["officer", "environmental", "chief", "records"] },
  { to: "/events?status=filed", label: "To review", roles: ["environmental", "chief"] },
  { to: "/admin/users", label: "People and roles", roles: ["admin", "chief"] },
  { to: "/admin/settings", label: "Agency settings", roles: ["admin", "chief"] },
  { to: "/products", label: "Foam products", roles: ["environmental", "chief"] },
  { to: "/apparatus", label: "Apparatus and stations", roles: ["chief", "admin"] },
  { to: "/map", label: "Usage map", roles: ["chief", "environmental"] },
  { to: "/geography", label: "Drainage layers", roles: ["environmental"] },
  { to: "/environmental", label: "Quarterly summaries", roles: ["environmental", "chief"] },
];

export function navFor(roles: readonly Role[]): NavItem[] {
  return NAV_ITEMS.filter((item) => item.roles.length === 0 || item.roles.some((role) => roles.includes(role)));
}
