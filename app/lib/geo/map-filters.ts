import { EVENT_KINDS, FOAM_CLASSES, type EventKind, type FoamClass } from "~/lib/foam/vocabulary";
import type { QueryProblems } from "~/lib/query-params";
import { recordIdOf } from "~/lib/record-id";
import { parseReportPeriod } from "~/lib/reporting/period";

/** West, south, east, north in WGS 84 degrees. */
export type BoundingBox = [number, number, number, number];

export type MapFilters = {
  from: string;
  to: string;
  startUtc: Date;
  endUtc: Date;
  bbox: BoundingBox | null;
  foamClass: FoamClass | null;
  kind: EventKind | null;
  stationId: number | null;
};

export type MapFilterResult = { ok: true; filters: MapFilters } | { ok: false; field: string; message: string };

export function parseBoundingBox(value: string): BoundingBox | null {
  const parts = value.split(",").map((part) => Number(part.trim()));
  if (parts.length !== 4 || parts.some((n) => !Number.isFinite(n))) return null;
  const [west, south, east, north] = parts;
  if (west < -180 || east > 180 || south < -90 || north > 90 || west >= east || south >= north) return null;
  return [west, south, east, north];
}

/**
 * Reads the map's query: from and to (ISO dates in the agency's zone, inclusive, both required),
 * bbox=w,s,e,n, class=A|B, kind=incident|training|test|flush, station=<id>. Empty values mean "all".
 * Each filter is read on its own: one that cannot be used is left out and its problem named (in this
 * order: from, bbox, class, kind, station). A period that cannot be used is replaced by `fallback`
 * when one is given; without it there are no filters.
 */
export function readMapFilters(
  params: URLSearchParams,
  timeZone: string,
  fallback?: { from: string; to: string },
): { filters: MapFilters | null; problems: QueryProblems } {
  const problems: QueryProblems = {};
  const periodOf = (from: string, to: string) => parseReportPeriod(new URLSearchParams({ from, to }), timeZone);
  let period = periodOf(params.get("from") ?? "", params.get("to") ?? "");
  if (!period.ok) {
    problems.from = period.message;
    if (fallback) period = periodOf(fallback.from, fallback.to);
  }
  const bboxText = params.get("bbox")?.trim() ?? "";
  const bbox = bboxText ? parseBoundingBox(bboxText) : null;
  if (bboxText && !bbox) problems.bbox = "bbox must be west,south,east,north in degrees (west < east, south < north).";
  const classText = (params.get("class") ?? "").toUpperCase();
  const foamClass = (FOAM_CLASSES as readonly string[]).includes(classText) ? (classText as FoamClass) : null;
  if (classText && !foamClass) problems.class = "class must be A or B (or empty for both).";
  const kindText = params.get("kind") ?? "";
  const kind = (EVENT_KINDS as readonly string[]).includes(kindText) ? (kindText as EventKind) : null;
  if (kindText && !kind) problems.kind = `kind must be one of ${EVENT_KINDS.join(", ")} (or empty for all).`;
  const station = params.get("station") ?? "";
  const stationId = station ? recordIdOf(station) : null;
  if (station && stationId === null) problems.station = "station must be a station id (or empty for all).";
  if (!period.ok) return { filters: null, problems };
  const { from, to, startUtc, endUtc } = period.period;
  return { filters: { from, to, startUtc, endUtc, bbox, foamClass, kind, stationId }, problems };
}

/** `readMapFilters` for the API: the first problem, or every filter. */
export function parseMapFilters(params: URLSearchParams, timeZone: string): MapFilterResult {
  const { filters, problems } = readMapFilters(params, timeZone);
  const [first] = Object.entries(problems);
  if (first || !filters) return { ok: false, field: first[0], message: first[1] };
  return { ok: true, filters };
}

/** The query string for the map's API calls (bbox rounded to 5 decimals, about a metre). */
export function mapQuery(filters: {
  from: string;
  to: string;
  bbox?: BoundingBox | null;
  foamClass?: string | null;
  kind?: string | null;
  stationId?: number | string | null;
}): string {
  const params = new URLSearchParams({ from: filters.from, to: filters.to });
  if (filters.bbox) params.set("bbox", filters.bbox.map((n) => n.toFixed(5)).join(","));
  if (filters.foamClass) params.set("class", filters.foamClass);
  if (filters.kind) params.set("kind", filters.kind);
  if (filters.stationId) params.set("station", String(filters.stationId));
  return params.toString();
}
