import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import type { MapFilters } from "~/lib/geo/map-filters";
import { usageSummary, type UsageSummary } from "~/models/usage-map.server";
import { makeUser } from "../support/factories";
import { ensureAgency, makeEvent, makeProduct, makeStation } from "../support/usage-fixtures";

// The map's summary is summed by the database. This checks it against the straightforward way —
// load every matching event and discharge and add them up in JavaScript — over a year of varied
// events (three stations and none, both foam classes, PFAS foam, basins, every kind and status, and
// events either side of the agency's month boundaries), with and without each filter. The year
// (2041) is one no other test uses.
const TIME_ZONE = "America/Chicago";
const knex = db;

beforeAll(async () => {
  await ensureAgency(db);
  const officer = await makeUser(["officer"], "Summary Check Officer");
  const stations = [(await makeStation()).id, (await makeStation()).id, (await makeStation()).id, null];
  const classA = (await makeProduct({ foamClass: "A" })).id;
  const classB = (await makeProduct({ foamClass: "B" })).id;
  const legacy = (await makeProduct({ foamClass: "B", pfasContaining: true })).id;
  const kinds = ["incident", "training", "test", "flush"] as const;
  const statuses = ["accepted", "accepted", "filed", "returned", "draft"] as const;
  const basins = ["Mill Creek", "South Fork", null];
  let seed = 7;
  const random = () => {
    seed = (seed * 16807) % 2147483647;
    return seed / 2147483647;
  };
  for (let index = 0; index < 90; index += 1) {
    // Every tenth event falls in the first hours of a UTC month, which is still the month before in Chicago.
    const month = index % 12;
    const startedAt =
      index % 10 === 0
        ? new Date(Date.UTC(2041, month, 1, 3, 30))
        : new Date(Date.UTC(2041, month, 1 + Math.floor(random() * 27), Math.floor(random() * 24)));
    const product = [classA, classB, legacy][index % 3];
    const discharges = [
      {
        productId: product,
        percent: product === classA ? 0.5 : 3,
        water: 100 + Math.round(random() * 900) / 10,
        concentrate: Math.round(random() * 9000) / 1000,
      },
    ];
    if (index % 4 === 0) discharges.push({ productId: classA, percent: 0.3, water: 250.125, concentrate: 0.751 });
    const event = await makeEvent({
      createdBy: officer.id,
      kind: kinds[index % 4],
      status: statuses[index % 5],
      startedAt,
      stationId: stations[index % 4],
      drainageBasin: basins[index % 3],
      pfasContaining: product === legacy,
      discharges,
      dispositions: [{ disposition: index % 2 ? "storm_drain" : "contained", sharePercent: 100 }],
    });
    await db("events")
      .where({ id: event.id })
      .update({ latitude: 38.6 + random() * 0.2, longitude: -98.3 + random() * 0.2 });
  }
});

const gallons = (value: number) => Math.round(value * 1000) / 1000;
const num = (value: unknown) => (value == null ? 0 : Number(value));

/** The summary's totals, basins, stations, classes and months, added up in JavaScript from every row. */
async function summedInJavaScript(filters: MapFilters) {
  const events = knex("events as e")
    .leftJoin("stations as s", "s.id", "e.station_id")
    .whereIn("e.status", ["filed", "returned", "accepted"])
    .whereNotNull("e.latitude")
    .whereNotNull("e.longitude")
    .where("e.started_at", ">=", filters.startUtc)
    .where("e.started_at", "<", filters.endUtc);
  if (filters.bbox) {
    const [west, south, east, north] = filters.bbox;
    events.whereBetween("e.latitude", [south, north]).whereBetween("e.longitude", [west, east]);
  }
  if (filters.kind) events.where("e.kind", filters.kind);
  const rows: Record<string, unknown>[] = await events.select(
    "e.id",
    "e.started_at",
    "e.water_gal",
    "e.concentrate_gal",
    "e.solution_gal",
    "e.pfas_containing",
    "e.drainage_basin",
    "s.code as station_code",
  );
  const lines: Record<string, unknown>[] = await knex("discharges as d")
    .join("foam_products as p", "p.id", "d.product_id")
    .whereIn(
      "d.event_id",
      rows.map((row) => row.id as number),
    )
    .select("d.event_id", "d.concentrate_gal", "d.solution_gal", "p.foam_class");
  const ofClass = lines.filter((line) => !filters.foamClass || line.foam_class === filters.foamClass);
  const classConcentrate = new Map<number, number>();
  for (const line of ofClass) {
    const id = line.event_id as number;
    classConcentrate.set(id, (classConcentrate.get(id) ?? 0) + num(line.concentrate_gal));
  }
  const counted = filters.foamClass ? rows.filter((row) => classConcentrate.has(row.id as number)) : rows;
  const concentrateOf = (row: Record<string, unknown>) =>
    filters.foamClass ? (classConcentrate.get(row.id as number) ?? 0) : num(row.concentrate_gal);
  const add = (totals: Map<string, number[]>, key: string, row: Record<string, unknown>) => {
    const sum = totals.get(key) ?? [0, 0, 0, 0];
    sum[0] += 1;
    sum[1] += num(row.water_gal);
    sum[2] += concentrateOf(row);
    sum[3] += num(row.solution_gal);
    totals.set(key, sum);
  };
  const overall = new Map<string, number[]>();
  const basins = new Map<string, number[]>();
  const stations = new Map<string, number[]>();
  let pfasEvents = 0;
  let pfasConcentrate = 0;
  for (const row of counted) {
    add(overall, "all", row);
    add(basins, String(row.drainage_basin ?? "none"), row);
    add(stations, String(row.station_code ?? "none"), row);
    if (row.pfas_containing) {
      pfasEvents += 1;
      pfasConcentrate += concentrateOf(row);
    }
  }
  const month = new Intl.DateTimeFormat("en-CA", { timeZone: TIME_ZONE, year: "numeric", month: "2-digit" });
  const startedAt = new Map(counted.map((row) => [row.id as number, new Date(row.started_at as Date)]));
  const months = new Map<string, { a: number; b: number }>();
  const classes = new Map<string, { concentrate: number; solution: number; events: Set<number> }>();
  for (const line of ofClass) {
    const label = month.format(startedAt.get(line.event_id as number)!).slice(0, 7);
    const entry = months.get(label) ?? { a: 0, b: 0 };
    entry[line.foam_class === "A" ? "a" : "b"] += num(line.concentrate_gal);
    months.set(label, entry);
    const byClass = classes.get(line.foam_class as string) ?? { concentrate: 0, solution: 0, events: new Set() };
    byClass.concentrate += num(line.concentrate_gal);
    byClass.solution += num(line.solution_gal);
    byClass.events.add(line.event_id as number);
    classes.set(line.foam_class as string, byClass);
  }
  const rounded = (sum: number[] | undefined) => ({
    events: sum?.[0] ?? 0,
    waterGal: gallons(sum?.[1] ?? 0),
    concentrateGal: gallons(sum?.[2] ?? 0),
    solutionGal: gallons(sum?.[3] ?? 0),
  });
  return {
    totals: { ...rounded(overall.get("all")), pfasEvents, pfasConcentrateGal: gallons(pfasConcentrate) },
    basins: Object.fromEntries([...basins].map(([key, sum]) => [key, rounded(sum)])),
    stations: Object.fromEntries([...stations].map(([key, sum]) => [key, rounded(sum)])),
    classes: Object.fromEntries(
      [...classes].map(([key, value]) => [
        key,
        { concentrateGal: gallons(value.concentrate), solutionGal: gallons(value.solution), events: value.events.size },
      ]),
    ),
    months: Object.fromEntries([...months].map(([key, value]) => [key, { a: gallons(value.a), b: gallons(value.b) }])),
  };
}

function asCompared(summary: UsageSummary) {
  const totalsOf = (row: { events: number; waterGal: number; concentrateGal: number; solutionGal: number }) => ({
    events: row.events,
    waterGal: row.waterGal,
    concentrateGal: row.concentrateGal,
    solutionGal: row.solutionGal,
  });
  return {
    totals: summary.totals,
    basins: Object.fromEntries(summary.byDrainageBasin.map((row) => [row.drainageBasin ?? "none", totalsOf(row)])),
    stations: Object.fromEntries(summary.byStation.map((row) => [row.station ?? "none", totalsOf(row)])),
    classes: Object.fromEntries(
      summary.byFoamClass
        .filter((row) => row.events > 0)
        .map((row) => [
          row.foamClass,
          { concentrateGal: row.concentrateGal, solutionGal: row.solutionGal, events: row.events },
        ]),
    ),
    months: Object.fromEntries(
      summary.byMonth
        .filter((row) => row.classAConcentrateGal > 0 || row.classBConcentrateGal > 0)
        .map((row) => [row.month, { a: row.classAConcentrateGal, b: row.classBConcentrateGal }]),
    ),
  };
}

function filters(overrides: Partial<MapFilters> = {}): MapFilters {
  return {
    from: "2041-01-01",
    to: "2041-12-31",
    startUtc: new Date("2041-01-01T06:00:00Z"),
    endUtc: new Date("2042-01-01T06:00:00Z"),
    bbox: null,
    foamClass: null,
    kind: null,
    stationId: null,
    ...overrides,
  };
}

describe("the map summary, summed by the database", () => {
  const cases: [string, Partial<MapFilters>][] = [
    ["the seed's whole year", {}],
    ["Class A only", { foamClass: "A" }],
    ["Class B only", { foamClass: "B" }],
    ["training only", { kind: "training" }],
    ["the western half", { bbox: [-98.3, 38.6, -98.2, 38.8] }],
    [
      "one spring quarter",
      {
        from: "2041-03-01",
        to: "2041-05-31",
        startUtc: new Date("2041-03-01T06:00:00Z"),
        endUtc: new Date("2041-06-01T05:00:00Z"),
      },
    ],
  ];
  for (const [label, overrides] of cases) {
    it(`equals the sums added up row by row: ${label}`, async () => {
      const chosen = filters(overrides);
      const expected = await summedInJavaScript(chosen);
      const summary = await usageSummary(chosen, TIME_ZONE);
      expect(expected.totals.events).toBeGreaterThan(0);
      expect(asCompared(summary)).toEqual(expected);
    });
  }
});
