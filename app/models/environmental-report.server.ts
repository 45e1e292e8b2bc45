import { concentrateCostSql } from "~/lib/stock/concentrate-cost";
import type { Knex } from "knex";
import { decimalOrNull, decimalOrZero } from "~/lib/decimal";
import { db, type Db } from "~/lib/db.server";
import { conservativeConcentrate, type ConcentrateLine } from "~/lib/foam/drawdown";
import {
  gramsToPoundsMass,
  pfasGrams,
  reportableQuantityAnswers,
  substanceMass,
  worseAnswer,
  type PfasUse,
  type SubstanceContent,
} from "~/lib/foam/pfas";
import {
  reachedEnvironment,
  reachedEnvironmentSql,
  releasedGallonsSql,
  unaccountedGallonsSql,
  shareNotContained,
} from "~/lib/foam/released-volume";
import {
  DISPOSITION_LABELS,
  DISPOSITIONS,
  EVENT_KIND_LABELS,
  EVENT_KINDS,
  EVENT_STATUS_LABELS,
  FLOW_BASIS_EXPORT_LABELS,
  FLOW_UNIT_LABELS,
  FOAM_TYPE_LABELS,
  foamClassLabel,
  isPfasContentUnit,
  NOTIFIED_PARTY_LABELS,
  type NotifiedParty,
  type ConcentrateFigure,
  type RqAnswer,
  WATER_ONLY_LABEL,
  type Disposition,
  type EventKind,
  type EventStatus,
  type FlowBasis,
  type FoamType,
  incidentTypeLabel,
  mutualAidUnitLabel,
} from "~/lib/foam/vocabulary";
import type { TankReading } from "~/lib/foam/totals";
import type { FlowUnit } from "~/lib/foam/units";
import type { ReportPeriod } from "~/lib/reporting/period";
import { wallClockIn } from "~/lib/time-zone";
import { agencyNameForDocuments, readAgencySettings } from "./agency-settings.server";

export const NOT_PLACED = "(not placed)";
export const NONE_STATED = "(none stated)";

// Rows straight from MariaDB: column names as selected, DECIMAL as strings, counts as numbers or strings.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type SqlRow = Record<string, any>;

const num = decimalOrZero;
const numOrNull = decimalOrNull;

/** Accepted reports whose event started in the period: the rows every total counts. */
export function countedEvents(period: ReportPeriod, connection: Db = db): Knex.QueryBuilder {
  return connection("events as e")
    .where("e.status", "accepted")
    .where("e.started_at", ">=", period.startUtc)
    .where("e.started_at", "<", period.endUtc);
}

const RELEASED_GAL = releasedGallonsSql("r", "e");

export type VolumeTotals = { water: number; concentrate: number; solution: number };
export type ClassTotals = VolumeTotals & { foamClass: string; incident: boolean };
export type ProductTotals = VolumeTotals & {
  product: string;
  foamClass: string;
  pfasContaining: boolean;
  incident: boolean;
};

export type PeriodAggregates = {
  eventCount: number;
  dischargeCount: number;
  releaseCount: number;
  nonIncidentCount: number;
  eventsByKind: Record<EventKind, number>;
  awaitingReview: number;
  returned: number;
  byClass: ClassTotals[];
  byProduct: ProductTotals[];
  byDisposition: Record<Disposition, number>;
  /** Foam solution released to the environment (soil, storm drain, surface water, unknown, sewer without notice). */
  environmentGallons: number;
  /** Foam solution held back: contained and collected, or sent to the sewer with a notice. */
  heldBackGallons: number;
  /** Foam solution that no runoff line accounts for, summed over the events (`unaccountedGallons`). */
  unaccountedGallons: number;
  byBasinAndWater: { basin: string; receivingWater: string; gallons: number }[];
  eventTotals: VolumeTotals;
};

/** Every total of the period, summed by MariaDB itself. */
export async function periodAggregates(period: ReportPeriod, connection: Db = db): Promise<PeriodAggregates> {
  const kinds: SqlRow[] = await countedEvents(period, connection).select("e.kind").count({ n: "*" }).groupBy("e.kind");
  const eventsByKind = Object.fromEntries(EVENT_KINDS.map((kind) => [kind, 0])) as Record<EventKind, number>;
  for (const row of kinds) eventsByKind[row.kind as EventKind] = num(row.n);
  const eventCount = Object.values(eventsByKind).reduce((a, b) => a + b, 0);

  const pending: SqlRow[] = await connection("events")
    .whereIn("status", ["filed", "returned"])
    .where("started_at", ">=", period.startUtc)
    .where("started_at", "<", period.endUtc)
    .select("status")
    .count({ n: "*" })
    .groupBy("status");
  const pendingOf = (status: string) => num(pending.find((row) => row.status === status)?.n);

  const eventTotalsRow = await countedEvents(period, connection)
    .sum({ water: "e.water_gal", concentrate: "e.concentrate_gal", solution: "e.solution_gal" })
    .first();

  const classRows: SqlRow[] = await countedEvents(period, connection)
    .join("discharges as d", "d.event_id", "e.id")
    .leftJoin("foam_products as p", "p.id", "d.product_id")
    .select(connection.raw("COALESCE(p.foam_class, '') AS foam_class"))
    .select(connection.raw("e.kind = 'incident' AS incident"))
    .count({ n: "*" })
    .sum({ water: "d.water_gal", concentrate: "d.concentrate_gal", solution: "d.solution_gal" })
    .groupByRaw("COALESCE(p.foam_class, ''), e.kind = 'incident'");
  const byClass: ClassTotals[] = classRows.map((row) => ({
    foamClass: foamClassLabel(row.foam_class),
    incident: Boolean(Number(row.incident)),
    water: num(row.water),
    concentrate: num(row.concentrate),
    solution: num(row.solution),
  }));
  const dischargeCount = classRows.reduce((sum, row) => sum + num(row.n), 0);

  const productRows: SqlRow[] = await countedEvents(period, connection)
    .join("discharges as d", "d.event_id", "e.id")
    .leftJoin("foam_products as p", "p.id", "d.product_id")
    .select("p.name", "p.foam_class", "p.pfas_containing")
    .select(connection.raw("e.kind = 'incident' AS incident"))
    .sum({ water: "d.water_gal", concentrate: "d.concentrate_gal", solution: "d.solution_gal" })
    .groupByRaw("p.id, p.name, p.foam_class, p.pfas_containing, e.kind = 'incident'")
    .orderBy("p.name");
  const byProduct: ProductTotals[] = productRows.map((row) => ({
    product: row.name ?? WATER_ONLY_LABEL,
    foamClass: foamClassLabel(row.foam_class),
    pfasContaining: Boolean(row.pfas_containing),
    incident: Boolean(Number(row.incident)),
    water: num(row.water),
    concentrate: num(row.concentrate),
    solution: num(row.solution),
  }));

  const dispositionRows: SqlRow[] = await countedEvents(period, connection)
    .join("runoff_dispositions as r", "r.event_id", "e.id")
    .select("r.disposition")
    .count({ n: "*" })
    .select(connection.raw(`SUM(${RELEASED_GAL}) AS gallons`))
    .groupBy("r.disposition");
  const byDisposition = Object.fromEntries(DISPOSITIONS.map((d) => [d, 0])) as Record<Disposition, number>;
  for (const row of dispositionRows) byDisposition[row.disposition as Disposition] = num(row.gallons);
  const releaseCount = dispositionRows.reduce((sum, row) => sum + num(row.n), 0);
  const environmentRow: SqlRow | undefined = await countedEvents(period, connection)
    .join("runoff_dispositions as r", "r.event_id", "e.id")
    .select(
      connection.raw(`SUM(CASE WHEN ${reachedEnvironmentSql("r")} THEN ${RELEASED_GAL} ELSE 0 END) AS environment`),
      connection.raw(`SUM(CASE WHEN ${reachedEnvironmentSql("r")} THEN 0 ELSE ${RELEASED_GAL} END) AS held_back`),
    )
    .first();
  const unaccountedRow: SqlRow | undefined = await countedEvents(period, connection)
    .select(connection.raw(`SUM(${unaccountedGallonsSql("e")}) AS unaccounted`))
    .first();

  const basinRows: SqlRow[] = await countedEvents(period, connection)
    .join("runoff_dispositions as r", "r.event_id", "e.id")
    .select(connection.raw(`COALESCE(NULLIF(e.drainage_basin, ''), ?) AS basin`, [NOT_PLACED]))
    .select(connection.raw(`COALESCE(NULLIF(r.receiving_water, ''), ?) AS receiving_water`, [NONE_STATED]))
    .select(connection.raw(`SUM(${RELEASED_GAL}) AS gallons`))
    .groupBy("basin", "receiving_water")
    .orderBy(["basin", "receiving_water"]);

  return {
    eventCount,
    dischargeCount,
    releaseCount,
    nonIncidentCount: eventCount - eventsByKind.incident,
    eventsByKind,
    awaitingReview: pendingOf("filed"),
    returned: pendingOf("returned"),
    byClass,
    byProduct,
    byDisposition,
    environmentGallons: num(environmentRow?.environment),
    heldBackGallons: num(environmentRow?.held_back),
    unaccountedGallons: num(unaccountedRow?.unaccounted),
    byBasinAndWater: basinRows.map((row) => ({
      basin: row.basin,
      receivingWater: row.receiving_water,
      gallons: num(row.gallons),
    })),
    eventTotals: {
      water: num(eventTotalsRow?.water),
      concentrate: num(eventTotalsRow?.concentrate),
      solution: num(eventTotalsRow?.solution),
    },
  };
}

export type EventExportRow = {
  number: string;
  kind: string;
  incidentType: string;
  dispatchNumber: string;
  /** The other agencies whose units flowed on this event, as typed; blank when none did. */
  mutualAid: string;
  status: string;
  revision: number;
  startedAt: Date | null;
  clearedAt: Date | null;
  station: string;
  address: string;
  latitude: number | null;
  longitude: number | null;
  drainageBasin: string;
  nearestWaterway: string;
  nearestWaterwayM: number | null;
  withinWaterwayBuffer: string;
  water: number;
  concentrate: number;
  solution: number;
  pfasContaining: string;
  hasWarnings: string;
  /** Warnings about the event as a whole (e.g. a tank drawdown that does not match), in words. */
  eventWarnings: string;
  /** Foam solution no runoff line accounts for (US gal). */
  unaccountedGallons: number;
  /** Concentrate × unit cost (US $); null when no product used has a unit cost. */
  concentrateCost: number | null;
};

const yesNo = (value: unknown): string => (value === null || value === undefined ? "" : Number(value) ? "Yes" : "No");

/** Events of the period, oldest first, one row at a time from MariaDB. */
export async function* streamEventRows(period: ReportPeriod, connection: Db = db): AsyncGenerator<EventExportRow> {
  const query = countedEvents(period, connection)
    .leftJoin("stations as s", "s.id", "e.station_id")
    .select(
      "e.number",
      "e.kind",
      "e.incident_type",
      "e.dispatch_number",
      connection.raw(
        `(SELECT GROUP_CONCAT(DISTINCT CONCAT_WS(' ', md.mutual_aid_agency, md.mutual_aid_unit) ORDER BY md.position SEPARATOR '; ')
          FROM discharges md WHERE md.event_id = e.id AND md.mutual_aid_agency IS NOT NULL) AS mutual_aid`,
      ),
      "e.status",
      "e.revision",
      "e.started_at",
      "e.cleared_at",
      "s.code as station_code",
      "s.name as station_name",
      "e.address",
      "e.latitude",
      "e.longitude",
      "e.drainage_basin",
      "e.nearest_waterway",
      "e.nearest_waterway_m",
      "e.within_waterway_buffer",
      "e.water_gal",
      "e.concentrate_gal",
      "e.solution_gal",
      "e.pfas_containing",
      "e.has_warnings",
      "e.event_warnings",
      connection.raw(`${unaccountedGallonsSql("e")} AS unaccounted_gal`),
      connection.raw(`${concentrateCostSql("e")} AS concentrate_cost`),
    )
    .orderBy(["e.started_at", "e.id"]);
  for await (const row of query.stream()) {
    yield {
      number: row.number,
      kind: EVENT_KIND_LABELS[row.kind as EventKind],
      incidentType: incidentTypeLabel(row.incident_type),
      dispatchNumber: row.dispatch_number ?? "",
      mutualAid: row.mutual_aid ?? "",
      status: EVENT_STATUS_LABELS[row.status as EventStatus],
      revision: Number(row.revision),
      startedAt: row.started_at,
      clearedAt: row.cleared_at,
      station: row.station_code ? `${row.station_code} ${row.station_name}` : "",
      address: row.address ?? "",
      latitude: numOrNull(row.latitude),
      longitude: numOrNull(row.longitude),
      drainageBasin: row.drainage_basin || NOT_PLACED,
      nearestWaterway: row.nearest_waterway ?? "",
      nearestWaterwayM: numOrNull(row.nearest_waterway_m),
      withinWaterwayBuffer: yesNo(row.within_waterway_buffer),
      water: num(row.water_gal),
      concentrate: num(row.concentrate_gal),
      solution: num(row.solution_gal),
      pfasContaining: yesNo(row.pfas_containing),
      hasWarnings: yesNo(row.has_warnings),
      eventWarnings: warningText(row.event_warnings),
      unaccountedGallons: num(row.unaccounted_gal),
      concentrateCost: numOrNull(row.concentrate_cost),
    };
  }
}

export type DischargeExportRow = {
  eventNumber: string;
  kind: string;
  position: number;
  /** Our unit id, or "Mutual aid: agency unit" for another agency's. */
  apparatus: string;
  mutualAid: string;
  outlet: string;
  product: string;
  foamClass: string;
  foamType: string;
  pfasContaining: string;
  percent: number | null;
  effectivePercent: number | null;
  flow: number | null;
  flowUnit: string;
  flowBasis: string;
  minutes: number | null;
  water: number;
  concentrate: number;
  solution: number;
  warnings: string;
};

function warningText(raw: unknown): string {
  if (typeof raw !== "string" || raw === "") return "";
  try {
    const list = JSON.parse(raw) as { code?: string; message?: string }[];
    return Array.isArray(list) ? list.map((item) => item.message ?? item.code ?? "").join("; ") : "";
  } catch {
    return raw;
  }
}

/** Discharges of the period in event order, one row at a time. */
export async function* streamDischargeRows(
  period: ReportPeriod,
  connection: Db = db,
): AsyncGenerator<DischargeExportRow> {
  const query = countedEvents(period, connection)
    .join("discharges as d", "d.event_id", "e.id")
    .leftJoin("foam_products as p", "p.id", "d.product_id")
    .leftJoin("apparatus as a", "a.id", "d.apparatus_id")
    .select(
      "e.number",
      "e.kind",
      "d.position",
      "a.unit_id",
      "d.mutual_aid_agency",
      "d.mutual_aid_unit",
      "d.outlet",
      "p.name as product",
      "p.foam_class",
      "p.foam_type",
      "p.pfas_containing",
      "d.percent",
      "d.effective_percent",
      "d.flow",
      "d.flow_unit",
      "d.flow_basis",
      "d.minutes",
      "d.water_gal",
      "d.concentrate_gal",
      "d.solution_gal",
      "d.warnings",
    )
    .orderBy(["e.started_at", "e.id", "d.position"]);
  for await (const row of query.stream()) {
    yield {
      eventNumber: row.number,
      kind: EVENT_KIND_LABELS[row.kind as EventKind],
      position: Number(row.position),
      apparatus: row.mutual_aid_agency
        ? mutualAidUnitLabel(row.mutual_aid_agency, row.mutual_aid_unit)
        : (row.unit_id ?? ""),
      mutualAid: row.mutual_aid_agency ? "Yes" : "No",
      outlet: row.outlet ?? "",
      product: row.product ?? WATER_ONLY_LABEL,
      foamClass: foamClassLabel(row.foam_class),
      foamType: row.foam_type ? FOAM_TYPE_LABELS[row.foam_type as FoamType] : "",
      pfasContaining: row.product ? yesNo(row.pfas_containing) : "No",
      percent: numOrNull(row.percent),
      effectivePercent: numOrNull(row.effective_percent),
      flow: numOrNull(row.flow),
      flowUnit: FLOW_UNIT_LABELS[row.flow_unit as FlowUnit] ?? row.flow_unit,
      flowBasis: FLOW_BASIS_EXPORT_LABELS[row.flow_basis as FlowBasis],
      minutes: numOrNull(row.minutes),
      water: num(row.water_gal),
      concentrate: num(row.concentrate_gal),
      solution: num(row.solution_gal),
      warnings: warningText(row.warnings),
    };
  }
}

export type ReleaseExportRow = {
  eventNumber: string;
  kind: string;
  startedAt: Date | null;
  disposition: string;
  sharePercent: number | null;
  statedGallons: number | null;
  releasedGallons: number;
  receivingWater: string;
  drainageBasin: string;
  nearestWaterway: string;
  disposalReference: string;
  sewerNotice: string;
  /** "Yes" when the line reached the environment (`reachedEnvironment`), else "No". */
  reachedEnvironment: string;
  notes: string;
  /** Notifications recorded for the event (who, when in UTC, case number); empty when none. */
  notifications: string;
};

export async function* streamReleaseRows(period: ReportPeriod, connection: Db = db): AsyncGenerator<ReleaseExportRow> {
  const query = countedEvents(period, connection)
    .join("runoff_dispositions as r", "r.event_id", "e.id")
    .select(
      "e.number",
      "e.kind",
      "e.started_at",
      "r.disposition",
      "r.share_percent",
      "r.volume_gal",
      connection.raw(`${RELEASED_GAL} AS released_gal`),
      "r.receiving_water",
      "e.drainage_basin",
      "e.nearest_waterway",
      "r.disposal_reference",
      "r.sewer_notice",
      "r.notes",
      connection.raw(
        `(SELECT GROUP_CONCAT(CONCAT(n.party, '|', DATE_FORMAT(n.notified_at, '%Y-%m-%d %H:%i'), '|', n.case_number)
            ORDER BY n.notified_at SEPARATOR ';') FROM release_notifications n WHERE n.event_id = e.id) AS notifications`,
      ),
    )
    .orderBy(["e.started_at", "e.id", "r.id"]);
  for await (const row of query.stream()) {
    yield {
      eventNumber: row.number,
      kind: EVENT_KIND_LABELS[row.kind as EventKind],
      startedAt: row.started_at,
      disposition: DISPOSITION_LABELS[row.disposition as Disposition],
      sharePercent: numOrNull(row.share_percent),
      statedGallons: numOrNull(row.volume_gal),
      releasedGallons: num(row.released_gal),
      receivingWater: row.receiving_water || NONE_STATED,
      drainageBasin: row.drainage_basin || NOT_PLACED,
      nearestWaterway: row.nearest_waterway ?? "",
      disposalReference: row.disposal_reference ?? "",
      sewerNotice: row.sewer_notice ?? "",
      reachedEnvironment: reachedEnvironment(row.disposition as Disposition, row.sewer_notice) ? "Yes" : "No",
      notes: row.notes ?? "",
      notifications: notificationsText(row.notifications),
    };
  }
}

/** "party|when|case;…" from the query, in words: "State spill line, 2026-05-01 15:20 UTC, case X". */
function notificationsText(stored: string | null): string {
  if (!stored) return "None recorded";
  return stored
    .split(";")
    .map((entry) => {
      const [party, when, caseNumber] = entry.split("|");
      const label = NOTIFIED_PARTY_LABELS[party as NotifiedParty] ?? party;
      return `${label}, ${when} UTC${caseNumber ? `, case ${caseNumber}` : ""}`;
    })
    .join("; ");
}

export type NonIncidentExportRow = {
  eventNumber: string;
  kind: string;
  startedAt: Date | null;
  station: string;
  products: string;
  water: number;
  concentrate: number;
  solution: number;
  runoff: string;
};

export async function* streamNonIncidentRows(
  period: ReportPeriod,
  connection: Db = db,
): AsyncGenerator<NonIncidentExportRow> {
  const query = countedEvents(period, connection)
    .whereNot("e.kind", "incident")
    .leftJoin("stations as s", "s.id", "e.station_id")
    .select(
      "e.number",
      "e.kind",
      "e.started_at",
      "s.code as station_code",
      "s.name as station_name",
      "e.water_gal",
      "e.concentrate_gal",
      "e.solution_gal",
      connection.raw(
        // STRAIGHT_JOIN: with few products MariaDB would otherwise walk every discharge of each
        // product per event (seconds at 10,000 lines) instead of the event's own lines.
        `(SELECT GROUP_CONCAT(DISTINCT p.name ORDER BY p.name SEPARATOR '; ') FROM discharges d
           STRAIGHT_JOIN foam_products p ON p.id = d.product_id WHERE d.event_id = e.id) AS products`,
      ),
      connection.raw(
        `(SELECT GROUP_CONCAT(DISTINCT r.disposition ORDER BY r.disposition SEPARATOR ',') FROM runoff_dispositions r
           WHERE r.event_id = e.id) AS dispositions`,
      ),
    )
    .orderBy(["e.started_at", "e.id"]);
  for await (const row of query.stream()) {
    yield {
      eventNumber: row.number,
      kind: EVENT_KIND_LABELS[row.kind as EventKind],
      startedAt: row.started_at,
      station: row.station_code ? `${row.station_code} ${row.station_name}` : "",
      products: row.products ?? WATER_ONLY_LABEL,
      water: num(row.water_gal),
      concentrate: num(row.concentrate_gal),
      solution: num(row.solution_gal),
      runoff: String(row.dispositions ?? "")
        .split(",")
        .filter(Boolean)
        .map((code) => DISPOSITION_LABELS[code as Disposition] ?? code)
        .join("; "),
    };
  }
}

export type PfasRow = {
  eventId: number;
  eventNumber: string;
  kind: string;
  startedAt: Date | null;
  product: string;
  content: number | null;
  contentUnit: string;
  contentBasis: string;
  contentSource: string;
  /**
   * Concentrate the PFAS figures use: the computed figure, or a larger tank drawdown
   * (`conservativeConcentrate`), as `concentrateFigure` says.
   */
  concentrateGallons: number;
  computedConcentrateGallons: number;
  /** What the tank readings attributable to this product say left the tanks; null: no reading. */
  drawdownGallons: number | null;
  concentrateFigure: ConcentrateFigure;
  /** Share of the event's foam solution not contained and collected, 0–1. */
  shareNotContained: number;
  dispositionsRecorded: boolean;
  /** Total PFAS (a screening figure; the reportable quantity counts PFOA and PFOS). */
  gramsInConcentrate: number | null;
  gramsReleased: number | null;
  poundsReleased: number | null;
  /** PFOA and PFOS, pounds that reached any surface (gross) and not recovered (net); null = not known. */
  pfoaGrossLb: number | null;
  pfoaNetLb: number | null;
  pfosGrossLb: number | null;
  pfosNetLb: number | null;
  pfoaAnswer: RqAnswer;
  pfosAnswer: RqAnswer;
  /** Heaviest known gross pounds of PFOA or of PFOS (never their sum) in a 24-hour period holding this use. */
  windowPounds: number | null;
  /** The worse of the PFOA and PFOS answers, as the sheets show it. */
  thresholdReached: "Yes" | "No" | "Unknown";
  /** Filed or returned reports (not yet accepted) within 24 hours of this one, counted in the window. */
  unacceptedInWindow: string;
};

const RQ_ANSWER_WORDS: Record<RqAnswer, PfasRow["thresholdReached"]> = { yes: "Yes", no: "No", unknown: "Unknown" };

function substanceContent(content: unknown, unit: unknown): SubstanceContent {
  const value = numOrNull(content);
  return value !== null && isPfasContentUnit(unit) ? { content: value, unit } : null;
}

/**
 * PFAS-containing concentrate used in the period, one row per accepted event and product, with the
 * reportable-quantity answer for PFOA and for PFOS. The 24-hour window looks 24 h before the period's
 * start and after its end, uses the earliest discharge time where one is given (else the event's
 * start), and counts filed and returned reports too: a release does not wait for review.
 */
export async function pfasRows(period: ReportPeriod, thresholdLb: number, connection: Db = db): Promise<PfasRow[]> {
  return pfasRowsAround(
    new Date(period.startUtc.getTime() - DAY_MS),
    new Date(period.endUtc.getTime() + DAY_MS),
    (row, startedAt) =>
      row.status === "accepted" && !!startedAt && startedAt >= period.startUtc && startedAt < period.endUtc,
    thresholdLb,
    connection,
  );
}

export type EventReportableQuantity = {
  pfoa: RqAnswer;
  pfos: RqAnswer;
  windowPounds: number;
  unacceptedInWindow: string;
};

/**
 * The reportable-quantity answer for one report's PFAS-containing foam, PFOA and PFOS apart, over
 * every 24-hour period holding its use (other filed, returned and accepted reports counted), as the
 * quarterly PFAS sheet computes it; null when the report used no PFAS-containing product.
 */
export async function eventReportableQuantity(
  eventId: number,
  thresholdLb: number,
  connection: Db = db,
): Promise<EventReportableQuantity | null> {
  const event = await connection("events").where({ id: eventId }).first("started_at");
  const startedAt = event?.started_at as Date | null | undefined;
  if (!startedAt) return null;
  const rows = await pfasRowsAround(
    new Date(startedAt.getTime() - DAY_MS),
    new Date(startedAt.getTime() + DAY_MS),
    (row) => Number(row.id) === eventId,
    thresholdLb,
    connection,
  );
  if (rows.length === 0) return null;
  return {
    pfoa: rows.map((row) => row.pfoaAnswer).reduce(worseAnswer),
    pfos: rows.map((row) => row.pfosAnswer).reduce(worseAnswer),
    windowPounds: Math.max(...rows.map((row) => row.windowPounds ?? 0)),
    unacceptedInWindow: [
      ...new Set(rows.flatMap((row) => (row.unacceptedInWindow ? [row.unacceptedInWindow] : []))),
    ].join(", "),
  };
}

const DAY_MS = 24 * 3_600_000;

async function pfasRowsAround(
  fromUtc: Date,
  toUtc: Date,
  keep: (row: SqlRow, startedAt: Date | null) => boolean,
  thresholdLb: number,
  connection: Db,
): Promise<PfasRow[]> {
  const day = DAY_MS;
  const rows: SqlRow[] = await connection("events as e")
    .whereIn("e.status", ["filed", "returned", "accepted"])
    .where("e.started_at", ">=", fromUtc)
    .where("e.started_at", "<", toUtc)
    .join("discharges as d", "d.event_id", "e.id")
    .join("foam_products as p", "p.id", "d.product_id")
    .where("p.pfas_containing", true)
    .select(
      "e.id",
      "e.number",
      "e.kind",
      "e.status",
      "e.started_at",
      "e.solution_gal as event_solution_gal",
      "p.id as product_id",
      "p.name",
      "p.pfas_content",
      "p.pfas_content_unit",
      "p.pfoa_content",
      "p.pfoa_content_unit",
      "p.pfos_content",
      "p.pfos_content_unit",
      "p.pfas_content_basis",
      "p.pfas_content_source",
      connection.raw(
        `(SELECT SUM(CASE WHEN r.disposition = 'contained' THEN ${RELEASED_GAL} ELSE 0 END) FROM runoff_dispositions r
           WHERE r.event_id = e.id) AS contained_gal`,
      ),
      connection.raw(`(SELECT COUNT(*) FROM runoff_dispositions r WHERE r.event_id = e.id) AS disposition_count`),
    )
    .min({ first_discharge_at: "d.started_at" })
    .sum({ concentrate: "d.concentrate_gal", solution: "d.solution_gal" })
    .groupBy("e.id", "p.id")
    .orderBy(["e.started_at", "e.id", "p.name"]);
  const concentrate = await concentrateFigures(rows, connection);
  const uses: PfasUse[] = rows.map((row, index) => {
    const solution = num(row.event_solution_gal);
    return {
      at: (row.first_discharge_at as Date | null) ?? (row.started_at as Date),
      concentrateGal: concentrate[index].conservativeGal,
      solutionGal: num(row.solution),
      // Every discharge reached some surface, land included (40 CFR 302.3); net leaves out what was contained.
      grossShare: 1,
      netShare: shareNotContained(num(row.contained_gal), solution),
      content: {
        pfoa: substanceContent(row.pfoa_content, row.pfoa_content_unit),
        pfos: substanceContent(row.pfos_content, row.pfos_content_unit),
      },
    };
  });
  const answers = {
    pfoa: reportableQuantityAnswers(uses, "pfoa", thresholdLb),
    pfos: reportableQuantityAnswers(uses, "pfos", thresholdLb),
  };
  // Filed and returned uses, found once: each row names those within a day of it.
  const notYetAccepted = rows.flatMap((row, index) =>
    row.status === "accepted"
      ? []
      : [
          {
            at: uses[index].at.getTime(),
            label: `${row.number} (${EVENT_STATUS_LABELS[row.status as EventStatus] ?? String(row.status)})`,
          },
        ],
  );
  const result: PfasRow[] = [];
  rows.forEach((row, index) => {
    const startedAt = row.started_at as Date | null;
    if (!keep(row, startedAt)) return;
    const use = uses[index];
    const content = numOrNull(row.pfas_content);
    const unit = row.pfas_content_unit;
    const known = content !== null && isPfasContentUnit(unit);
    const gramsInConcentrate = known ? pfasGrams(use, content, unit) : null;
    const gramsReleased = gramsInConcentrate === null ? null : gramsInConcentrate * use.netShare;
    const pfoa = substanceMass(use, "pfoa");
    const pfos = substanceMass(use, "pfos");
    const unaccepted = notYetAccepted
      .filter((other) => Math.abs(other.at - use.at.getTime()) < day)
      .map((other) => other.label);
    result.push({
      eventId: row.id,
      eventNumber: row.number,
      kind: EVENT_KIND_LABELS[row.kind as EventKind],
      startedAt,
      product: row.name,
      content,
      contentUnit: unit ?? "",
      contentBasis: row.pfas_content_basis ?? "",
      contentSource: row.pfas_content_source ?? "",
      concentrateGallons: concentrate[index].conservativeGal,
      computedConcentrateGallons: concentrate[index].computedGal,
      drawdownGallons: concentrate[index].drawdownGal,
      concentrateFigure: concentrate[index].basis,
      shareNotContained: use.netShare,
      dispositionsRecorded: num(row.disposition_count) > 0,
      gramsInConcentrate,
      gramsReleased,
      poundsReleased: gramsReleased === null ? null : gramsToPoundsMass(gramsReleased),
      pfoaGrossLb: pfoa.grossPounds,
      pfoaNetLb: pfoa.netPounds,
      pfosGrossLb: pfos.grossPounds,
      pfosNetLb: pfos.netPounds,
      pfoaAnswer: answers.pfoa[index].answer,
      pfosAnswer: answers.pfos[index].answer,
      windowPounds: Math.max(answers.pfoa[index].windowPounds, answers.pfos[index].windowPounds),
      thresholdReached: RQ_ANSWER_WORDS[worseAnswer(answers.pfoa[index].answer, answers.pfos[index].answer)],
      unacceptedInWindow: [...new Set(unaccepted)].join(", "),
    });
  });
  return result;
}

/** For each (event, product) row, its computed concentrate beside the event's tank readings. */
async function concentrateFigures(rows: SqlRow[], connection: Db) {
  const eventIds = [...new Set(rows.map((row) => Number(row.id)))];
  const [discharges, readings] = eventIds.length
    ? await Promise.all([
        connection("discharges")
          .whereIn("event_id", eventIds)
          .select("event_id", "apparatus_id", "product_id", "concentrate_gal"),
        connection("tank_readings")
          .whereIn("event_id", eventIds)
          .select("event_id", "apparatus_id", "product_id", "refill_gal", "level_before_gal", "level_after_gal"),
      ])
    : [[], []];
  const linesOf = new Map<number, ConcentrateLine[]>();
  for (const line of discharges as SqlRow[]) {
    const list = linesOf.get(Number(line.event_id)) ?? [];
    list.push({
      apparatusId: line.apparatus_id ?? null,
      productId: line.product_id ?? null,
      concentrateGal: num(line.concentrate_gal),
    });
    linesOf.set(Number(line.event_id), list);
  }
  const readingsOf = new Map<number, TankReading[]>();
  for (const reading of readings as SqlRow[]) {
    const list = readingsOf.get(Number(reading.event_id)) ?? [];
    list.push({
      apparatusId: reading.apparatus_id ?? null,
      productId: reading.product_id ?? null,
      refillGal: numOrNull(reading.refill_gal),
      levelBeforeGal: numOrNull(reading.level_before_gal),
      levelAfterGal: numOrNull(reading.level_after_gal),
    });
    readingsOf.set(Number(reading.event_id), list);
  }
  return rows.map((row) =>
    conservativeConcentrate(
      linesOf.get(Number(row.id)) ?? [],
      readingsOf.get(Number(row.id)) ?? [],
      Number(row.product_id),
    ),
  );
}

export type AmendedEvent = { number: string; revision: number; changedAt: Date; reason: string };

/** Events of the period changed after `since`: new revisions of accepted reports, and late reviews. */
export async function eventsChangedSince(
  period: ReportPeriod,
  since: Date,
  connection: Db = db,
): Promise<AmendedEvent[]> {
  const revisions: SqlRow[] = await connection("event_revisions as v")
    .join("events as e", "e.id", "v.event_id")
    .where("e.started_at", ">=", period.startUtc)
    .where("e.started_at", "<", period.endUtc)
    .where("v.created_at", ">", since)
    .select("e.number", "v.revision", "v.created_at", "v.reason")
    .orderBy(["v.created_at", "e.number"]);
  const seen = new Set(revisions.map((row) => row.number));
  const updated: SqlRow[] = await connection("events as e")
    .where("e.started_at", ">=", period.startUtc)
    .where("e.started_at", "<", period.endUtc)
    .where("e.updated_at", ">", since)
    .select("e.number", "e.revision", "e.updated_at", "e.status")
    .orderBy(["e.updated_at", "e.number"]);
  return [
    // A revision row keeps the state it replaced: the revision made is the next one.
    ...revisions.map((row) => ({
      number: row.number,
      revision: Number(row.revision) + 1,
      changedAt: row.created_at,
      reason: `Revision ${Number(row.revision) + 1} filed in place of revision ${Number(row.revision)}: ${row.reason}`,
    })),
    ...updated
      .filter((row) => !seen.has(row.number))
      .map((row) => ({
        number: row.number,
        revision: Number(row.revision),
        changedAt: row.updated_at,
        reason: `Revision ${Number(row.revision)} changed after submission (now ${EVENT_STATUS_LABELS[row.status as EventStatus] ?? String(row.status)})`,
      })),
  ];
}

/** What every export of a period starts from: the agency, its clock, the period's totals and PFAS rows. */
export async function periodFacts(period: ReportPeriod, connection: Db = db) {
  const settings = await readAgencySettings(connection);
  const agency = { ...settings, name: agencyNameForDocuments(settings) };
  const [aggregates, pfas] = await Promise.all([
    periodAggregates(period, connection),
    pfasRows(period, agency.pfasReportableLb, connection),
  ]);
  return { agency, wall: wallClockIn(agency.timeZone), aggregates, pfas };
}
