import type { Knex } from "knex";
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
import { dischargedFoamClass } from "./catalogue.server";

/** Reports still in draft are the officer's work in progress and stay off the map and totals. */
const MAPPED_STATUSES = ["filed", "returned", "accepted"];

function filteredEvents(filters: MapFilters): Knex.QueryBuilder {
  const query = db("events as e")
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
  if (filters.foamClass) query.whereExists(dischargedFoamClass("e.id", filters.foamClass));
  return query;
}

const gallons = (value: unknown) => Math.round(decimalOrZero(value) * 1000) / 1000;

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
  url: string;
} & Pick<GeographyChecks, "drainageBasin" | "nearestWaterway" | "nearestWaterwayM" | "withinWaterwayBuffer">;

export type MapEventCollection = {
  type: "FeatureCollection";
  features: {
    type: "Feature";
    id: number;
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
  class_a_gal: string | null;
  class_b_gal: string | null;
  uses_a: number | string | null;
  uses_b: number | string | null;
};

/** Every mapped event that matches, as an RFC 7946 FeatureCollection with its totals. */
export async function mapEvents(filters: MapFilters): Promise<MapEventCollection> {
  const rows: MapEventRow[] = await filteredEvents(filters)
    .leftJoin("stations as s", "s.id", "e.station_id")
    .leftJoin(
      db("discharges as d")
        .join("foam_products as p", "p.id", "d.product_id")
        .groupBy("d.event_id")
        .select(
          "d.event_id",
          db.raw("SUM(CASE WHEN p.foam_class = 'A' THEN d.concentrate_gal ELSE 0 END) AS class_a_gal"),
          db.raw("SUM(CASE WHEN p.foam_class = 'B' THEN d.concentrate_gal ELSE 0 END) AS class_b_gal"),
          db.raw("MAX(p.foam_class = 'A') AS uses_a"),
          db.raw("MAX(p.foam_class = 'B') AS uses_b"),
        )
        .as("c"),
      "c.event_id",
      "e.id",
    )
    .orderBy("e.started_at")
    .select(
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
      "c.class_a_gal",
      "c.class_b_gal",
      "c.uses_a",
      "c.uses_b",
    );
  return {
    type: "FeatureCollection",
    features: rows.map((row) => {
      const usesA = Number(row.uses_a) === 1;
      const usesB = Number(row.uses_b) === 1;
      return {
        type: "Feature",
        id: row.id,
        geometry: { type: "Point", coordinates: [decimalOrZero(row.longitude), decimalOrZero(row.latitude)] },
        properties: {
          id: row.id,
          number: row.number,
          kind: row.kind,
          status: row.status,
          startedAt: row.started_at ? new Date(row.started_at).toISOString() : null,
          address: row.address,
          station: row.station_code ?? null,
          foamClass: usesA && usesB ? "A+B" : usesA ? "A" : usesB ? "B" : "none",
          pfasContaining: Boolean(row.pfas_containing),
          waterGal: gallons(row.water_gal),
          concentrateGal: gallons(row.concentrate_gal),
          solutionGal: gallons(row.solution_gal),
          classAConcentrateGal: gallons(row.class_a_gal),
          classBConcentrateGal: gallons(row.class_b_gal),
          drainageBasin: row.drainage_basin ?? null,
          nearestWaterway: row.nearest_waterway ?? null,
          nearestWaterwayM: decimalOrNull(row.nearest_waterway_m),
          withinWaterwayBuffer: row.within_waterway_buffer == null ? null : Boolean(row.within_waterway_buffer),
          url: `/events/${row.id}`,
        },
      };
    }),
  };
}

type Totals = { events: number; waterGal: number; concentrateGal: number; solutionGal: number };
const zero = (): Totals => ({ events: 0, waterGal: 0, concentrateGal: 0, solutionGal: 0 });

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

function monthIn(timeZone: string) {
  const format = new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit" });
  return (instant: Date) => format.format(instant).slice(0, 7);
}

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

const add = (target: Totals, row: { water_gal: unknown; concentrate_gal: unknown; solution_gal: unknown }) => {
  target.events += 1;
  target.waterGal += decimalOrZero(row.water_gal);
  target.concentrateGal += decimalOrZero(row.concentrate_gal);
  target.solutionGal += decimalOrZero(row.solution_gal);
};
const rounded = <T extends Totals>(totals: T): T => ({
  ...totals,
  waterGal: gallons(totals.waterGal),
  concentrateGal: gallons(totals.concentrateGal),
  solutionGal: gallons(totals.solutionGal),
});

/** Totals for what matches (for the map: what is in view), by foam class, product, runoff, basin, station and month. */
export async function usageSummary(filters: MapFilters, timeZone: string): Promise<UsageSummary> {
  const events = await filteredEvents(filters)
    .leftJoin("stations as s", "s.id", "e.station_id")
    .select(
      "e.id",
      "e.started_at",
      "e.water_gal",
      "e.concentrate_gal",
      "e.solution_gal",
      "e.pfas_containing",
      "e.drainage_basin",
      "s.code as station_code",
      "s.name as station_name",
    );
  const ids = filteredEvents(filters).select("e.id");
  // With a foam-class filter, only that class's concentrate counts: an event that flowed Class A and
  // Class B is shown under "Class B" with its Class B concentrate, not its Class A as well.
  const ofClass = (query: Knex.QueryBuilder) =>
    filters.foamClass ? query.where("p.foam_class", filters.foamClass) : query;
  const [products, classByEvent, dispositions] = await Promise.all([
    ofClass(db("discharges as d").join("foam_products as p", "p.id", "d.product_id"))
      .whereIn("d.event_id", ids)
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
      .whereIn("d.event_id", ids)
      .groupBy("d.event_id", "p.foam_class")
      .select("d.event_id", "p.foam_class", db.raw("SUM(d.concentrate_gal) AS concentrate_gal")),
    db("runoff_dispositions as r")
      .join("events as re", "re.id", "r.event_id")
      .whereIn("r.event_id", ids)
      .groupBy("r.disposition")
      .orderBy("r.disposition")
      .select(
        "r.disposition",
        db.raw(`SUM(${releasedGallonsSql("r", "re")}) AS solution_gal`),
        db.raw("COUNT(DISTINCT r.event_id) AS events"),
      ),
  ]);

  const totals = { ...zero(), pfasEvents: 0, pfasConcentrateGal: 0 };
  const basins = new Map<string | null, Totals>();
  const stations = new Map<string | null, Totals & { name: string | null }>();
  const startedAt = new Map<number, Date | null>();
  const classConcentrate = new Map<number, number>();
  for (const row of classByEvent) {
    classConcentrate.set(row.event_id, (classConcentrate.get(row.event_id) ?? 0) + decimalOrZero(row.concentrate_gal));
  }
  for (const stored of events) {
    const row = filters.foamClass ? { ...stored, concentrate_gal: classConcentrate.get(stored.id) ?? 0 } : stored;
    add(totals, row);
    if (row.pfas_containing) {
      totals.pfasEvents += 1;
      totals.pfasConcentrateGal += decimalOrZero(row.concentrate_gal);
    }
    const basin = basins.get(row.drainage_basin ?? null) ?? zero();
    add(basin, row);
    basins.set(row.drainage_basin ?? null, basin);
    const station = stations.get(row.station_code ?? null) ?? { ...zero(), name: row.station_name ?? null };
    add(station, row);
    stations.set(row.station_code ?? null, station);
    startedAt.set(row.id, row.started_at ? new Date(row.started_at) : null);
  }

  const toMonth = monthIn(timeZone);
  const months = new Map(monthsBetween(filters.from, filters.to).map((month) => [month, { a: 0, b: 0 }]));
  const classes = new Map<string, { concentrateGal: number; events: Set<number> }>();
  for (const row of classByEvent) {
    const when = startedAt.get(row.event_id);
    const entry = classes.get(row.foam_class) ?? { concentrateGal: 0, events: new Set<number>() };
    entry.concentrateGal += decimalOrZero(row.concentrate_gal);
    entry.events.add(row.event_id);
    classes.set(row.foam_class, entry);
    if (!when) continue;
    const month = months.get(toMonth(when));
    if (month) month[row.foam_class === "A" ? "a" : "b"] += decimalOrZero(row.concentrate_gal);
  }
  const solutionByClass = new Map<string, number>();
  for (const row of products) {
    solutionByClass.set(row.foam_class, (solutionByClass.get(row.foam_class) ?? 0) + decimalOrZero(row.solution_gal));
  }

  return {
    from: filters.from,
    to: filters.to,
    bbox: filters.bbox,
    units: "US gallons",
    totals: { ...rounded(totals), pfasConcentrateGal: gallons(totals.pfasConcentrateGal) },
    byFoamClass: FOAM_CLASSES.map((foamClass) => ({
      foamClass,
      concentrateGal: gallons(classes.get(foamClass)?.concentrateGal ?? 0),
      solutionGal: gallons(solutionByClass.get(foamClass) ?? 0),
      events: classes.get(foamClass)?.events.size ?? 0,
    })),
    byProduct: products.map((row) => ({
      productId: row.id,
      name: row.name,
      foamClass: row.foam_class,
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
    byDrainageBasin: [...basins.entries()]
      .map(([drainageBasin, value]) => ({ drainageBasin, ...rounded(value) }))
      .sort((a, b) => (a.drainageBasin ?? "~").localeCompare(b.drainageBasin ?? "~")),
    byStation: [...stations.entries()]
      .map(([station, value]) => ({ station, ...rounded(value) }))
      .sort((a, b) => (a.station ?? "~").localeCompare(b.station ?? "~")),
    byMonth: [...months.entries()].map(([month, value]) => ({
      month,
      classAConcentrateGal: gallons(value.a),
      classBConcentrateGal: gallons(value.b),
    })),
  };
}

export async function listStations(): Promise<{ id: number; code: string; name: string }[]> {
  return db("stations").where({ active: true }).orderBy("code").select("id", "code", "name");
}
