import type { Knex } from "knex";
import type { ReportRecord } from "~/lib/access";
import type { SessionUser } from "~/lib/auth.server";
import { decimalOrNull, decimalOrZero } from "~/lib/decimal";
import { db, type Db } from "~/lib/db.server";
import { releasedGallons, unaccountedGallons } from "~/lib/foam/released-volume";
import { drawdownComparisons, type ConcentrateLine, type DrawdownComparison } from "~/lib/foam/drawdown";
import type { TankReading, UsageWarning } from "~/lib/foam/totals";
import { roundForDisplay, volumeFromGallons, type Volume } from "~/lib/foam/units";
import {
  EVENT_KINDS,
  EVENT_STATUSES,
  FOAM_CLASSES,
  INCIDENT_TYPES,
  type Disposition,
  type IncidentType,
  type EventKind,
  type EventStatus,
  type FoamClass,
  type PercentOf,
} from "~/lib/foam/vocabulary";
import { readStoredDraft } from "~/lib/foam/report-draft.server";
import { queryReader } from "~/lib/query-params";
import { endOfLocalDay, instantToWallClock, startOfLocalDay } from "~/lib/time-zone";
import { agencySettingsAt, readAgencySettings } from "./agency-settings.server";
import { usedFoamClass } from "./catalogue.server";
import { checksOfRow } from "./geography.server";
import { VersionedCache } from "~/lib/versioned-cache";
import type { DataVersions } from "./data-version.server";

export function apiVolume(gallons: number): Volume {
  const volume = volumeFromGallons(gallons);
  return { gal: roundForDisplay(volume.gal), L: roundForDisplay(volume.L) };
}

function warningsOf(stored: unknown): UsageWarning[] {
  if (typeof stored !== "string" || !stored) return [];
  try {
    const parsed = JSON.parse(stored);
    return Array.isArray(parsed) ? parsed : [];
  } catch {
    return [];
  }
}

export type ReportDetail = Awaited<ReturnType<typeof getReport>>;

/** What the access rules need to know about a report, or null when there is no such report. */
export async function reportAccessRecord(eventId: number, connection: Db = db): Promise<ReportRecord | null> {
  if (!Number.isInteger(eventId) || eventId < 1) return null;
  const row = await connection("events").where({ id: eventId }).first("status", "created_by", "station_id");
  return row ? reportRecordOf(row) : null;
}

export function reportRecordOf(row: {
  status: EventStatus;
  created_by: number;
  station_id: number | null;
}): ReportRecord {
  return { status: row.status, createdBy: row.created_by, stationId: row.station_id ?? null };
}

/** One report with its discharges, runoff, tank readings, stored totals and geography checks. */
export async function getReport(eventId: number) {
  const { timeZone } = await readAgencySettings();
  const event = await db("events")
    .leftJoin("stations", "stations.id", "events.station_id")
    .leftJoin("users as author", "author.id", "events.created_by")
    .leftJoin("users as reviewer", "reviewer.id", "events.reviewed_by")
    .where("events.id", eventId)
    .first(
      "events.*",
      "stations.code as station_code",
      "stations.name as station_name",
      "author.name as author_name",
      "reviewer.name as reviewer_name",
      db.raw("LENGTH(events.draft_json) as draft_bytes"),
    );
  if (!event) return null;
  const [discharges, dispositions, tankReadings] = await Promise.all([
    db("discharges")
      .leftJoin("apparatus", "apparatus.id", "discharges.apparatus_id")
      .leftJoin("foam_products", "foam_products.id", "discharges.product_id")
      .where("discharges.event_id", eventId)
      .orderBy("discharges.position")
      .select(
        "discharges.*",
        "apparatus.unit_id as apparatus_unit_id",
        "foam_products.name as product_name",
        "foam_products.foam_class as foam_class",
        "foam_products.pfas_containing as product_pfas",
      ),
    db("runoff_dispositions").where({ event_id: eventId }).orderBy("id"),
    db("tank_readings")
      .leftJoin("apparatus", "apparatus.id", "tank_readings.apparatus_id")
      .leftJoin("foam_products", "foam_products.id", "tank_readings.product_id")
      .where("tank_readings.event_id", eventId)
      .orderBy("tank_readings.id")
      .select("tank_readings.*", "apparatus.unit_id as apparatus_unit_id", "foam_products.name as product_name"),
  ]);
  return reportDetailOf({ event, discharges, dispositions, tankReadings }, timeZone);
}

type ReportRows = {
  event: SqlRow;
  discharges: SqlRow[];
  dispositions: SqlRow[];
  tankReadings: SqlRow[];
};
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type SqlRow = Record<string, any>;

/** A report's rows (with the names joined in) as the page and the API read them. */
function reportDetailOf({ event, discharges, dispositions, tankReadings }: ReportRows, timeZone: string) {
  const wallClock = (instant: Date | string | null) => instantToWallClock(instant, timeZone);
  const solutionGal = decimalOrZero(event.solution_gal);
  return {
    id: event.id as number,
    number: event.number as string,
    kind: event.kind as EventKind,
    incidentType: (event.incident_type as IncidentType | null) ?? null,
    dispatchNumber: (event.dispatch_number as string | null) ?? null,
    status: event.status as EventStatus,
    version: event.version as number,
    revision: event.revision as number,
    startedAt: wallClock(event.started_at),
    clearedAt: wallClock(event.cleared_at),
    timeZone,
    address: event.address as string,
    latitude: decimalOrNull(event.latitude),
    longitude: decimalOrNull(event.longitude),
    stationId: (event.station_id as number | null) ?? null,
    station: event.station_code ? `${event.station_code} ${event.station_name}` : null,
    narrative: (event.narrative as string | null) ?? "",
    createdBy: event.created_by as number,
    authorName: (event.author_name as string | null) ?? null,
    filedAt: event.filed_at ? new Date(event.filed_at).toISOString() : null,
    updatedAt: event.updated_at ? new Date(event.updated_at).toISOString() : null,
    reviewedAt: event.reviewed_at ? new Date(event.reviewed_at).toISOString() : null,
    reviewerName: (event.reviewer_name as string | null) ?? null,
    reviewComment: (event.review_comment as string | null) ?? null,
    pfasContaining: Boolean(event.pfas_containing),
    hasWarnings: Boolean(event.has_warnings),
    eventWarnings: warningsOf(event.event_warnings),
    draft: readStoredDraft(event.draft_json, event.draft_bytes),
    totals: {
      water: decimalOrZero(event.water_gal),
      concentrate: decimalOrZero(event.concentrate_gal),
      solution: solutionGal,
    },
    geography: checksOfRow(event),
    discharges: discharges.map((row) => ({
      position: row.position as number,
      apparatusId: (row.apparatus_id as number | null) ?? null,
      apparatus: (row.apparatus_unit_id as string | null) ?? null,
      mutualAidAgency: (row.mutual_aid_agency as string | null) ?? null,
      mutualAidUnit: (row.mutual_aid_unit as string | null) ?? null,
      outlet: row.outlet as string,
      productId: (row.product_id as number | null) ?? null,
      product: (row.product_name as string | null) ?? null,
      foamClass: (row.foam_class as FoamClass | null) ?? null,
      pfasContaining: Boolean(row.product_pfas),
      percent: decimalOrNull(row.percent),
      effectivePercent: decimalOrNull(row.effective_percent),
      percentOf: (row.percent_of === "solution" ? "solution" : "water") as PercentOf,
      effectivePercentOfSolution: decimalOrNull(row.effective_percent_of_solution),
      flow: decimalOrZero(row.flow),
      flowUnit: row.flow_unit as "gpm" | "lpm",
      basis: row.flow_basis as "water" | "solution",
      startedAt: wallClock(row.started_at),
      endedAt: wallClock(row.ended_at),
      minutes: decimalOrZero(row.minutes),
      method: (row.method as string | null) ?? null,
      airFlowCfm: decimalOrNull(row.air_flow_cfm),
      heldUseReason: (row.held_use_reason as string | null) || null,
      water: decimalOrZero(row.water_gal),
      concentrate: decimalOrZero(row.concentrate_gal),
      solution: decimalOrZero(row.solution_gal),
      warnings: warningsOf(row.warnings),
    })),
    dispositions: dispositions.map((row) => {
      const share = decimalOrNull(row.share_percent);
      const volume = decimalOrNull(row.volume_gal);
      return {
        disposition: row.disposition as Disposition,
        sharePercent: share,
        volumeGal: volume,
        releasedGal: releasedGallons({ volumeGal: volume, sharePercent: share }, solutionGal),
        receivingWater: row.receiving_water as string,
        disposalReference: row.disposal_reference as string,
        sewerNotice: row.sewer_notice as string,
      };
    }),
    unaccountedGal: unaccountedGallons(
      dispositions.map((row) => ({
        disposition: row.disposition as Disposition,
        sharePercent: decimalOrNull(row.share_percent),
        volumeGal: decimalOrNull(row.volume_gal),
      })),
      solutionGal,
    ),
    drawdowns: drawdownsOf(discharges, tankReadings),
    tankReadings: tankReadings.map((row) => ({
      apparatusId: (row.apparatus_id as number | null) ?? null,
      apparatus: (row.apparatus_unit_id as string | null) ?? null,
      productId: (row.product_id as number | null) ?? null,
      product: (row.product_name as string | null) ?? null,
      refillGal: decimalOrNull(row.refill_gal),
      levelBeforeGal: decimalOrNull(row.level_before_gal),
      levelAfterGal: decimalOrNull(row.level_after_gal),
    })),
  };
}

export type DrawdownLine = DrawdownComparison & {
  apparatus: string | null;
  product: string | null;
  /** Some discharge these readings cover used PFAS-containing foam. */
  pfasContaining: boolean;
};

/** Each tank the readings name: its drawdown beside the concentrate computed for it. */
function drawdownsOf(discharges: SqlRow[], tankReadings: SqlRow[]): DrawdownLine[] {
  const lines: Array<ConcentrateLine & { pfas: boolean }> = discharges.map((row) => ({
    apparatusId: (row.apparatus_id as number | null) ?? null,
    productId: (row.product_id as number | null) ?? null,
    concentrateGal: decimalOrZero(row.concentrate_gal),
    pfas: Boolean(row.product_pfas),
  }));
  const readings: TankReading[] = tankReadings.map((row) => ({
    apparatusId: (row.apparatus_id as number | null) ?? null,
    productId: (row.product_id as number | null) ?? null,
    refillGal: decimalOrNull(row.refill_gal),
    levelBeforeGal: decimalOrNull(row.level_before_gal),
    levelAfterGal: decimalOrNull(row.level_after_gal),
  }));
  return drawdownComparisons(lines, readings).map((comparison) => {
    const named = tankReadings.find(
      (row) =>
        ((row.apparatus_id as number | null) ?? null) === comparison.apparatusId &&
        ((row.product_id as number | null) ?? null) === comparison.productId,
    );
    return {
      ...comparison,
      apparatus: (named?.apparatus_unit_id as string | null) ?? null,
      product: (named?.product_name as string | null) ?? null,
      pfasContaining: lines.some(
        (line) =>
          line.pfas &&
          (comparison.apparatusId == null || line.apparatusId === comparison.apparatusId) &&
          (comparison.productId == null || line.productId === comparison.productId),
      ),
    };
  });
}

export type RevisionEntry = { revision: number; reason: string; changedAt: string; changedBy: string };

/** The earlier states an accepted report was amended from: each revision, who replaced it, when and why. */
export async function listRevisions(eventId: number): Promise<RevisionEntry[]> {
  const rows = await db("event_revisions")
    .leftJoin("users", "users.id", "event_revisions.created_by")
    .where("event_revisions.event_id", eventId)
    .orderBy("event_revisions.revision", "desc")
    .select("event_revisions.revision", "event_revisions.reason", "event_revisions.created_at", "users.name");
  return rows.map((row) => ({
    revision: Number(row.revision),
    reason: row.reason,
    changedAt: new Date(row.created_at).toISOString(),
    changedBy: row.name ?? "unknown",
  }));
}

/**
 * One earlier state of a report, read from the snapshot taken when it was amended. Names of
 * stations, apparatus, products and people are today's, looked up by the ids the snapshot stored.
 */
export async function getRevision(eventId: number, revision: number) {
  const stored = await db("event_revisions").where({ event_id: eventId, revision }).first();
  if (!stored) return null;
  const snapshot = JSON.parse(stored.snapshot_json) as {
    event: SqlRow;
    discharges: SqlRow[];
    dispositions: SqlRow[];
    tankReadings: SqlRow[];
  };
  const ids = (rows: SqlRow[], column: string) => [
    ...new Set(rows.map((row) => row[column]).filter((id): id is number => typeof id === "number")),
  ];
  const lines = [...snapshot.discharges, ...snapshot.tankReadings];
  const [{ timeZone }, stations, apparatus, products, people, changer] = await Promise.all([
    readAgencySettings(),
    db("stations")
      .whereIn("id", ids([snapshot.event], "station_id"))
      .select("id", "code", "name"),
    db("apparatus").whereIn("id", ids(lines, "apparatus_id")).select("id", "unit_id"),
    db("foam_products").whereIn("id", ids(lines, "product_id")).select("id", "name", "foam_class", "pfas_containing"),
    db("users")
      .whereIn("id", ids([snapshot.event], "created_by").concat(ids([snapshot.event], "reviewed_by")))
      .select("id", "name"),
    db("users").where({ id: stored.created_by }).first("name"),
  ]);
  const byId = <T extends { id: number }>(rows: T[], id: unknown) => rows.find((row) => row.id === id);
  const station = byId(stations, snapshot.event.station_id);
  const event = {
    ...snapshot.event,
    station_code: station?.code ?? null,
    station_name: station?.name ?? null,
    author_name: byId(people, snapshot.event.created_by)?.name ?? null,
    reviewer_name: byId(people, snapshot.event.reviewed_by)?.name ?? null,
  };
  const withNames = (row: SqlRow) => {
    const product = byId(products, row.product_id);
    return {
      ...row,
      apparatus_unit_id: byId(apparatus, row.apparatus_id)?.unit_id ?? null,
      product_name: product?.name ?? null,
      foam_class: product?.foam_class ?? null,
      product_pfas: product?.pfas_containing ?? 0,
    };
  };
  const { draft: _draft, ...detail } = reportDetailOf(
    {
      event: { ...event, draft_json: null, draft_bytes: 0 },
      discharges: snapshot.discharges.map(withNames),
      dispositions: snapshot.dispositions,
      tankReadings: snapshot.tankReadings.map(withNames),
    },
    timeZone,
  );
  return {
    ...detail,
    revision,
    supersededAt: new Date(stored.created_at).toISOString(),
    supersededBy: changer?.name ?? "unknown",
    reason: stored.reason as string,
  };
}

/** The report as `GET /api/events/:id` returns it. */
export function reportForApi(report: NonNullable<ReportDetail>) {
  const { draft: _draft, createdBy: _createdBy, ...rest } = report;
  return {
    ...rest,
    totals: {
      water: apiVolume(report.totals.water),
      concentrate: apiVolume(report.totals.concentrate),
      solution: apiVolume(report.totals.solution),
    },
    discharges: report.discharges.map((line) => ({
      ...line,
      water: apiVolume(line.water),
      concentrate: apiVolume(line.concentrate),
      solution: apiVolume(line.solution),
    })),
    dispositions: report.dispositions.map((line) => ({ ...line, released: apiVolume(line.releasedGal) })),
  };
}

// ---------------------------------------------------------------------------------------------
// Lists

export const SORTABLE = {
  number: "events.number",
  startedAt: "events.started_at",
  kind: "events.kind",
  incidentType: "events.incident_type",
  dispatchNumber: "events.dispatch_number",
  status: "events.status",
  station: "stations.code",
  water: "events.water_gal",
  concentrate: "events.concentrate_gal",
  solution: "events.solution_gal",
} as const;
export type SortKey = keyof typeof SORTABLE;

export type EventFilters = {
  from?: string;
  to?: string;
  kind?: EventKind;
  incidentType?: IncidentType;
  /** Part of a dispatch (CAD) incident number, as typed. */
  dispatchNumber?: string;
  status?: EventStatus;
  stationId?: number;
  foamClass?: FoamClass;
  mine?: boolean;
  sort: SortKey;
  direction: "asc" | "desc";
  page: number;
  pageSize: number;
};

/** Pages the list goes to: far past any agency's events at 500 a page, and a bounded OFFSET. */
const MAX_LIST_PAGE = 100_000;

/**
 * The list's filters from the query string (`queryReader`): a filter that cannot be used is left
 * out and named in `errors`; the page shows the rest, the CSV and the API answer 400.
 */
export function parseEventFilters(search: URLSearchParams): { filters: EventFilters; errors: Record<string, string> } {
  const query = queryReader(search);
  const from = query.day("from");
  const to = query.day("to");
  if (from && to && from > to) query.problems.to = "The end date is before the start date.";
  const filters: EventFilters = {
    from,
    to,
    kind: query.choice("kind", EVENT_KINDS),
    incidentType: query.choice("type", INCIDENT_TYPES),
    dispatchNumber: query.text("dispatch", 32, "A dispatch number"),
    status: query.choice("status", EVENT_STATUSES),
    stationId: query.recordId("station", "a station"),
    foamClass: query.choice("class", FOAM_CLASSES),
    mine: search.get("mine") === "1",
    sort: query.choice("sort", Object.keys(SORTABLE) as SortKey[]) ?? "startedAt",
    direction: query.choice("dir", ["asc", "desc"] as const) ?? "desc",
    page: query.wholeNumber("page", { max: MAX_LIST_PAGE }) ?? 1,
    pageSize: query.wholeNumber("size", { max: 500 }) ?? 25,
  };
  return { filters, errors: query.problems };
}

/** Dates in the filters are the agency's calendar days, first and last inclusive. */
function filteredEvents(user: SessionUser, filters: EventFilters, timeZone: string): Knex.QueryBuilder {
  const query = db("events").leftJoin("stations", "stations.id", "events.station_id");
  query.where((visible) => visible.whereNot("events.status", "draft").orWhere("events.created_by", user.id));
  if (filters.from) query.where("events.started_at", ">=", startOfLocalDay(filters.from, timeZone));
  if (filters.to) query.where("events.started_at", "<", endOfLocalDay(filters.to, timeZone));
  if (filters.kind) query.where("events.kind", filters.kind);
  if (filters.incidentType) query.where("events.incident_type", filters.incidentType);
  if (filters.dispatchNumber) {
    // The words typed are matched anywhere in the number, literally (no wildcards of their own).
    const literal = filters.dispatchNumber.replace(/[\\%_]/g, (character) => `\\${character}`);
    query.whereRaw("events.dispatch_number LIKE ?", [`%${literal}%`]);
  }
  if (filters.status) query.where("events.status", filters.status);
  if (filters.stationId) query.where("events.station_id", filters.stationId);
  if (filters.mine) query.where("events.created_by", user.id);
  if (filters.foamClass) query.whereRaw(...usedFoamClass("events", filters.foamClass));
  return query;
}

export type EventListItem = {
  id: number;
  number: string;
  kind: EventKind;
  incidentType: IncidentType | null;
  dispatchNumber: string | null;
  status: EventStatus;
  startedAt: string;
  address: string;
  station: string | null;
  water: number;
  concentrate: number;
  solution: number;
  pfasContaining: boolean;
  hasWarnings: boolean;
  foamClasses: FoamClass[];
};

function listItem(row: Record<string, unknown>, timeZone: string): EventListItem {
  return {
    id: row.id as number,
    number: row.number as string,
    kind: row.kind as EventKind,
    incidentType: (row.incident_type as IncidentType | null) ?? null,
    dispatchNumber: (row.dispatch_number as string | null) ?? null,
    status: row.status as EventStatus,
    startedAt: instantToWallClock(row.started_at as Date | null, timeZone),
    address: row.address as string,
    station: (row.station_code as string | null) ?? null,
    water: decimalOrZero(row.water_gal),
    concentrate: decimalOrZero(row.concentrate_gal),
    solution: decimalOrZero(row.solution_gal),
    pfasContaining: Boolean(row.pfas_containing),
    hasWarnings: Boolean(row.has_warnings),
    foamClasses: String(row.foam_classes ?? "")
      .split(",")
      .filter((value): value is FoamClass => value === "A" || value === "B"),
  };
}

const LIST_COLUMNS = [
  "events.id",
  "events.number",
  "events.kind",
  "events.incident_type",
  "events.dispatch_number",
  "events.status",
  "events.started_at",
  "events.address",
  "events.water_gal",
  "events.concentrate_gal",
  "events.solution_gal",
  "events.pfas_containing",
  "events.has_warnings",
  "events.foam_classes",
  "stations.code as station_code",
];

/** One page of events, with the count and the totals of everything the filters select. */
export type EventPage = {
  items: EventListItem[];
  count: number;
  totals: { water: number; concentrate: number; solution: number };
};

type ListTotals = Pick<EventPage, "count" | "totals">;

/** The count and sums of everything a filter selects, for whoever sees it (every page of it agrees). */
export async function listTotals(user: SessionUser, filters: EventFilters, timeZone: string): Promise<ListTotals> {
  const aggregate = (await filteredEvents(user, filters, timeZone)
    .select(
      db.raw("COUNT(*) as count"),
      db.raw("SUM(events.water_gal) as water"),
      db.raw("SUM(events.concentrate_gal) as concentrate"),
      db.raw("SUM(events.solution_gal) as solution"),
    )
    .first()) as
    { count: number; water: string | null; concentrate: string | null; solution: string | null } | undefined;
  return {
    count: Number(aggregate?.count ?? 0),
    totals: {
      water: decimalOrZero(aggregate?.water),
      concentrate: decimalOrZero(aggregate?.concentrate),
      solution: decimalOrZero(aggregate?.solution),
    },
  };
}

// The totals of a filter change only when reports do: kept per person (drafts are their own) and
// filter while the reports' version stamp stands, so paging through a list sums it once.
const keptListTotals = new VersionedCache<ListTotals>(500);

function listTotalsKey(user: SessionUser, filters: EventFilters, timeZone: string): string {
  const { sort: _sort, direction: _direction, page: _page, pageSize: _pageSize, ...selection } = filters;
  return JSON.stringify([user.id, timeZone, selection]);
}

// A page's rows change when reports do, and its station codes when the catalogue does: kept per
// person and page while both stamps stand, so a list many people have open is read once per change.
// Pages of up to 100 rows only, so what is kept stays within a few megabytes.
const keptListPages = new VersionedCache<readonly EventListItem[]>(200);
const KEPT_PAGE_ROWS = 100;

async function listPage(user: SessionUser, filters: EventFilters, timeZone: string): Promise<EventListItem[]> {
  const rows = await filteredEvents(user, filters, timeZone)
    .select(...LIST_COLUMNS)
    .orderBy(SORTABLE[filters.sort], filters.direction)
    .orderBy("events.id", filters.direction)
    .limit(filters.pageSize)
    .offset((filters.page - 1) * filters.pageSize);
  return rows.map((row: Record<string, unknown>) => listItem(row, timeZone));
}

/**
 * A page of the list; `versions` are the data versions its kept rows, count and totals are checked
 * against. The items may be shared with other requests: read them, do not change them.
 */
export async function listEvents(user: SessionUser, filters: EventFilters, versions: DataVersions): Promise<EventPage> {
  const { timeZone } = await agencySettingsAt(versions.catalogue);
  const pageVersion =
    versions.reports && versions.catalogue && filters.pageSize <= KEPT_PAGE_ROWS
      ? `${versions.reports} ${versions.catalogue}`
      : null;
  const [items, totals] = await Promise.all([
    keptListPages.get(JSON.stringify([user.id, timeZone, filters]), pageVersion, () =>
      listPage(user, filters, timeZone),
    ),
    keptListTotals.get(listTotalsKey(user, filters, timeZone), versions.reports, () =>
      listTotals(user, filters, timeZone),
    ),
  ]);
  return { items: [...items], ...totals };
}

/** Every event the filters select, streamed in the list's order (for CSV downloads). */
export async function* eachEvent(user: SessionUser, filters: EventFilters): AsyncGenerator<EventListItem> {
  const batch = 1000;
  const { timeZone } = await readAgencySettings();
  for (let offset = 0; ; offset += batch) {
    const rows = await filteredEvents(user, filters, timeZone)
      .select(...LIST_COLUMNS)
      .orderBy(SORTABLE[filters.sort], filters.direction)
      .orderBy("events.id", filters.direction)
      .limit(batch)
      .offset(offset);
    for (const row of rows) yield listItem(row, timeZone);
    if (rows.length < batch) return;
  }
}

// ---------------------------------------------------------------------------------------------
// History

export type HistoryEntry = { at: string; actor: string; action: string; summary: string | null };

const ACTION_LABELS: Record<string, string> = {
  report_created: "Started a draft",
  report_draft_saved: "Saved the draft",
  report_filed: "Filed the report",
  report_revised: "Revised the accepted report",
  report_changed_in_review: "Changed the filed report",
  report_accepted: "Accepted the report",
  report_returned: "Returned the report",
};

/** Who changed what and when, from the audit log. */
export async function reportHistory(eventId: number): Promise<HistoryEntry[]> {
  const rows = await db("audit_events")
    .leftJoin("users", "users.id", "audit_events.actor_user_id")
    .where({ entity_type: "event", entity_id: String(eventId) })
    .orderBy("audit_events.id")
    .select(
      "audit_events.occurred_at",
      "audit_events.action",
      "audit_events.summary",
      "audit_events.actor_label",
      "users.name",
    );
  return rows.map((row) => ({
    at: new Date(row.occurred_at).toISOString(),
    actor: row.name ?? row.actor_label ?? "unknown",
    action: ACTION_LABELS[row.action] ?? row.action,
    summary: row.summary ?? null,
  }));
}

/** Returned reports this person may fix: their own, and those of their own station. */
export async function returnedReportsFor(user: SessionUser) {
  const rows = await db("events")
    .where({ status: "returned" })
    .where((mine) => {
      mine.where({ created_by: user.id });
      if (user.stationId !== null) mine.orWhere({ station_id: user.stationId });
    })
    .orderBy("reviewed_at", "desc")
    .select("id", "number", "review_comment", "reviewed_at");
  return rows.map((row) => ({
    id: row.id as number,
    number: row.number as string,
    comment: (row.review_comment as string | null) ?? "",
  }));
}

export async function draftsOf(user: SessionUser) {
  const rows = await db("events")
    .where({ created_by: user.id, status: "draft" })
    .orderBy("updated_at", "desc")
    .limit(20)
    .select("id", "number", "updated_at");
  return rows.map((row) => ({
    id: row.id as number,
    number: row.number as string,
    updatedAt: new Date(row.updated_at).toISOString(),
  }));
}

export async function awaitingReviewCount(): Promise<number> {
  const row = await db("events").where({ status: "filed" }).count({ count: "*" }).first();
  return Number(row?.count ?? 0);
}
