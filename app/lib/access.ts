/**
 * Who may do what in Foamtally: the one table of roles and capabilities. Every route guard, the
 * navigation, the home page's tasks and the README's role table are read from here. Pure and
 * browser-safe; the server guard is `requireCapability` in `access.server.ts`.
 */

export const ROLES = ["officer", "environmental", "chief", "records", "admin"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  officer: "Company officer",
  environmental: "Environmental officer",
  chief: "Chief",
  records: "Records clerk",
  admin: "Administrator",
};

/** The role that only its own holders may give or take away (`users.grant-admin`). */
export const ADMINISTRATOR: Role = "admin";

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}

/** Who is asking: enough of the signed-in person to decide. */
export type Principal = { id: number; roles: readonly Role[]; stationId: number | null };

export type ReportStatus = "draft" | "filed" | "returned" | "accepted";
/** What the rules need to know about a usage report. */
export type ReportRecord = { status: ReportStatus; createdBy: number; stationId: number | null };
/** What the rules need to know about an account being changed. */
export type AccountRecord = { roles: readonly Role[] };

type Rule<R> = { says: string; holds: (principal: Principal, record: R) => boolean };

const sameStation = (principal: Principal, report: ReportRecord) =>
  principal.stationId !== null && report.stationId === principal.stationId;

/** The rules on records, each with the words the README shows. */
export const REPORT_RULES = {
  notADraftOfOthers: {
    says: "all but the drafts of others",
    holds: (principal, report) => report.status !== "draft" || report.createdBy === principal.id,
  },
  ownDraftOrOwnStationReturned: {
    says: "own drafts and filed reports; returned ones of their own station or their own",
    holds: (principal, report) =>
      report.status === "draft" || report.status === "filed"
        ? report.createdBy === principal.id
        : report.status === "returned" && (report.createdBy === principal.id || sameStation(principal, report)),
  },
  filedOnly: {
    says: "filed reports",
    holds: (_principal, report) => report.status === "filed",
  },
  accepted: {
    says: "accepted reports",
    holds: (_principal, report) => report.status === "accepted",
  },
  filedOfOwnStation: {
    says: "filed, returned or accepted reports of their own station",
    holds: (principal, report) => report.status !== "draft" && sameStation(principal, report),
  },
  ownOrOwnStationFiled: {
    says: "their own reports, and filed, returned or accepted ones of their own station",
    holds: (principal, report) =>
      report.createdBy === principal.id || (report.status !== "draft" && sameStation(principal, report)),
  },
  acceptedOfOwnStation: {
    says: "accepted reports of their own station",
    holds: (principal, report) => report.status === "accepted" && sameStation(principal, report),
  },
} satisfies Record<string, Rule<ReportRecord>>;

export const ACCOUNT_RULES = {
  notAnAdministrator: {
    says: "people who are not administrators",
    holds: (_principal, account) => !account.roles.includes(ADMINISTRATOR),
  },
} satisfies Record<string, Rule<AccountRecord>>;

type Grant<R> = { roles: readonly Role[]; rule?: Rule<R> };

type CapabilityDefinition<R = never> = {
  /** What it lets a person do, in the README's words. */
  does: string;
  grants: readonly Grant<R>[];
  /**
   * A record that fails this capability is answered as if it did not exist (404), so that neither
   * its existence nor its version can be probed.
   */
  hiddenUnless?: "report.read";
};

const report = <C extends CapabilityDefinition<ReportRecord>>(definition: C) => definition;
const account = <C extends CapabilityDefinition<AccountRecord>>(definition: C) => definition;
const plain = <C extends CapabilityDefinition>(definition: C) => definition;

/** The access table. The order is the order of the README's table. */
export const CAPABILITIES = {
  "report.create": plain({ does: "start and file a usage report", grants: [{ roles: ["officer"] }] }),
  "report.read": report({
    does: "read usage reports, their lists and the events CSV",
    grants: [{ roles: ["officer", "environmental", "chief", "records"], rule: REPORT_RULES.notADraftOfOthers }],
    hiddenUnless: "report.read",
  }),
  "report.edit": report({
    does: "change a draft, filed or returned report and file it",
    grants: [
      { roles: ["officer"], rule: REPORT_RULES.ownDraftOrOwnStationReturned },
      { roles: ["environmental", "chief"], rule: REPORT_RULES.filedOnly },
    ],
    hiddenUnless: "report.read",
  }),
  "report.revise": report({
    does: "file a revision of an accepted report, with its reason",
    grants: [
      { roles: ["officer"], rule: REPORT_RULES.acceptedOfOwnStation },
      { roles: ["environmental", "chief"], rule: REPORT_RULES.accepted },
    ],
    hiddenUnless: "report.read",
  }),
  "report.review": report({
    does: "accept a filed report or return it with a comment",
    grants: [{ roles: ["environmental", "chief"] }],
    hiddenUnless: "report.read",
  }),
  "report.notify": report({
    does: "record who was notified of a release, when, and the case number",
    grants: [
      { roles: ["officer"], rule: REPORT_RULES.filedOfOwnStation },
      { roles: ["environmental", "chief"], rule: REPORT_RULES.notADraftOfOthers },
    ],
    hiddenUnless: "report.read",
  }),
  "report.attach": report({
    does: "attach photos, disposal manifests, lab results and test printouts to a report, and remove them",
    grants: [
      { roles: ["officer"], rule: REPORT_RULES.ownOrOwnStationFiled },
      { roles: ["environmental", "chief"], rule: REPORT_RULES.notADraftOfOthers },
    ],
    hiddenUnless: "report.read",
  }),
  "usage.map": plain({ does: "see usage on the map and its totals", grants: [{ roles: ["environmental", "chief"] }] }),
  "geography.read": plain({
    does: "look up drainage basins, waterways, inlets and addresses",
    grants: [{ roles: ["officer", "environmental", "chief"] }],
  }),
  "geography.edit": plain({ does: "replace the drainage and waterway layers", grants: [{ roles: ["environmental"] }] }),
  "exports.quarterly": plain({
    does: "read and download the quarterly runoff and PFAS summaries and submitted files",
    grants: [{ roles: ["environmental", "chief"] }],
  }),
  "exports.submit": plain({
    does: "mark a quarter submitted and send it to the report recipients",
    grants: [{ roles: ["environmental"] }],
  }),
  "catalogue.read": plain({ does: "read the foam-product catalogue", grants: [{ roles: ["environmental", "chief"] }] }),
  "catalogue.edit": plain({
    does: "add and change foam products and their safety sheets",
    grants: [{ roles: ["environmental"] }],
  }),
  "apparatus.edit": plain({
    does: "add and change apparatus, their foam systems and stations",
    grants: [{ roles: ["chief", "admin"] }],
  }),
  "systems.read": plain({
    does: "see the fleet's foam systems, their flushes, accuracy tests, due dates and PFAS history",
    grants: [{ roles: ["officer", "environmental", "chief"] }],
  }),
  "systems.maintain": plain({
    does: "record flushes, primes, changeovers and accuracy tests of foam systems, and attach or remove test printouts",
    grants: [{ roles: ["officer", "chief"] }],
  }),
  "users.manage": account({
    does: "add people, change their names and roles, deactivate them",
    grants: [{ roles: ["admin"] }, { roles: ["chief"], rule: ACCOUNT_RULES.notAnAdministrator }],
  }),
  "users.grant-admin": plain({ does: "give or take away the administrator role", grants: [{ roles: ["admin"] }] }),
  "settings.read": plain({ does: "read the agency settings", grants: [{ roles: ["chief", "admin"] }] }),
  "settings.edit": plain({ does: "change the agency settings", grants: [{ roles: ["admin"] }] }),
  "outbox.view": plain({ does: "read the mail outbox and retry failed mail", grants: [{ roles: ["admin"] }] }),
  "alerts.release": plain({
    does: "receive release alerts by e-mail when a filed report may have released foam",
    grants: [{ roles: ["environmental"] }],
  }),
  "stock.read": plain({
    does: "read the concentrate stock book: what each location holds, lots, movements, readiness",
    grants: [{ roles: ["officer", "environmental", "chief"] }],
  }),
  "stock.manage": plain({
    does: "receive concentrate, move it, take quality samples, send it for disposal (attaching the hauler's manifest), count it, set reorder points",
    grants: [{ roles: ["environmental", "chief"] }],
  }),
  "alerts.stock": plain({
    does: "receive stock alerts by e-mail: below a reorder point, past shelf life, quality sample due",
    grants: [{ roles: ["environmental"] }],
  }),
  "records.manage": plain({
    does: "work the public-records queue: requesters' contact details, due dates, extensions and release packages",
    grants: [{ roles: ["records", "admin"] }],
  }),
} as const satisfies Record<string, CapabilityDefinition<ReportRecord> | CapabilityDefinition<AccountRecord>>;

export type Capability = keyof typeof CAPABILITIES;
export const CAPABILITY_NAMES = Object.keys(CAPABILITIES) as Capability[];

/** The record a capability's rules look at (none for capabilities without rules). */
export type RecordFor<C extends Capability> = C extends `report.${string}`
  ? ReportRecord
  : C extends "users.manage"
    ? AccountRecord
    : never;

function grantsOf(capability: Capability): readonly Grant<unknown>[] {
  return CAPABILITIES[capability].grants as readonly Grant<unknown>[];
}

/** The roles any grant of the capability names (with or without a rule on the record). */
export function rolesFor(capability: Capability): Role[] {
  return ROLES.filter((role) => grantsOf(capability).some((grant) => grant.roles.includes(role)));
}

/**
 * Whether the principal may use the capability: on a given record when one is given, or on some
 * record at all (the page may open; the record decides later) when none is.
 */
export function can<C extends Capability>(principal: Principal, capability: C, record?: RecordFor<C>): boolean {
  const target: unknown = record;
  return grantsOf(capability).some(
    (grant) =>
      grant.roles.some((role) => principal.roles.includes(role)) &&
      (target === undefined || !grant.rule || grant.rule.holds(principal, target)),
  );
}

/** Whether holding these roles alone opens the capability (navigation and home tasks). */
export function rolesCan(roles: readonly Role[], capability: Capability): boolean {
  return rolesFor(capability).some((role) => roles.includes(role));
}

export type AccessDecision = "allow" | "sign-in" | "forbidden" | "hidden";

/**
 * The full decision for one request: not signed in; not for your roles; no such record for you
 * (a record the capability's `hiddenUnless` does not let you see); not this record; or allowed.
 */
export function decide<C extends Capability>(
  principal: Principal | null,
  capability: C | "signed-in",
  record?: RecordFor<C>,
): AccessDecision {
  if (!principal) return "sign-in";
  if (capability === "signed-in") return "allow";
  const hiddenUnless = (CAPABILITIES[capability] as CapabilityDefinition<unknown>).hiddenUnless;
  const check = can as (principal: Principal, capability: Capability, record?: unknown) => boolean;
  // A role that never has the capability is refused whatever the record, which stays unprobed.
  if (!check(principal, capability)) return "forbidden";
  if (record !== undefined && hiddenUnless && !check(principal, hiddenUnless, record)) return "hidden";
  return check(principal, capability, record) ? "allow" : "forbidden";
}

export type ChangeReason = "revision" | "review-edit";

/**
 * Which changes must give their reason, for the report's history: a revision of an accepted report,
 * and a reviewer's edit of a report someone else filed (the officer who filed it may still correct
 * it until the review without one).
 */
export function changeReasonFor(principal: Principal, report: ReportRecord): ChangeReason | null {
  if (report.status === "accepted") return "revision";
  if (report.status === "filed" && report.createdBy !== principal.id) return "review-edit";
  return null;
}

/** Changing a report is editing it, or revising it once it is accepted. */
export function changeCapabilityFor(status: ReportStatus): "report.edit" | "report.revise" {
  return status === "accepted" ? "report.revise" : "report.edit";
}

// ---------------------------------------------------------------------------------------------
// Routes: every entry of `app/routes.ts` names what its loader (GET) and action (POST) need.

export type RouteRequirement = Capability | "signed-in" | "public";
export type RouteAccess = { GET?: RouteRequirement; POST?: RouteRequirement };

export const ROUTE_ACCESS: Record<string, RouteAccess> = {
  "": { GET: "signed-in" },
  "sign-in": { GET: "public", POST: "public" },
  "sign-out": { GET: "public", POST: "public" },
  "forgot-password": { GET: "public", POST: "public" },
  "reset-password/:token": { GET: "public", POST: "public" },
  profile: { GET: "signed-in", POST: "signed-in" },
  "admin/users": { GET: "users.manage", POST: "users.manage" },
  "admin/settings": { GET: "settings.read", POST: "settings.edit" },
  "api/me": { GET: "signed-in" },
  events: { GET: "report.read" },
  review: { GET: "report.review" },
  "events.csv": { GET: "report.read" },
  "events/new": { GET: "report.create", POST: "report.create" },
  "events/:id": { GET: "report.read", POST: "report.review" },
  // The record's status decides between report.edit and report.revise (`changeCapabilityFor`).
  "events/:id/edit": { GET: "report.edit", POST: "report.edit" },
  "events/:id/revisions/:revision": { GET: "report.read" },
  "events/:id/notifications": { GET: "report.notify", POST: "report.notify" },
  "events/:id/report.pdf": { GET: "report.read" },
  "attachments/:id": { GET: "report.read", POST: "report.attach" },
  "attachments/:id/thumbnail": { GET: "report.read" },
  "api/totals": { GET: "signed-in", POST: "signed-in" },
  "api/events": { GET: "report.read", POST: "report.create" },
  // PUT: the record's status decides between report.edit and report.revise (`changeCapabilityFor`).
  "api/events/:id": { GET: "report.read", POST: "report.edit" },
  "api/events/:id/attachments": { GET: "report.read", POST: "report.attach" },
  map: { GET: "usage.map" },
  geography: { GET: "geography.edit", POST: "geography.edit" },
  "geography/layers/:kind/versions/:versionId": { GET: "geography.read" },
  "tiles/:z/:x/:file": { GET: "signed-in" },
  "api/geo/check": { GET: "geography.read" },
  "api/geo/addresses": { GET: "geography.read" },
  "api/geo/layers/:kind": { GET: "geography.read" },
  "api/map/events.geojson": { GET: "usage.map" },
  "api/summary": { GET: "usage.map" },
  products: { GET: "catalogue.read" },
  "products/:productId": { GET: "catalogue.read", POST: "catalogue.edit" },
  "products/:productId/safety-sheet": { GET: "signed-in" },
  "products/:productId/safety-sheet/versions/:versionId": { GET: "signed-in" },
  apparatus: { GET: "apparatus.edit" },
  "apparatus/:apparatusId": { GET: "apparatus.edit", POST: "apparatus.edit" },
  "stations/:stationId": { GET: "apparatus.edit", POST: "apparatus.edit" },
  "apparatus/:apparatusId/foam-systems/:systemId": { GET: "apparatus.edit", POST: "apparatus.edit" },
  "foam-systems": { GET: "systems.read" },
  "foam-systems/:systemId": { GET: "systems.read", POST: "systems.maintain" },
  "foam-systems/:systemId/tests/:testId": { GET: "systems.read" },
  "foam-systems/:systemId/tests/:testId/record.pdf": { GET: "systems.read" },
  "api/foam-tests/:testId/attachments": { GET: "systems.read", POST: "systems.maintain" },
  "foam-tests/:testId/attachments/:attachmentId": { GET: "systems.read", POST: "systems.maintain" },
  "foam-tests/:testId/attachments/:attachmentId/thumbnail": { GET: "systems.read" },
  "api/foam-systems": { GET: "systems.read" },
  "api/foam-tests/compute": { GET: "signed-in", POST: "signed-in" },
  environmental: { GET: "exports.quarterly", POST: "exports.submit" },
  "environmental/submissions/:id": { GET: "exports.quarterly" },
  "reports/environmental.xlsx": { GET: "exports.quarterly" },
  "reports/environmental.csv": { GET: "exports.quarterly" },
  "admin/outbox": { GET: "outbox.view", POST: "outbox.view" },
  "records-requests": { GET: "public", POST: "public" },
  "records-requests/:trackingCode": { GET: "public" },
  records: { GET: "records.manage" },
  "records/:id": { GET: "records.manage", POST: "records.manage" },
  "records/:id/files/:fileId": { GET: "records.manage" },
  "records/:id/attachments/:attachmentId": { GET: "records.manage", POST: "records.manage" },
  "records/:id/attachments/:attachmentId/thumbnail": { GET: "records.manage" },
  stock: { GET: "stock.read", POST: "stock.manage" },
  "stock/movements": { GET: "stock.read", POST: "stock.manage" },
  "stock/counts": { GET: "stock.read", POST: "stock.manage" },
  "api/stock": { GET: "stock.read" },
  "api/stock/movements": { GET: "stock.read" },
  "api/stock/movements/:movementId/attachments": { GET: "stock.read", POST: "stock.manage" },
  "stock/movements/:movementId/attachments/:attachmentId": { GET: "stock.read", POST: "stock.manage" },
  "stock/movements/:movementId/attachments/:attachmentId/thumbnail": { GET: "stock.read" },
  "api/records-requests": { GET: "records.manage" },
  "api/records-requests/:id": { GET: "records.manage" },
  "api/records-requests/:id/attachments": { GET: "records.manage", POST: "records.manage" },
  "api/*": { GET: "public", POST: "public" },
  "*": { GET: "public", POST: "public" },
};

/** API tokens sign in on these paths only; pages, downloads and form actions need a session. */
export function acceptsApiToken(pathname: string): boolean {
  return pathname.startsWith("/api/");
}

// ---------------------------------------------------------------------------------------------
// The README's role table, generated from the table above (`npm run access:table`).

export function accessTableMarkdown(): string {
  const header = ["| capability | what it allows | " + ROLES.map((role) => ROLE_LABELS[role]).join(" | ") + " |"];
  header.push("| --- | --- | " + ROLES.map(() => "---").join(" | ") + " |");
  const rows = CAPABILITY_NAMES.map((capability) => {
    const cells = ROLES.map((role) => {
      const grant = grantsOf(capability).find((candidate) => candidate.roles.includes(role));
      if (!grant) return "";
      return grant.rule ? grant.rule.says : "yes";
    });
    return `| \`${capability}\` | ${CAPABILITIES[capability].does} | ${cells.join(" | ")} |`;
  });
  return [...header, ...rows].join("\n");
}

export const ACCESS_TABLE_START = "<!-- access-table:start (generated by npm run access:table) -->";
export const ACCESS_TABLE_END = "<!-- access-table:end -->";

/** The README with its generated table replaced by the current one. */
export function withAccessTable(readme: string): string {
  const start = readme.indexOf(ACCESS_TABLE_START);
  const end = readme.indexOf(ACCESS_TABLE_END);
  if (start < 0 || end < start) throw new Error("README has no access-table markers");
  return `${readme.slice(0, start + ACCESS_TABLE_START.length)}\n\n${accessTableMarkdown()}\n\n${readme.slice(end)}`;
}
