import { type Capability, type Role, rolesCan } from "~/lib/access";

/** `demoOnly`: the page exists in demo mode only (the outbox of the local mail fake). */
export type NavItem = { to: string; label: string; capability: Capability | "signed-in"; demoOnly?: boolean };

/** The menu; each item shows for the roles the access table gives its capability. */
export const NAV_ITEMS: NavItem[] = [
  { to: "/", label: "Home", capability: "signed-in" },
  { to: "/events/new", label: "New report", capability: "report.create" },
  { to: "/events", label: "Events", capability: "report.read" },
  { to: "/review", label: "To review", capability: "report.review" },
  { to: "/admin/users", label: "People and roles", capability: "users.manage" },
  { to: "/admin/settings", label: "Agency settings", capability: "settings.read" },
  { to: "/products", label: "Foam products", capability: "catalogue.read" },
  { to: "/apparatus", label: "Apparatus and stations", capability: "apparatus.edit" },
  { to: "/foam-systems", label: "Foam systems", capability: "systems.read" },
  { to: "/map", label: "Usage map", capability: "usage.map" },
  { to: "/geography", label: "Drainage layers", capability: "geography.edit" },
  { to: "/environmental", label: "Quarterly summaries", capability: "exports.quarterly" },
  { to: "/admin/outbox", label: "Mail outbox", capability: "outbox.view", demoOnly: true },
  { to: "/stock", label: "Concentrate stock", capability: "stock.read" },
  { to: "/records", label: "Public-records requests", capability: "records.manage" },
];

export function navFor(roles: readonly Role[], demoMode = false): NavItem[] {
  return NAV_ITEMS.filter(
    (item) => (demoMode || !item.demoOnly) && (item.capability === "signed-in" || rolesCan(roles, item.capability)),
  );
}

/**
 * The one menu item marked current on a page: the one whose path is the longest part of the
 * address ("/events/new" is New report, not Events as well). A link with a query (such as the review
 * queue) is current only with that query; its plain sibling then is not.
 */
export function currentNavItem(links: readonly string[], pathname: string, search: string): string | null {
  let best: { to: string; length: number } | null = null;
  for (const to of links) {
    const [path, query] = to.split("?");
    if (query !== undefined && search !== `?${query}`) continue;
    const onPath = path === "/" ? pathname === "/" : pathname === path || pathname.startsWith(`${path}/`);
    if (!onPath) continue;
    // A query link at the same path wins over its plain sibling.
    const length = path.length + (query !== undefined ? 0.5 : 0);
    if (!best || length > best.length) best = { to, length };
  }
  return best?.to ?? null;
}
