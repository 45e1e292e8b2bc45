import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { LRUCache } from "lru-cache";
import { decimalOrNull, decimalOrZero } from "~/lib/decimal";
import { db } from "~/lib/db.server";
import { releasedGallonsSql } from "~/lib/foam/released-volume";
import {
  FOAM_CLASSES,
  type Disposition,
  type EventFoamClasses,
  type EventKind,
  type FoamClass,
} from "~/lib/foam/vocabulary";
import type { GeographyChecks } from "~/lib/geo/checks";
import type { MapFilters } from "~/lib/geo/map-filters";
import { startOfLocalDay } from "~/lib/time-zone";
import { PiecewiseGzip } from "~/lib/piecewise-gzip.server";
import { VersionedCache } from "~/lib/versioned-cache";
import { agencySettingsAt } from "./agency-settings.server";
import { usedFoamClass } from "./catalogue.server";
import type { DataVersions } from "./data-version.server";
import { dataVersionsForRead } from "./read-versions.server";

/** Reports still in draft are the officer's work in progress and stay off the map and totals. */
const MAPPED_STATUSES = ["filed", "returned", "accepted"];

function filteredEvents(filters: MapFilters, connection: Knex = db): Knex.QueryBuilder {
  const query = connection("events as e")
    .whereIn("e.status", MAPPED_STATUSES)
    .whereNotNull("e.latitude")
    .whereNotNull("e.longitude")
    .where("e.started_at", ">=", filters.startUtc)
    .where("e.started_at", "<", filters.endUtc);
  if (filters.bbox) {
    const [west, south, east, north] = filters.bbox;
    query.whereBetween("e.latitude", [south, north]).whereBetween("e.longitude", [west, east]);
  }
  if (filters.kind) query.where("e.kind", filters.kind);
  if (filters.stationId) query.where("e.station_id", filters.stationId);
  if (filters.foamClass) query.whereRaw(...usedFoamClass("e", filters.foamClass));
  return query;
}

const gallons = (value: unknown) => Math.round(decimalOrZero(value) * 1000) / 1000;
// Five decimals of a degree is about a metre on the ground (common practice, no source): finer than
// a map point or an address needs.
const degrees = (value: unknown) => Math.round(decimalOrZero(value) * 1e5) / 1e5;
const metres = (value: unknown) => {
  const distance = decimalOrNull(value);
  return distance === null ? null : Math.round(distance);
};

export type MapEventProperties = {
  id: number;
  number: string;
  kind: EventKind;
  status: string;
  startedAt: string | null;
  address: string;
  station: string | null;
  foamClass: EventFoamClasses;
  pfasContaining: boolean;
  waterGal: number;
  concentrateGal: number;
  solutionGal: number;
  classAConcentrateGal: number;
  classBConcentrateGal: number;
} & Pick<GeographyChecks, "drainageBasin" | "nearestWaterway" | "nearestWaterwayM" | "withinWaterwayBuffer">;

export type MapEventCollection = {
  type: "FeatureCollection";
  features: {
    type: "Feature";
    geometry: { type: "Point"; coordinates: [number, number] };
    properties: MapEventProperties;
  }[];
};

type MapEventRow = {
  id: number;
  number: string;
  kind: EventKind;
  status: string;
  started_at: Date | string | null;
  address: string;
  latitude: string;
  longitude: string;
  water_gal: string;
  concentrate_gal: string;
  solution_gal: string;
  pfas_containing: number | boolean;
  drainage_basin: string | null;
  nearest_waterway: string | null;
  nearest_waterway_m: string | null;
  within_waterway_buffer: number | boolean | null;
  station_code: string | null;
  class_a_concentrate_gal: string;
  class_b_concentrate_gal: string;
  foam_classes: string;
};

const MAP_EVENT_COLUMNS = [
  "e.id",
  "e.number",
  "e.kind",
  "e.status",
  "e.started_at",
  "e.address",
  "e.latitude",
  "e.longitude",
  "e.water_gal",
  "e.concentrate_gal",
  "e.solution_gal",
  "e.pfas_containing",
  "e.drainage_basin",
  "e.nearest_waterway",
  "e.nearest_waterway_m",
  "e.within_waterway_buffer",
  "s.code as station_code",
  "e.class_a_concentrate_gal",
  "e.class_b_concentrate_gal",
  "e.foam_classes",
];

/** The map's order: by start, the id breaking ties, so the same events always come the same way. */
const inMapOrder = (query: Knex.QueryBuilder) => query.orderBy("e.started_at").orderBy("e.id");

type MapFeature = MapEventCollection["features"][number];

function mapFeature(row: MapEventRow): MapFeature {
  const usesA = row.foam_classes.includes("A");
  const usesB = row.foam_classes.includes("B");
  return {
    type: "Feature",
    geometry: { type: "Point", coordinates: [degrees(row.longitude), degrees(row.latitude)] },
    properties: {
      id: row.id,
      number: row.number,
      kind: row.kind,
      status: row.status,
      startedAt: row.started_at ? new Date(row.started_at).toISOString().replace(".000Z", "Z") : null,
      address: row.address,
      station: row.station_code ?? null,
      foamClass: usesA && usesB ? "A+B" : usesA ? "A" : usesB ? "B" : "none",
      pfasContaining: Boolean(row.pfas_containing),
      waterGal: gallons(row.water_gal),
      concentrateGal: gallons(row.concentrate_gal),
      solutionGal: gallons(row.solution_gal),
      classAConcentrateGal: gallons(row.class_a_concentrate_gal),
      classBConcentrateGal: gallons(row.class_b_concentrate_gal),
      drainageBasin: row.drainage_basin ?? null,
      nearestWaterway: row.nearest_waterway ?? null,
      nearestWaterwayM: metres(row.nearest_waterway_m),
      withinWaterwayBuffer: row.within_waterway_buffer == null ? null : Boolean(row.within_waterway_buffer),
    },
  };
}

/**
 * Every mapped event that matches, as an RFC 7946 FeatureCollection with its totals: the event's id
 * once (`properties.id`; its page is `/events/:id`), coordinates to five decimals, distances to the
 * metre, instants to the second. Read whole, in one query: the reference that the kept pieces of
 * `mapEventPieceTexts` must join to exactly (`tests/integration/map-events-kept.test.ts`).
 */
export async function mapEvents(filters: MapFilters): Promise<MapEventCollection> {
  const rows = await mapEventRowsOf(inMapOrder(filteredEvents(filters)));
  return { type: "FeatureCollection", features: rows.map(mapFeature) };
}

type Totals = { events: number; waterGal: number; concentrateGal: number; solutionGal: number };

export type UsageSummary = {
  from: string;
  to: string;
  bbox: [number, number, number, number] | null;
  units: "US gallons";
  totals: Totals & { pfasEvents: number; pfasConcentrateGal: number };
  byFoamClass: { foamClass: FoamClass; concentrateGal: number; solutionGal: number; events: number }[];
  byProduct: {
    productId: number;
    name: string;
    foamClass: string;
    pfasContaining: boolean;
    concentrateGal: number;
    solutionGal: number;
    events: number;
  }[];
  byDisposition: { disposition: Disposition; solutionGal: number; events: number }[];
  byDrainageBasin: ({ drainageBasin: string | null } & Totals)[];
  byStation: ({ station: string | null; name: string | null } & Totals)[];
  byMonth: { month: string; classAConcentrateGal: number; classBConcentrateGal: number }[];
};

function monthsBetween(from: string, to: string): string[] {
  const months: string[] = [];
  let [year, month] = from.slice(0, 7).split("-").map(Number);
  const last = to.slice(0, 7);
  for (;;) {
    const label = `${year}-${String(month).padStart(2, "0")}`;
    months.push(label);
    if (label >= last || months.length > 36) break;
    month += 1;
    if (month > 12) [year, month] = [year + 1, 1];
  }
  return months;
}

/**
 * SQL giving the index of the agency month an event started in (0 for the first of `months`):
 * the months' first instants are worked out here in the agency's zone, so the database needs no
 * time-zone tables.
 */
function monthIndexSql(months: string[], timeZone: string, column: string): Knex.Raw {
  const starts = months.slice(1).map((month) => startOfLocalDay(`${month}-01`, timeZone));
  if (starts.length === 0) return db.raw("0");
  return db.raw(`CASE ${starts.map(() => `WHEN ${column} < ? THEN ?`).join(" ")} ELSE ? END`, [
    ...starts.flatMap((start, index) => [start, index]),
    starts.length,
  ]);
}

type SqlRow = Record<string, unknown>;

/** The event row's concentrate of one foam class, kept with its lines (`refreshFoamClassTotals`). */
const classConcentrateColumn = (foamClass: FoamClass) =>
  foamClass === "A" ? "e.class_a_concentrate_gal" : "e.class_b_concentrate_gal";

type TotalsRow = {
  events: number | string;
  water_gal: unknown;
  concentrate_gal: unknown;
  solution_gal: unknown;
};

const totalsOf = (row: TotalsRow | SqlRow | undefined): Totals => ({
  events: Number(row?.events ?? 0),
  waterGal: gallons(row?.water_gal),
  concentrateGal: gallons(row?.concentrate_gal),
  solutionGal: gallons(row?.solution_gal),
});

/** Totals for what matches (for the map: what is in view), by foam class, product, runoff, basin, station and month; summed by the database. */
export async function usageSummary(filters: MapFilters, timeZone: string): Promise<UsageSummary> {
  const ids = () => filteredEvents(filters).select("e.id");
  // With a foam-class filter, only that class's concentrate counts: an event that flowed Class A and
  // Class B is shown under "Class B" with its Class B concentrate, not its Class A as well.
  const ofClass = (query: Knex.QueryBuilder) =>
    filters.foamClass ? query.where("p.foam_class", filters.foamClass) : query;
  const events = () => filteredEvents(filters).leftJoin("stations as s", "s.id", "e.station_id");
  const concentrate = filters.foamClass ? classConcentrateColumn(filters.foamClass) : "e.concentrate_gal";
  const sums = [
    db.raw("COUNT(*) AS events"),
    db.raw("SUM(e.water_gal) AS water_gal"),
    db.raw(`SUM(${concentrate}) AS concentrate_gal`),
    db.raw("SUM(e.solution_gal) AS solution_gal"),
  ];
  const months = monthsBetween(filters.from, filters.to);
  const [overall, basins, stations, products, classes, byMonth, dispositions] = (await Promise.all([
    events()
      .select(
        ...sums,
        db.raw("SUM(e.pfas_containing <> 0) AS pfas_events"),
        db.raw(`SUM(CASE WHEN e.pfas_containing <> 0 THEN ${concentrate} ELSE 0 END) AS pfas_concentrate_gal`),
      )
      .first(),
    events()
      .groupBy("e.drainage_basin")
      .select("e.drainage_basin", ...sums),
    events()
      .groupBy("s.code")
      .select("s.code as station_code", db.raw("MIN(s.name) AS station_name"), ...sums),
    ofClass(db("discharges as d").join("foam_products as p", "p.id", "d.product_id"))
      .whereIn("d.event_id", ids())
      .groupBy("p.id", "p.name", "p.foam_class", "p.pfas_containing")
      .orderBy("p.name")
      .select(
        "p.id",
        "p.name",
        "p.foam_class",
        "p.pfas_containing",
        db.raw("SUM(d.concentrate_gal) AS concentrate_gal"),
        db.raw("SUM(d.solution_gal) AS solution_gal"),
        db.raw("COUNT(DISTINCT d.event_id) AS events"),
      ),
    ofClass(db("discharges as d").join("foam_products as p", "p.id", "d.product_id"))
      .whereIn("d.event_id", ids())
      .groupBy("p.foam_class")
      .select(
        "p.foam_class",
        db.raw("SUM(d.concentrate_gal) AS concentrate_gal"),
        db.raw("SUM(d.solution_gal) AS solution_gal"),
        db.raw("COUNT(DISTINCT d.event_id) AS events"),
      ),
    filteredEvents(filters)
      .groupBy("month_index")
      .select(
        db.raw(`${monthIndexSql(months, timeZone, "e.started_at").toQuery()} AS month_index`),
        db.raw(`SUM(${filters.foamClass === "B" ? "0" : "e.class_a_concentrate_gal"}) AS class_a_gal`),
        db.raw(`SUM(${filters.foamClass === "A" ? "0" : "e.class_b_concentrate_gal"}) AS class_b_gal`),
      ),
    db("runoff_dispositions as r")
      .join("events as re", "re.id", "r.event_id")
      .whereIn("r.event_id", ids())
      .groupBy("r.disposition")
      .orderBy("r.disposition")
      .select(
        "r.disposition",
        db.raw(`SUM(${releasedGallonsSql("r", "re")}) AS solution_gal`),
        db.raw("COUNT(DISTINCT r.event_id) AS events"),
      ),
  ])) as [SqlRow | undefined, SqlRow[], SqlRow[], SqlRow[], SqlRow[], SqlRow[], SqlRow[]];

  const monthTotals = months.map(() => ({ a: 0, b: 0 }));
  for (const row of byMonth) {
    const month = monthTotals[Number(row.month_index)];
    if (month) {
      month.a += decimalOrZero(row.class_a_gal);
      month.b += decimalOrZero(row.class_b_gal);
    }
  }
  const byClass = new Map(classes.map((row) => [row.foam_class as string, row]));

  return {
    from: filters.from,
    to: filters.to,
    bbox: filters.bbox,
    units: "US gallons",
    totals: {
      ...totalsOf(overall),
      pfasEvents: Number(overall?.pfas_events ?? 0),
      pfasConcentrateGal: gallons(overall?.pfas_concentrate_gal),
    },
    byFoamClass: FOAM_CLASSES.map((foamClass) => ({
      foamClass,
      concentrateGal: gallons(byClass.get(foamClass)?.concentrate_gal),
      solutionGal: gallons(byClass.get(foamClass)?.solution_gal),
      events: Number(byClass.get(foamClass)?.events ?? 0),
    })),
    byProduct: products.map((row) => ({
      productId: row.id as number,
      name: row.name as string,
      foamClass: row.foam_class as string,
      pfasContaining: Boolean(row.pfas_containing),
      concentrateGal: gallons(row.concentrate_gal),
      solutionGal: gallons(row.solution_gal),
      events: Number(row.events),
    })),
    byDisposition: dispositions.map((row) => ({
      disposition: row.disposition as Disposition,
      solutionGal: gallons(row.solution_gal),
      events: Number(row.events),
    })),
    byDrainageBasin: basins
      .map((row) => ({ drainageBasin: (row.drainage_basin as string | null) ?? null, ...totalsOf(row) }))
      .sort((a, b) => (a.drainageBasin ?? "~").localeCompare(b.drainageBasin ?? "~")),
    byStation: stations
      .map((row) => ({
        station: (row.station_code as string | null) ?? null,
        name: (row.station_name as string | null) ?? null,
        ...totalsOf(row),
      }))
      .sort((a, b) => (a.station ?? "~").localeCompare(b.station ?? "~")),
    byMonth: months.map((month, index) => ({
      month,
      classAConcentrateGal: gallons(monthTotals[index].a),
      classBConcentrateGal: gallons(monthTotals[index].b),
    })),
  };
}

// ---------------------------------------------------------------------------------------------
// Kept answers: the map's events and summaries change only when reports or the catalogue do, so
// each is computed once per filter and data version, on each server, and kept (the events gzipped).

/**
 * What every map read starts from: the data versions (read with the session), and the agency's
 * time zone kept per catalogue version.
 */
export async function mapReadState(request: Request): Promise<{ versions: DataVersions; timeZone: string }> {
  const versions = await dataVersionsForRead(request);
  const { timeZone } = await agencySettingsAt(versions.catalogue);
  return { versions, timeZone };
}

function mapDataVersion({ reports, catalogue }: DataVersions): string | null {
  return reports && catalogue ? `${reports}/${catalogue}` : null;
}

function filtersKey(filters: MapFilters, extra = ""): string {
  return JSON.stringify([
    filters.startUtc.toISOString(),
    filters.endUtc.toISOString(),
    filters.from,
    filters.to,
    filters.bbox,
    filters.foamClass,
    filters.kind,
    filters.stationId,
    extra,
  ]);
}

export type MapEventsBody = { etag: string | null; gzipped: Buffer };

// Compressed pieces of the map's events, kept by content across filters and versions: after a
// report changes, only the pieces that hold changed events (and the pieces after them) are
// compressed again. So few are compressed at a time that the slowest, smallest level is worth it.
// The budget holds the texts too: a year of 20,000 events is about 10 MB of text, 0.65 MB gzipped.
const mapEventPieces = new PiecewiseGzip(64 * 1024 * 1024, 9);

/** Whether a piece of the map's events ends after this event: about one in 64, by a hash of its id. */
const endsPiece = (id: number) => Math.imul(id, 0x9e3779b1) >>> 26 === 0;

/**
 * Items cut into pieces, each ending after an item whose id is a boundary (`endsPiece`), not after a
 * count, so an event added or removed changes only its own piece, wherever it sorts.
 */
export function cutIntoPieces<T>(items: readonly T[], idOf: (item: T) => number): T[][] {
  const pieces: T[][] = [];
  let piece: T[] = [];
  for (const item of items) {
    piece.push(item);
    if (endsPiece(idOf(item))) {
      pieces.push(piece);
      piece = [];
    }
  }
  if (piece.length) pieces.push(piece);
  return pieces;
}

/** The GeoJSON text of a piece's features inside the collection's array (a comma first, but for the first piece). */
export function pieceText(features: readonly MapFeature[], first: boolean): string {
  // One JSON.stringify per piece, its brackets dropped: much quicker than one per feature.
  return (first ? "" : ",") + JSON.stringify(features).slice(1, -1);
}

const COLLECTION_HEAD = '{"type":"FeatureCollection","features":[';
const COLLECTION_TAIL = "]}";

// Each piece's text, kept by what it was written from: the catalogue's stamp (station codes), whether
// it comes first, and each of its events' id and row stamp, which a trigger raises on every change
// of the row (decision 181). A new reports version then writes only the pieces whose events changed.
// Bounded by the length of the texts and their keys, the least recently used out first.
const keptPieceTexts = new LRUCache<string, string>({
  maxSize: 48 * 1024 * 1024,
  sizeCalculation: (text, key) => text.length + key.length,
});
let pieceTextsWritten = 0;

/** How many piece texts this process has written (not found kept), for tests and benchmarks. */
export const mapPieceTextsWritten = () => pieceTextsWritten;

/**
 * The map's events as GeoJSON text in pieces, joined: exactly `JSON.stringify(await mapEvents(filters))`.
 * The stamps and the rows are read in one transaction, so they are one snapshot of the data.
 */
export async function mapEventPieceTexts(filters: MapFilters, catalogue: string | null): Promise<string[]> {
  return db.transaction(async (trx) => {
    const stamps: { id: number; row_stamp: number | string }[] = await inMapOrder(filteredEvents(filters, trx)).select(
      "e.id",
      "e.row_stamp",
    );
    const groups = cutIntoPieces(stamps, (row) => row.id);
    const keys = groups.map(
      (group, index) =>
        `${catalogue} ${index === 0 ? "first" : "next"} ${group.map((row) => `${row.id}.${row.row_stamp}`).join(",")}`,
    );
    const texts = keys.map((key) => (catalogue === null ? undefined : keptPieceTexts.get(key)));
    const missing = groups.flatMap((group, index) => (texts[index] === undefined ? group.map((row) => row.id) : []));
    if (missing.length) {
      // Most pieces missing (a first request, a catalogue change): one pass over the filter is quicker.
      const rows: MapEventRow[] =
        missing.length > stamps.length / 2
          ? await mapEventRowsOf(filteredEvents(filters, trx))
          : (
              await Promise.all(
                chunks(missing, 1000).map((ids) => mapEventRowsOf(trx("events as e").whereIn("e.id", ids))),
              )
            ).flat();
      const byId = new Map(rows.map((row) => [row.id, row]));
      groups.forEach((group, index) => {
        if (texts[index] !== undefined) return;
        const text = pieceText(
          group.map((row) => mapFeature(byId.get(row.id)!)),
          index === 0,
        );
        texts[index] = text;
        pieceTextsWritten += 1;
        if (catalogue !== null) keptPieceTexts.set(keys[index], text);
      });
    }
    return [COLLECTION_HEAD, ...(texts as string[]), COLLECTION_TAIL];
  });
}

function mapEventRowsOf(query: Knex.QueryBuilder): Promise<MapEventRow[]> {
  return query.leftJoin("stations as s", "s.id", "e.station_id").select(...MAP_EVENT_COLUMNS);
}

function chunks<T>(items: readonly T[], size: number): T[][] {
  return Array.from({ length: Math.ceil(items.length / size) }, (_, index) =>
    items.slice(index * size, (index + 1) * size),
  );
}

const keptMapEvents = new VersionedCache<MapEventsBody>(24);

/**
 * The map's events for these filters as gzipped GeoJSON with its entity tag, computed once per
 * filter and data version. The tag names the version and the filters, so a browser that sends it
 * back gets `304` until a report or the catalogue changes.
 */
export async function mapEventsBody(filters: MapFilters, versions: DataVersions): Promise<MapEventsBody> {
  const version = mapDataVersion(versions);
  const key = filtersKey(filters);
  return keptMapEvents.get(key, version, async () => {
    const gzipped = await mapEventPieces.gzip(await mapEventPieceTexts(filters, versions.catalogue));
    const tag = createHash("sha256")
      .update(`${version ?? "unversioned"} ${key}`)
      .digest("base64url")
      .slice(0, 27);
    return { etag: version ? `"${tag}"` : null, gzipped };
  });
}

const keptSummaries = new VersionedCache<UsageSummary>(100);

/** `usageSummary`, computed once per filter, time zone and data version. */
export async function usageSummaryKept(
  filters: MapFilters,
  timeZone: string,
  versions: DataVersions,
): Promise<UsageSummary> {
  const version = mapDataVersion(versions);
  return keptSummaries.get(filtersKey(filters, timeZone), version, () => usageSummary(filters, timeZone));
}

export async function listStations(): Promise<{ id: number; code: string; name: string }[]> {
  return db("stations").where({ active: true }).orderBy("code").select("id", "code", "name");
}
