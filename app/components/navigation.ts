import { type Capability, type Role, rolesCan } from "~/lib/access";

export type NavItem = { to: string; label: string; capability: Capability | "signed-in" };

/** The menu; each item shows for the roles the access table gives its capability. */
export const NAV_ITEMS: NavItem[] = [
  { to: "/", label: "Home", capability: "signed-in" },
  { to: "/events/new", label: "New report", capability: "report.create" },
  { to: "/events", label: "Events", capability: "report.read" },
  { to: "/events?status=filed", label: "To review", capability: "report.review" },
  { to: "/admin/users", label: "People and roles", capability: "users.manage" },
  { to: "/admin/settings", label: "Agency settings", capability: "settings.read" },
  { to: "/products", label: "Foam products", capability: "catalogue.read" },
  { to: "/apparatus", label: "Apparatus and stations", capability: "apparatus.edit" },
  { to: "/map", label: "Usage map", capability: "usage.map" },
  { to: "/geography", label: "Drainage layers", capability: "geography.edit" },
  { to: "/environmental", label: "Quarterly summaries", capability: "exports.quarterly" },
  { to: "/stock", label: "Concentrate stock", capability: "stock.read" },
];

export function navFor(roles: readonly Role[]): NavItem[] {
  return NAV_ITEMS.filter((item) => item.capability === "signed-in" || rolesCan(roles, item.capability));
}
