import { DEFAULT_EVENT_NUMBER_PREFIX, eventNumberSeries, formatEventNumber } from "../app/lib/foam/event-number";
import type { Knex } from "knex";
import type { EventKind, EventStatus, IncidentType } from "../app/lib/foam/vocabulary";
import type { ReportDischarge, ReportRunoff, ReportTankReading } from "../app/models/report-rows.server";
import {
  insertEvent,
  loadCatalogueFacts,
  seededRandom,
  type EventSpec,
  type SeededRandom,
} from "../app/models/usage-builders.server";

// Demo data only: about a year (December 2025 – November 2026) of invented events in the invented
// Alder Bend Fire District. Every stored volume is computed with the server's own arithmetic.

export type DemoIds = {
  stations: Record<"S1" | "S2" | "S3", number>;
  apparatus: Record<"E1" | "E2" | "E3" | "BR3" | "FT1", number>;
  products: { classA: number; f3: number; legacy: number };
  officers: number[];
  reviewer: number;
};

/** The district's bounds, for synthetic locations (lon -98.32..-98.08, lat 38.60..38.80). */
export const DISTRICT_BOUNDS = { west: -98.32, east: -98.08, south: 38.6, north: 38.8 };

const STATION_POINTS = { S1: [38.7, -98.2], S2: [38.735, -98.15], S3: [38.655, -98.245] } as const;

const STREETS = [
  "Cottonwood Ave",
  "Mill Rd",
  "Prairie Ln",
  "Elm St",
  "S Fork Rd",
  "County Road 12",
  "Willow Dr",
  "Sunflower St",
  "Depot St",
  "Grain Elevator Rd",
  "Bluestem Ct",
  "Harvest Way",
  "Old Highway 4",
  "Creekside Dr",
];

function place(random: SeededRandom) {
  const latitude = Number(random.between(DISTRICT_BOUNDS.south + 0.01, DISTRICT_BOUNDS.north - 0.01).toFixed(6));
  const longitude = Number(random.between(DISTRICT_BOUNDS.west + 0.01, DISTRICT_BOUNDS.east - 0.01).toFixed(6));
  const address = `${random.int(1, 48) * 50} ${random.pick(STREETS)}, Alder Bend`;
  return { latitude, longitude, address };
}

export function nearestStation(latitude: number, longitude: number): "S1" | "S2" | "S3" {
  let best: "S1" | "S2" | "S3" = "S1";
  let bestDistance = Infinity;
  for (const [code, [lat, lon]] of Object.entries(STATION_POINTS) as Array<["S1" | "S2" | "S3", readonly number[]]>) {
    const distance = (lat - latitude) ** 2 + ((lon - longitude) * Math.cos((latitude * Math.PI) / 180)) ** 2;
    if (distance < bestDistance) {
      best = code;
      bestDistance = distance;
    }
  }
  return best;
}

const addMinutes = (date: Date, minutes: number) => new Date(date.getTime() + minutes * 60_000);
const roundTo = (value: number, places: number) => Number(value.toFixed(places));

type Review = Pick<EventSpec, "status" | "filedBy" | "filedAt" | "reviewedBy" | "reviewedAt" | "reviewComment">;

function reviewOf(status: EventStatus, author: number, cleared: Date, reviewer: number, random: SeededRandom): Review {
  if (status === "draft") return { status };
  const filedAt = addMinutes(cleared, random.int(45, 600));
  if (status === "filed") return { status, filedBy: author, filedAt };
  const reviewedAt = addMinutes(filedAt, random.int(600, 4000));
  if (status === "returned") {
    return {
      status,
      filedBy: author,
      filedAt,
      reviewedBy: reviewer,
      reviewedAt,
      reviewComment: random.pick([
        "Where did the runoff go? Please add the dispositions.",
        "The flow on line 1 looks like a nozzle rating: check the flow basis.",
        "Please add the tank refill so we can compare the drawdown.",
      ]),
    };
  }
  return { status, filedBy: author, filedAt, reviewedBy: reviewer, reviewedAt };
}

function sharesOf(random: SeededRandom, kinds: ReportRunoff["disposition"][]): ReportRunoff[] {
  if (kinds.length === 1) return [{ disposition: kinds[0], sharePercent: 100 }];
  let left = 100;
  return kinds.map((disposition, index) => {
    const share = index === kinds.length - 1 ? left : random.int(1, Math.max(1, left - (kinds.length - index - 1) * 5));
    left -= share;
    return { disposition, sharePercent: share };
  });
}

export type RoutineContext = { ids: DemoIds; start: Date; reviewer: number; status: EventStatus };

/**
 * One ordinary event of the given kind: a structure, vehicle or grass fire, or a training evolution,
 * with realistic flows, durations and percentages for the district's apparatus.
 */
export function routineEvent(
  random: SeededRandom,
  number: string,
  kind: EventKind,
  context: RoutineContext,
): EventSpec {
  const { ids, start } = context;
  const author = random.pick(ids.officers);
  const where = place(random);
  const station = nearestStation(where.latitude, where.longitude);
  const discharges: ReportDischarge[] = [];
  let narrative: string;
  let dispositions: ReportRunoff[];
  let minutesOnScene = random.int(35, 150);
  let incidentType: IncidentType = "training";
  const engine = station === "S2" ? "E2" : station === "S3" ? "E3" : "E1";
  const cafsEngine = station === "S2" ? "E2" : "E1";

  if (kind === "training") {
    const unit = random.pick([cafsEngine, cafsEngine, "BR3"] as const);
    const minutes = random.int(4, 15);
    const percent = unit === "BR3" ? random.pick([0.1, 0.2, 0.3]) : 0.3;
    const flow = unit === "BR3" ? random.int(15, 40) : random.pick([80, 90, 100, 120]);
    const lpm = random.chance(0.15);
    discharges.push({
      apparatusId: ids.apparatus[unit],
      outlet: unit === "BR3" ? "Hose reel" : "Crosslay 1",
      productId: ids.products.classA,
      percent,
      flow: lpm ? roundTo(flow * 3.785411784, 0) : flow,
      flowUnit: lpm ? "lpm" : "gpm",
      basis: "water",
      minutes,
      method: unit === "BR3" ? "wetting" : "compressed_air",
      airFlowCfm: unit === "BR3" ? null : random.pick([40, 50, 60]),
    });
    narrative = random.pick([
      "Company drill: compressed-air foam hose handling on the training pad (demo).",
      "Recruit evolution: foam line advance on a burn prop (demo).",
      "Wildland drill: mop-up with wetting solution on the practice plot (demo).",
    ]);
    Object.assign(where, { address: `Training grounds behind Station ${station}, Alder Bend` });
    dispositions = sharesOf(
      random,
      random.pick([["soil"], ["contained"], ["soil", "evaporated_unknown"]] as const).slice(),
    );
    minutesOnScene = minutes + random.int(30, 90);
  } else {
    const type = random.pick(["structure", "structure", "vehicle", "grass", "dumpster"] as const);
    incidentType = (
      { structure: "structure_fire", vehicle: "vehicle_fire", grass: "wildland", dumpster: "other" } as const
    )[type];
    if (type === "structure") {
      const lines = random.int(1, 2);
      for (let line = 0; line < lines; line++) {
        discharges.push({
          apparatusId: ids.apparatus[cafsEngine],
          outlet: line === 0 ? "Crosslay 1" : cafsEngine === "E1" ? "Crosslay 2" : "Front bumper line",
          productId: ids.products.classA,
          percent: random.pick([0.3, 0.3, 0.3, 0.5]),
          flow: random.pick([60, 80, 100, 120]),
          basis: "water",
          minutes: random.int(6, 25),
          method: "compressed_air",
          airFlowCfm: random.pick([50, 60, 75]),
        });
      }
      narrative = "Residential structure fire; interior attack with compressed-air foam (demo).";
      dispositions = sharesOf(random, ["soil", "storm_drain", "evaporated_unknown"]);
    } else if (type === "vehicle") {
      const classB = engine === "E3";
      discharges.push({
        apparatusId: ids.apparatus[engine],
        outlet: "Crosslay 1",
        productId: classB ? ids.products.f3 : ids.products.classA,
        percent: classB ? 3 : 0.5,
        flow: classB ? 150 : random.pick([60, 95, 125]),
        basis: "water",
        minutes: classB ? random.int(2, 5) : random.int(3, 10),
        method: classB ? "aspirated" : "compressed_air",
      });
      narrative = classB
        ? "Pickup fire with a leaking fuel tank; fluorine-free Class B blanket on the fuel (demo)."
        : "Passenger vehicle fire on the roadway (demo).";
      dispositions = sharesOf(random, ["storm_drain", "soil"]);
    } else if (type === "grass") {
      discharges.push({
        apparatusId: ids.apparatus.BR3,
        outlet: "Hose reel",
        productId: ids.products.classA,
        percent: random.pick([0.1, 0.2, 0.3]),
        flow: random.int(15, 35),
        basis: "water",
        minutes: random.int(15, 45),
        method: "wetting",
      });
      narrative = "Grass fire along a fence line; wetting solution for mop-up (demo).";
      dispositions = sharesOf(random, ["soil", "evaporated_unknown"]);
      minutesOnScene += 40;
    } else {
      discharges.push({
        apparatusId: ids.apparatus[engine],
        outlet: engine === "E3" ? "Crosslay 2" : "Booster reel",
        productId: engine === "E3" ? null : ids.products.classA,
        percent: engine === "E3" ? null : 0.3,
        flow: engine === "E3" ? 150 : random.int(20, 40),
        basis: "water",
        minutes: random.int(3, 8),
        method: engine === "E3" ? "non_aspirated" : "wetting",
      });
      narrative = "Trash container fire behind a business (demo).";
      dispositions = sharesOf(random, ["storm_drain"]);
    }
  }

  const cleared = addMinutes(start, minutesOnScene);
  return {
    number,
    kind,
    incidentType,
    ...reviewOf(context.status, author, cleared, context.reviewer, random),
    startedAt: start,
    clearedAt: cleared,
    ...where,
    stationId: ids.stations[station],
    narrative,
    createdBy: author,
    discharges,
    dispositions,
  };
}

const at = (iso: string) => new Date(iso);

/** The hand-written events that the map, the charts and the quarterly reports should always show. */
function notableEvents(ids: DemoIds, random: SeededRandom): EventSpec[] {
  const [officer, officer2] = ids.officers;
  const reviewer = ids.reviewer;
  const accepted = (author: number, cleared: Date) => reviewOf("accepted", author, cleared, reviewer, random);
  return [
    {
      number: "",
      kind: "incident",
      incidentType: "flammable_liquid_spill",
      startedAt: at("2025-12-09T20:14:00Z"),
      clearedAt: at("2025-12-09T23:40:00Z"),
      ...accepted(officer2, at("2025-12-09T23:40:00Z")),
      address: "Old Highway 4 at Depot St, Alder Bend",
      latitude: 38.6985,
      longitude: -98.1895,
      stationId: ids.stations.S1,
      narrative:
        "Fuel tanker rollover with a gasoline spill. The legacy AR-AFFF still carried on Foam Tender 1 was used on the spill; " +
        "runoff reached the storm drain on Depot St before it could be diked. The state spill line was called and the " +
        "remaining legacy stock was pulled from service and is held for disposal (demo).",
      createdBy: officer2,
      discharges: [
        {
          apparatusId: ids.apparatus.FT1,
          outlet: "Eductor line",
          productId: ids.products.legacy,
          percent: 3,
          flow: 95,
          basis: "solution",
          minutes: 14,
          startedAt: at("2025-12-09T20:31:00Z"),
          endedAt: at("2025-12-09T20:45:00Z"),
          method: "aspirated",
        },
        {
          apparatusId: ids.apparatus.FT1,
          outlet: "Trailer monitor",
          productId: ids.products.legacy,
          percent: 3,
          flow: 500,
          basis: "solution",
          minutes: 4,
          startedAt: at("2025-12-09T20:46:00Z"),
          endedAt: at("2025-12-09T20:50:00Z"),
          method: "monitor",
        },
      ],
      dispositions: [
        {
          disposition: "storm_drain",
          sharePercent: 60,
          receivingWater: "Alder Creek (demo)",
          notes: "Inlet on Depot St.",
        },
        {
          disposition: "contained",
          sharePercent: 30,
          disposalReference: "Vacuum truck manifest DEMO-M-2025-118 (invented)",
        },
        { disposition: "soil", sharePercent: 10 },
      ],
      tankReadings: [
        {
          apparatusId: ids.apparatus.FT1,
          productId: ids.products.legacy,
          // 115 gal left the tank against 99.9 gal computed: the PFAS sheet counts the drawdown (demo).
          levelBeforeGal: 250,
          levelAfterGal: 135,
        },
      ],
    },
    {
      number: "",
      kind: "incident",
      incidentType: "flammable_liquid_spill",
      startedAt: at("2026-03-18T15:05:00Z"),
      clearedAt: at("2026-03-18T17:20:00Z"),
      ...accepted(officer, at("2026-03-18T17:20:00Z")),
      address: "1400 Grain Elevator Rd (truck stop), Alder Bend",
      latitude: 38.6212,
      longitude: -98.2688,
      stationId: ids.stations.S3,
      narrative:
        "Diesel saddle-tank spill at the truck stop, about 60 gal on the apron. Foam blanket of fluorine-free Class B; " +
        "drains plugged, runoff diked and collected by a contractor (demo).",
      createdBy: officer,
      discharges: [
        {
          apparatusId: ids.apparatus.E3,
          outlet: "Crosslay 1",
          productId: ids.products.f3,
          percent: 3,
          flow: 150,
          basis: "water",
          minutes: 8,
          startedAt: at("2026-03-18T15:20:00Z"),
          endedAt: at("2026-03-18T15:28:00Z"),
          method: "aspirated",
        },
      ],
      dispositions: [
        {
          disposition: "contained",
          sharePercent: 100,
          disposalReference: "Waste manifest DEMO-2026-0412 (invented), Prairie Demo Environmental",
        },
      ],
      tankReadings: [{ apparatusId: ids.apparatus.E3, productId: ids.products.f3, refillGal: 37 }],
    },
    {
      number: "",
      kind: "training",
      startedAt: at("2026-04-14T14:00:00Z"),
      clearedAt: at("2026-04-14T16:30:00Z"),
      ...accepted(officer2, at("2026-04-14T16:30:00Z")),
      address: "Station S2 wash bay, 2150 Mill Rd, Alder Bend",
      latitude: 38.7353,
      longitude: -98.1504,
      stationId: ids.stations.S2,
      narrative:
        "Compressed-air foam nozzle drill inside the wash bay; the floor drain goes to the sanitary sewer. " +
        "The treatment works was told beforehand (demo).",
      createdBy: officer2,
      discharges: [
        {
          apparatusId: ids.apparatus.E2,
          outlet: "Crosslay 1",
          productId: ids.products.classA,
          percent: 0.3,
          flow: 90,
          basis: "water",
          minutes: 12,
          method: "compressed_air",
          airFlowCfm: 50,
        },
      ],
      dispositions: [
        {
          disposition: "sanitary_sewer",
          sharePercent: 100,
          sewerNotice: "Alder Bend Water Reclamation (demo) told by phone 2026-04-14 08:40, ref WR-118",
        },
      ],
      tankReadings: [{ apparatusId: ids.apparatus.E2, productId: ids.products.classA, refillGal: 3.5 }],
    },
    {
      number: "",
      kind: "flush",
      startedAt: at("2026-05-05T13:00:00Z"),
      clearedAt: at("2026-05-05T15:00:00Z"),
      ...accepted(officer, at("2026-05-05T15:00:00Z")),
      address: "Station S1 apron, 100 Courthouse Sq, Alder Bend",
      latitude: 38.7004,
      longitude: -98.2003,
      stationId: ids.stations.S1,
      narrative:
        "Annual flush of the Class A injection systems on E1 and E2 into pails; collected for disposal (demo).",
      createdBy: officer,
      discharges: [
        {
          apparatusId: ids.apparatus.E1,
          outlet: "Booster reel",
          productId: ids.products.classA,
          percent: 1,
          flow: 10,
          basis: "water",
          minutes: 3,
          method: "non_aspirated",
        },
        {
          apparatusId: ids.apparatus.E2,
          outlet: "Booster reel",
          productId: ids.products.classA,
          percent: 1,
          flow: 10,
          basis: "water",
          minutes: 3,
          method: "non_aspirated",
        },
        { apparatusId: ids.apparatus.E1, outlet: "Booster reel", productId: null, percent: null, flow: 20, minutes: 5 },
      ],
      dispositions: [
        {
          disposition: "contained",
          volumeGal: 93,
          disposalReference: "Pails to Station S1 waste drum DEMO-D-07 (invented)",
        },
      ],
    },
    {
      number: "",
      kind: "test",
      startedAt: at("2026-05-06T14:00:00Z"),
      clearedAt: at("2026-05-06T16:00:00Z"),
      ...accepted(officer, at("2026-05-06T16:00:00Z")),
      address: "Test pad, Station S3, 880 S Fork Rd, Alder Bend",
      latitude: 38.6547,
      longitude: -98.2455,
      stationId: ids.stations.S3,
      narrative:
        "Annual proportioner test of E3's Class B system with fluorine-free concentrate, solution caught on the lined pad " +
        "and sampled by refractometer; tank levels read before and after (demo).",
      createdBy: officer,
      discharges: [
        {
          apparatusId: ids.apparatus.E3,
          outlet: "Bumper turret",
          productId: ids.products.f3,
          percent: 3,
          flow: 250,
          basis: "water",
          minutes: 2,
          method: "monitor",
        },
      ],
      dispositions: [
        {
          disposition: "contained",
          sharePercent: 100,
          disposalReference: "Pad sump pumped out, manifest DEMO-2026-0501 (invented)",
        },
      ],
      tankReadings: [
        {
          apparatusId: ids.apparatus.E3,
          productId: ids.products.f3,
          levelBeforeGal: 50,
          levelAfterGal: 35,
        },
      ],
    },
    {
      number: "",
      kind: "test",
      startedAt: at("2026-06-22T15:00:00Z"),
      clearedAt: at("2026-06-22T17:30:00Z"),
      ...accepted(officer2, at("2026-06-22T17:30:00Z")),
      address: "Station S2 apron, 2150 Mill Rd, Alder Bend",
      latitude: 38.7349,
      longitude: -98.1498,
      stationId: ids.stations.S2,
      narrative:
        "Acceptance test of E2's rebuilt compressed-air foam system. At 1 % and full water flow the injector reached its " +
        "maximum rate; the set percentage was not achieved (demo).",
      createdBy: officer2,
      discharges: [
        {
          apparatusId: ids.apparatus.E2,
          outlet: "Crosslay 1",
          productId: ids.products.classA,
          percent: 0.3,
          flow: 150,
          basis: "water",
          minutes: 5,
          method: "compressed_air",
          airFlowCfm: 75,
        },
        {
          apparatusId: ids.apparatus.E2,
          outlet: "Crosslay 1",
          productId: ids.products.classA,
          percent: 1,
          flow: 200,
          basis: "water",
          minutes: 3,
          method: "compressed_air",
          airFlowCfm: 100,
        },
      ],
      dispositions: [
        { disposition: "soil", sharePercent: 70 },
        { disposition: "evaporated_unknown", sharePercent: 30 },
      ],
      tankReadings: [{ apparatusId: ids.apparatus.E2, productId: ids.products.classA, refillGal: 9 }],
    },
    {
      number: "",
      kind: "incident",
      incidentType: "wildland",
      startedAt: at("2026-08-03T21:10:00Z"),
      clearedAt: at("2026-08-04T01:45:00Z"),
      ...accepted(officer, at("2026-08-04T01:45:00Z")),
      address: "County Road 12 near Millrace bridge, Alder Bend",
      latitude: 38.7421,
      longitude: -98.1322,
      stationId: ids.stations.S2,
      narrative:
        "Field and fence-row fire next to Millrace Creek. Foam kept back from the creek bank; part of the runoff reached " +
        "the creek. Cedar Ford's brush unit came in on mutual aid along the far fence row (demo).",
      createdBy: officer,
      discharges: [
        {
          // 30 gpm at 0.5 % for 20 minutes: 3 gal, well within BR3's 5 gal tank and its 0.5 gpm proportioner.
          apparatusId: ids.apparatus.BR3,
          outlet: "Bumper nozzle",
          productId: ids.products.classA,
          percent: 0.5,
          flow: 30,
          basis: "water",
          minutes: 20,
          method: "non_aspirated",
        },
        {
          apparatusId: ids.apparatus.E2,
          outlet: "Front bumper line",
          productId: ids.products.classA,
          percent: 0.3,
          flow: 60,
          basis: "water",
          minutes: 35,
          method: "compressed_air",
          airFlowCfm: 40,
        },
        {
          // Another agency's unit: named as typed, no apparatus of ours, so no capacity checks.
          apparatusId: null,
          mutualAidAgency: "Cedar Ford Fire Protection District (demo)",
          mutualAidUnit: "BR61",
          outlet: "Hose reel",
          productId: ids.products.classA,
          percent: 0.3,
          flow: 30,
          basis: "water",
          minutes: 25,
          method: "wetting",
        },
      ],
      dispositions: [
        { disposition: "soil", sharePercent: 85 },
        { disposition: "surface_water", sharePercent: 5, receivingWater: "Millrace Creek (demo)" },
        { disposition: "evaporated_unknown", sharePercent: 10 },
      ],
      tankReadings: [{ apparatusId: ids.apparatus.E2, productId: ids.products.classA, refillGal: 14 }],
    },
  ];
}

// The last weeks' reports are still moving through review.
const RECENT_STATUSES: EventStatus[] = ["filed", "returned", "accepted", "draft", "filed", "returned", "filed"];

/** Every demo event, in time order: the notable ones and about a year of ordinary calls and drills. */
export function buildDemoEvents(ids: DemoIds): EventSpec[] {
  const random = seededRandom(20261201);
  const events = notableEvents(ids, random);
  const first = Date.UTC(2025, 11, 1);
  const last = Date.UTC(2026, 10, 28);
  const recent = Date.UTC(2026, 10, 8);
  let recentCount = 0;
  for (let day = first; day <= last; day += 86_400_000 * random.int(3, 6)) {
    const kind: EventKind = random.chance(0.28) ? "training" : "incident";
    // 13:00–03:00 UTC is roughly 07:00–21:00 in the district.
    const start = new Date(day + (13 + random.int(0, 13)) * 3_600_000 + random.int(0, 59) * 60_000);
    let status: EventStatus = "accepted";
    if (day >= recent) status = RECENT_STATUSES[recentCount++ % RECENT_STATUSES.length];
    events.push(routineEvent(random, "", kind, { ids, start, reviewer: ids.reviewer, status }));
  }
  // Some routine fires get a refill reading; one engine's refill is far off the computed figure.
  let refills = 0;
  for (const event of events) {
    if (event.tankReadings?.length || event.discharges.length === 0 || event.kind === "test" || event.kind === "flush")
      continue;
    const first = event.discharges[0];
    if (first.productId == null || first.apparatusId == null || random.next() > 0.25) continue;
    const computed = event.discharges
      .filter((item) => item.apparatusId === first.apparatusId && item.productId === first.productId)
      .reduce((sum, item) => {
        const gpm = (item.flowUnit === "lpm" ? item.flow / 3.785411784 : item.flow) * ((item.percent ?? 0) / 100);
        return sum + gpm * item.minutes;
      }, 0);
    const off = refills === 3 ? 2.2 : random.between(0.92, 1.08);
    const reading: ReportTankReading = {
      apparatusId: first.apparatusId,
      productId: first.productId,
      refillGal: Math.max(0.5, roundTo(computed * off, 1)),
    };
    event.tankReadings = [reading];
    refills++;
  }
  // The first demo officer has a draft and a returned report of their own waiting for them.
  for (const status of ["draft", "returned"] as const) {
    const mine = events.find((event) => event.status === status);
    if (mine) {
      mine.createdBy = ids.officers[0];
      if (mine.filedBy != null) mine.filedBy = ids.officers[0];
    }
  }
  events.sort((a, b) => (a.startedAt?.getTime() ?? 0) - (b.startedAt?.getTime() ?? 0));
  // Numbers in time order per series, by the app's own numbering rule (the demo agency's prefix is
  // the default, AB); the app's counters start after them.
  const counters = new Map<string, number>();
  for (const event of events) {
    const series = eventNumberSeries(event.kind, DEFAULT_EVENT_NUMBER_PREFIX);
    const year = event.startedAt!.getUTCFullYear();
    const key = `${series}-${year}`;
    const next = (counters.get(key) ?? (series === "AB" && year === 2025 ? 130 : 0)) + 1;
    counters.set(key, next);
    event.number = formatEventNumber(series, year, next);
  }
  // Incidents carry the county dispatch centre's own number (invented format): two-digit year and
  // a sequence that runs far ahead of ours, since dispatch numbers every call it takes.
  const dispatched = new Map<number, number>();
  for (const event of events) {
    if (event.kind !== "incident") continue;
    const year = event.startedAt!.getUTCFullYear();
    const sequence = (dispatched.get(year) ?? 0) + 1;
    dispatched.set(year, sequence);
    event.dispatchNumber = `${String(year).slice(2)}-${String(1200 + sequence * 37).padStart(6, "0")}`;
  }
  return events;
}

export async function demoIds(knex: Knex): Promise<DemoIds> {
  const stations = Object.fromEntries(
    (await knex("stations").whereIn("code", ["S1", "S2", "S3"]).select("id", "code")).map((row) => [row.code, row.id]),
  );
  const apparatus = Object.fromEntries(
    (await knex("apparatus").whereIn("unit_id", ["E1", "E2", "E3", "BR3", "FT1"]).select("id", "unit_id")).map(
      (row) => [row.unit_id, row.id],
    ),
  );
  const product = async (foamType: string) =>
    (await knex("foam_products").where({ foam_type: foamType }).orderBy("id").first("id"))?.id as number;
  const user = async (email: string) => (await knex("users").where({ email }).first("id"))?.id as number;
  const ids: DemoIds = {
    stations: stations as DemoIds["stations"],
    apparatus: apparatus as DemoIds["apparatus"],
    products: { classA: await product("class-a"), f3: await product("f3"), legacy: await product("ar-afff") },
    officers: [await user("officer@alderbend.example"), await user("officer2@alderbend.example")],
    reviewer: await user("enviro@alderbend.example"),
  };
  const missing = [
    ...Object.values(ids.stations),
    ...Object.values(ids.apparatus),
    ...Object.values(ids.products),
    ...ids.officers,
    ids.reviewer,
  ].some((id) => id == null);
  if (missing || Object.keys(ids.stations).length < 3 || Object.keys(ids.apparatus).length < 5) {
    throw new Error("The demo catalogue and accounts must be seeded before the demo events.");
  }
  return ids;
}

export async function seed(knex: Knex): Promise<void> {
  const existing = await knex("events").count({ n: "*" }).first();
  if (Number(existing?.n ?? 0) > 0) return;
  const ids = await demoIds(knex);
  const events = buildDemoEvents(ids);
  await knex.transaction(async (trx) => {
    const facts = await loadCatalogueFacts(trx);
    for (const spec of events) {
      const { id } = await insertEvent(trx, spec, facts);
      const audit = (
        action: string,
        actor: number | null | undefined,
        when: Date | null | undefined,
        summary?: string,
      ) =>
        trx("audit_events").insert({
          occurred_at: when ?? new Date(),
          actor_user_id: actor ?? null,
          actor_label: "demo seed",
          action,
          entity_type: "event",
          entity_id: String(id),
          summary: summary ?? spec.number,
        });
      await audit("report_created", spec.createdBy, spec.startedAt);
      if (spec.filedAt) await audit("report_filed", spec.filedBy, spec.filedAt);
      if (spec.status === "accepted") await audit("report_accepted", spec.reviewedBy, spec.reviewedAt);
      if (spec.status === "returned")
        await audit("report_returned", spec.reviewedBy, spec.reviewedAt, spec.reviewComment ?? undefined);
    }
  });
}
