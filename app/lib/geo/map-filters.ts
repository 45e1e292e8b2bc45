import { EVENT_KINDS, FOAM_CLASSES, type EventKind, type FoamClass } from "~/lib/foam/vocabulary";
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
 */
export function parseMapFilters(params: URLSearchParams, timeZone: string): MapFilterResult {
  const period = parseReportPeriod(
    new URLSearchParams({ from: params.get("from") ?? "", to: params.get("to") ?? "" }),
    timeZone,
  );
  if (!period.ok) return { ok: false, field: "from", message: period.message };
  const bboxText = params.get("bbox")?.trim() ?? "";
  const bbox = bboxText ? parseBoundingBox(bboxText) : null;
  if (bboxText && !bbox) {
    return {
      ok: false,
      field: "bbox",
      message: "bbox must be west,south,east,north in degrees (west < east, south < north).",
    };
  }
  const foamClass = (params.get("class") ?? "").toUpperCase();
  if (foamClass && !(FOAM_CLASSES as readonly string[]).includes(foamClass)) {
    return { ok: false, field: "class", message: "class must be A or B (or empty for both)." };
  }
  const kind = params.get("kind") ?? "";
  if (kind && !(EVENT_KINDS as readonly string[]).includes(kind)) {
    return { ok: false, field: "kind", message: `kind must be one of ${EVENT_KINDS.join(", ")} (or empty for all).` };
  }
  const station = params.get("station") ?? "";
  const stationId = station ? recordIdOf(station) : null;
  if (station && stationId === null) {
    return { ok: false, field: "station", message: "station must be a station id (or empty for all)." };
  }
  return {
    ok: true,
    filters: {
      from: period.period.from,
      to: period.period.to,
      startUtc: period.period.startUtc,
      endUtc: period.period.endUtc,
      bbox,
      foamClass: (foamClass || null) as FoamClass | null,
      kind: (kind || null) as EventKind | null,
      stationId,
    },
  };
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
