import { CONCENTRATE_COST_HEADER } from "~/lib/stock/concentrate-cost";
import type { Db } from "~/lib/db.server";
import { figureBasis } from "~/lib/foam/figure-basis";
import {
  CONCENTRATE_FIGURE_LABELS,
  FIGURE_BASIS_LABELS,
  PFAS_CONTENT_UNIT_LABELS,
  isPfasContentUnit,
} from "~/lib/foam/vocabulary";
import { LITRES_PER_US_GALLON } from "~/lib/foam/units";
import type { ReportPeriod } from "~/lib/reporting/period";
import {
  streamDischargeRows,
  streamEventRows,
  streamNonIncidentRows,
  streamReleaseRows,
  type DischargeExportRow,
  type EventExportRow,
  type NonIncidentExportRow,
  type PfasRow,
  type ReleaseExportRow,
} from "~/models/environmental-report.server";

/** The detail tables of the environmental export, shared by the workbook and the CSV files. */
export type CellValue = string | number | Date | null;
export type Column<Row> = {
  key: string;
  header: string;
  width: number;
  numFmt?: string;
  value: (row: Row) => CellValue;
};
export type DetailTable<Row> = {
  sheet: string;
  csvName: string;
  columns: Column<Row>[];
  rows: (period: ReportPeriod, connection: Db) => AsyncIterable<Row>;
};

export const GAL = "#,##0.00";
export const LITRES = "#,##0.0";
export const PERCENT = "0.00##";
export const GRAMS = "#,##0.00";
export const POUNDS = "#,##0.0000";
export const DATE_TIME = "yyyy-mm-dd hh:mm";
const litres = (gallons: number) => gallons * LITRES_PER_US_GALLON;

/** Times in the detail tables are the agency's wall-clock time; see `wallClockIn`. */
export type WallClock = (instant: Date | null) => Date | null;

export function eventTable(wall: WallClock): DetailTable<EventExportRow> {
  return {
    sheet: "Events",
    csvName: "events.csv",
    rows: (period, connection) => streamEventRows(period, connection),
    columns: [
      { key: "number", header: "Event number", width: 16, value: (r) => r.number },
      { key: "kind", header: "Kind", width: 11, value: (r) => r.kind },
      { key: "incidentType", header: "Incident type", width: 16, value: (r) => r.incidentType },
      { key: "dispatch", header: "Dispatch (CAD) number", width: 16, value: (r) => r.dispatchNumber },
      { key: "status", header: "Report status", width: 12, value: (r) => r.status },
      { key: "revision", header: "Revision", width: 9, value: (r) => r.revision },
      { key: "started", header: "Started (local)", width: 17, numFmt: DATE_TIME, value: (r) => wall(r.startedAt) },
      { key: "cleared", header: "Cleared (local)", width: 17, numFmt: DATE_TIME, value: (r) => wall(r.clearedAt) },
      { key: "station", header: "Station", width: 22, value: (r) => r.station },
      { key: "address", header: "Address", width: 32, value: (r) => r.address },
      { key: "latitude", header: "Latitude (° WGS 84)", width: 12, numFmt: "0.000000", value: (r) => r.latitude },
      { key: "longitude", header: "Longitude (° WGS 84)", width: 12, numFmt: "0.000000", value: (r) => r.longitude },
      { key: "basin", header: "Drainage basin", width: 22, value: (r) => r.drainageBasin },
      { key: "waterway", header: "Nearest waterway", width: 22, value: (r) => r.nearestWaterway },
      {
        key: "waterwayM",
        header: "Distance to waterway (m)",
        width: 12,
        numFmt: "#,##0",
        value: (r) => r.nearestWaterwayM,
      },
      { key: "buffer", header: "Within waterway buffer", width: 11, value: (r) => r.withinWaterwayBuffer },
      { key: "water", header: "Water (US gal)", width: 13, numFmt: GAL, value: (r) => r.water },
      { key: "concentrate", header: "Concentrate (US gal)", width: 13, numFmt: GAL, value: (r) => r.concentrate },
      { key: "solution", header: "Foam solution (US gal)", width: 13, numFmt: GAL, value: (r) => r.solution },
      { key: "solutionL", header: "Foam solution (L)", width: 13, numFmt: LITRES, value: (r) => litres(r.solution) },
      {
        key: "unaccounted",
        header: "Foam solution unaccounted for by the runoff lines (US gal)",
        width: 14,
        numFmt: GAL,
        value: (r) => r.unaccountedGallons,
      },
      { key: "pfas", header: "PFAS-containing foam", width: 11, value: (r) => r.pfasContaining },
      { key: "cost", header: CONCENTRATE_COST_HEADER, width: 14, numFmt: "#,##0.00", value: (r) => r.concentrateCost },
      { key: "warnings", header: "Has warnings", width: 10, value: (r) => r.hasWarnings },
      { key: "eventWarnings", header: "Event warnings", width: 40, value: (r) => r.eventWarnings },
      { key: "mutualAid", header: "Mutual-aid units", width: 24, value: (r) => r.mutualAid },
    ],
  };
}

export const dischargeTable: DetailTable<DischargeExportRow> = {
  sheet: "Discharges",
  csvName: "discharges.csv",
  rows: (period, connection) => streamDischargeRows(period, connection),
  columns: [
    { key: "event", header: "Event number", width: 16, value: (r) => r.eventNumber },
    { key: "kind", header: "Kind", width: 11, value: (r) => r.kind },
    { key: "position", header: "Line", width: 6, value: (r) => r.position },
    { key: "apparatus", header: "Apparatus", width: 12, value: (r) => r.apparatus },
    { key: "outlet", header: "Outlet", width: 16, value: (r) => r.outlet },
    { key: "product", header: "Product", width: 28, value: (r) => r.product },
    { key: "class", header: "Foam class", width: 10, value: (r) => r.foamClass },
    { key: "type", header: "Foam type", width: 10, value: (r) => r.foamType },
    { key: "pfas", header: "PFAS-containing", width: 10, value: (r) => r.pfasContaining },
    { key: "percent", header: "Set percent (%)", width: 10, numFmt: PERCENT, value: (r) => r.percent },
    { key: "effective", header: "Effective percent (%)", width: 10, numFmt: PERCENT, value: (r) => r.effectivePercent },
    { key: "flow", header: "Flow", width: 9, numFmt: "#,##0.0", value: (r) => r.flow },
    { key: "flowUnit", header: "Flow unit (gpm or L/min)", width: 9, value: (r) => r.flowUnit },
    { key: "basis", header: "Flow basis", width: 13, value: (r) => r.flowBasis },
    { key: "minutes", header: "Duration (min)", width: 9, numFmt: "#,##0.0", value: (r) => r.minutes },
    { key: "water", header: "Water (US gal)", width: 13, numFmt: GAL, value: (r) => r.water },
    { key: "concentrate", header: "Concentrate (US gal)", width: 13, numFmt: GAL, value: (r) => r.concentrate },
    { key: "solution", header: "Foam solution (US gal)", width: 13, numFmt: GAL, value: (r) => r.solution },
    { key: "concentrateL", header: "Concentrate (L)", width: 12, numFmt: LITRES, value: (r) => litres(r.concentrate) },
    { key: "solutionL", header: "Foam solution (L)", width: 13, numFmt: LITRES, value: (r) => litres(r.solution) },
    { key: "warnings", header: "Warnings", width: 40, value: (r) => r.warnings },
    { key: "mutualAid", header: "Mutual aid (no capacity checks)", width: 10, value: (r) => r.mutualAid },
  ],
};

export function releaseTable(wall: WallClock): DetailTable<ReleaseExportRow> {
  return {
    sheet: "Releases",
    csvName: "releases.csv",
    rows: (period, connection) => streamReleaseRows(period, connection),
    columns: [
      { key: "event", header: "Event number", width: 16, value: (r) => r.eventNumber },
      { key: "kind", header: "Kind", width: 11, value: (r) => r.kind },
      { key: "started", header: "Started (local)", width: 17, numFmt: DATE_TIME, value: (r) => wall(r.startedAt) },
      { key: "disposition", header: "Where the runoff went", width: 24, value: (r) => r.disposition },
      { key: "share", header: "Share of foam solution (%)", width: 11, numFmt: PERCENT, value: (r) => r.sharePercent },
      { key: "stated", header: "Stated volume (US gal)", width: 12, numFmt: GAL, value: (r) => r.statedGallons },
      {
        key: "released",
        header: "Released foam solution (US gal)",
        width: 14,
        numFmt: GAL,
        value: (r) => r.releasedGallons,
      },
      {
        key: "releasedL",
        header: "Released foam solution (L)",
        width: 14,
        numFmt: LITRES,
        value: (r) => litres(r.releasedGallons),
      },
      { key: "water", header: "Receiving water", width: 22, value: (r) => r.receivingWater },
      { key: "basin", header: "Drainage basin", width: 22, value: (r) => r.drainageBasin },
      { key: "waterway", header: "Nearest waterway", width: 22, value: (r) => r.nearestWaterway },
      { key: "disposal", header: "Disposal reference (contained)", width: 24, value: (r) => r.disposalReference },
      { key: "sewer", header: "Notice to treatment works (sewer)", width: 26, value: (r) => r.sewerNotice },
      {
        key: "environment",
        header: "Released to the environment",
        width: 12,
        value: (r) => r.reachedEnvironment,
      },
      { key: "notes", header: "Notes", width: 30, value: (r) => r.notes },
      {
        key: "notifications",
        header: "Notifications recorded (this record is not one)",
        width: 34,
        value: (r) => r.notifications,
      },
    ],
  };
}

export function nonIncidentTable(wall: WallClock): DetailTable<NonIncidentExportRow> {
  return {
    sheet: "Non-incident use",
    csvName: "non_incident_use.csv",
    rows: (period, connection) => streamNonIncidentRows(period, connection),
    columns: [
      { key: "event", header: "Event number", width: 16, value: (r) => r.eventNumber },
      { key: "kind", header: "Kind", width: 11, value: (r) => r.kind },
      { key: "started", header: "Started (local)", width: 17, numFmt: DATE_TIME, value: (r) => wall(r.startedAt) },
      { key: "station", header: "Station", width: 22, value: (r) => r.station },
      { key: "products", header: "Products", width: 32, value: (r) => r.products },
      { key: "water", header: "Water (US gal)", width: 13, numFmt: GAL, value: (r) => r.water },
      { key: "concentrate", header: "Concentrate (US gal)", width: 13, numFmt: GAL, value: (r) => r.concentrate },
      { key: "solution", header: "Foam solution (US gal)", width: 13, numFmt: GAL, value: (r) => r.solution },
      { key: "solutionL", header: "Foam solution (L)", width: 13, numFmt: LITRES, value: (r) => litres(r.solution) },
      { key: "runoff", header: "Where the runoff went", width: 36, value: (r) => r.runoff },
    ],
  };
}

const RQ_WORDS: Record<PfasRow["pfoaAnswer"], string> = { yes: "Yes", no: "No", unknown: "Unknown" };

export function pfasColumns(wall: WallClock, thresholdLb: number): Column<PfasRow>[] {
  return [
    { key: "event", header: "Event number", width: 16, value: (r) => r.eventNumber },
    { key: "kind", header: "Kind", width: 11, value: (r) => r.kind },
    { key: "started", header: "Started (local)", width: 17, numFmt: DATE_TIME, value: (r) => wall(r.startedAt) },
    { key: "product", header: "Product", width: 28, value: (r) => r.product },
    {
      key: "content",
      header: "Total PFAS content (screening)",
      width: 10,
      numFmt: "#,##0.####",
      value: (r) => r.content,
    },
    {
      key: "unit",
      header: "Content unit",
      width: 18,
      value: (r) => (isPfasContentUnit(r.contentUnit) ? PFAS_CONTENT_UNIT_LABELS[r.contentUnit] : "not recorded"),
    },
    { key: "basis", header: "What the content counts", width: 24, value: (r) => r.contentBasis },
    {
      key: "source",
      header: "Basis of the content figure",
      width: 22,
      value: (r) => FIGURE_BASIS_LABELS[figureBasis(r.contentSource)],
    },
    {
      key: "computedConcentrate",
      header: "Computed concentrate (US gal)",
      width: 12,
      numFmt: GAL,
      value: (r) => r.computedConcentrateGallons,
    },
    {
      key: "drawdown",
      header: "Tank drawdown (US gal)",
      width: 12,
      numFmt: GAL,
      value: (r) => r.drawdownGallons,
    },
    {
      key: "concentrate",
      header: "Concentrate counted for PFAS (US gal)",
      width: 12,
      numFmt: GAL,
      value: (r) => r.concentrateGallons,
    },
    {
      key: "concentrateL",
      header: "Concentrate counted for PFAS (L)",
      width: 12,
      numFmt: LITRES,
      value: (r) => litres(r.concentrateGallons),
    },
    {
      key: "concentrateFigure",
      header: "Concentrate figure",
      width: 22,
      value: (r) => CONCENTRATE_FIGURE_LABELS[r.concentrateFigure],
    },
    {
      key: "grams",
      header: "PFAS in concentrate used (g)",
      width: 13,
      numFmt: GRAMS,
      value: (r) => r.gramsInConcentrate,
    },
    {
      key: "share",
      header: "Share not contained (%)",
      width: 11,
      numFmt: "0.0",
      value: (r) => r.shareNotContained * 100,
    },
    {
      key: "releasedG",
      header: "Estimated PFAS released (g)",
      width: 13,
      numFmt: GRAMS,
      value: (r) => r.gramsReleased,
    },
    {
      key: "releasedLb",
      header: "Estimated PFAS released (lb)",
      width: 13,
      numFmt: POUNDS,
      value: (r) => r.poundsReleased,
    },
    {
      key: "pfoaGross",
      header: "PFOA reaching a surface, gross (lb)",
      width: 12,
      numFmt: POUNDS,
      value: (r) => r.pfoaGrossLb,
    },
    { key: "pfoaNet", header: "PFOA not recovered, net (lb)", width: 12, numFmt: POUNDS, value: (r) => r.pfoaNetLb },
    {
      key: "pfosGross",
      header: "PFOS reaching a surface, gross (lb)",
      width: 12,
      numFmt: POUNDS,
      value: (r) => r.pfosGrossLb,
    },
    { key: "pfosNet", header: "PFOS not recovered, net (lb)", width: 12, numFmt: POUNDS, value: (r) => r.pfosNetLb },
    { key: "pfoaAnswer", header: "PFOA at or above the RQ", width: 10, value: (r) => RQ_WORDS[r.pfoaAnswer] },
    { key: "pfosAnswer", header: "PFOS at or above the RQ", width: 10, value: (r) => RQ_WORDS[r.pfosAnswer] },
    {
      key: "window",
      header: "Heaviest 24 h holding this use, PFOA or PFOS, gross (lb)",
      width: 14,
      numFmt: POUNDS,
      value: (r) => r.windowPounds,
    },
    {
      key: "threshold",
      header: "Reportable threshold (lb per 24 h)",
      width: 12,
      numFmt: POUNDS,
      value: () => thresholdLb,
    },
    { key: "reached", header: "Reportable quantity reached", width: 10, value: (r) => r.thresholdReached },
    {
      key: "unaccepted",
      header: "Reports not yet accepted in the 24 h",
      width: 20,
      value: (r) => r.unacceptedInWindow,
    },
    {
      key: "note",
      header: "Note",
      width: 36,
      value: (r) =>
        [
          r.pfoaGrossLb === null || r.pfosGrossLb === null
            ? "PFOA or PFOS content not recorded: whether the reportable quantity was reached is unknown (mixture rule, 40 CFR 302.6(b)(1)(ii))."
            : "",
          r.content === null ? "Total PFAS content not recorded." : "",
          r.concentrateFigure === "tank-drawdown"
            ? "Tank drawdown exceeds the computed concentrate: the larger figure is counted, as the conservative one."
            : "",
          r.dispositionsRecorded ? "" : "No runoff dispositions recorded: all of it counted as released.",
        ]
          .filter(Boolean)
          .join(" "),
    },
  ];
}

export function columnLetter(index: number): string {
  let n = index + 1;
  let letters = "";
  while (n > 0) {
    const rest = (n - 1) % 26;
    letters = String.fromCharCode(65 + rest) + letters;
    n = Math.floor((n - 1) / 26);
  }
  return letters;
}

/** The spreadsheet column letter of a column key in a table. */
export function letterOf<Row>(columns: Column<Row>[], key: string): string {
  const index = columns.findIndex((column) => column.key === key);
  if (index < 0) throw new Error(`no column ${key}`);
  return columnLetter(index);
}
