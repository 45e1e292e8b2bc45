import type { Knex } from "knex";
import {
  apparatusRow,
  outletRow,
  productRow,
  stationRow,
  type ApparatusSpec,
  type ProductSpec,
  type StationSpec,
} from "../app/models/catalogue-rows.server";
import { DEMO_ACCOUNTS } from "./01_agency_and_accounts";

// Demo data only: the invented Alder Bend Fire District, its stations, apparatus and invented products.
export const DEMO_STATIONS: StationSpec[] = [
  {
    code: "S1",
    name: "Alder Bend Central (demo)",
    address: "100 Courthouse Sq, Alder Bend",
    latitude: 38.7,
    longitude: -98.2,
  },
  { code: "S2", name: "Millrace (demo)", address: "2150 Mill Rd, Alder Bend", latitude: 38.735, longitude: -98.15 },
  { code: "S3", name: "South Fork (demo)", address: "880 S Fork Rd, Alder Bend", latitude: 38.655, longitude: -98.245 },
];

export const DEMO_PRODUCTS: ProductSpec[] = [
  {
    name: "Bendwater Class A (demo)",
    maker: "Prairie Demo Chemical (invented)",
    foamClass: "A",
    foamType: "class-a",
    nominalPercents: [0.1, 0.3, 0.5, 1],
    unitCostPerGal: 27.5,
    notes: "Invented demo product. Wetting 0.1–0.3 %, compressed-air foam about 0.3 %, dry foam up to 1 %.",
  },
  {
    name: "Millrace F3 3% (demo)",
    maker: "Prairie Demo Chemical (invented)",
    foamClass: "B",
    foamType: "f3",
    nominalPercents: [3],
    pfasContaining: false,
    unitCostPerGal: 41.0,
    notes: "Invented demo product. Fluorine-free Class B for hydrocarbon spills.",
  },
  {
    name: "Legacy AR-AFFF 3x6 (demo, held for disposal)",
    maker: "Unknown legacy supplier (invented)",
    foamClass: "B",
    foamType: "ar-afff",
    nominalPercents: [3, 6],
    pfasContaining: true,
    pfasContent: 10,
    pfasContentUnit: "g_per_l",
    pfasContentBasis:
      "Estimated total PFAS per litre of concentrate; no laboratory result for this lot. Treat as an estimate.",
    pfasContentSource:
      "Estimate from the legacy AFFF range of about 5–15 g/L (0.5–1.5 % w/w) reported on an old product safety sheet and in academic measurements (from memory); not measured for this stock.",
    unitCostPerGal: null,
    notes:
      "Invented demo product. Held at Station S1 for disposal through a licensed contractor: do not use for training or flushing.",
  },
];

export const DEMO_APPARATUS: Array<ApparatusSpec & { stationCode: string }> = [
  {
    unitId: "E1",
    stationCode: "S1",
    description: "Engine 1 — pumper with compressed-air foam (demo)",
    concentrateTankGal: 40,
    proportionerMaxConcentrateGpm: 2.0,
    proportionerType: "direct_injection",
    waterFlowMinGpm: 5,
    waterFlowMaxGpm: 400,
    compressedAirCfm: 200,
    outlets: [
      { name: "Crosslay 1", defaultFlowGpm: 100, defaultFlowBasis: "water", defaultMethod: "compressed_air" },
      { name: "Crosslay 2", defaultFlowGpm: 100, defaultFlowBasis: "water", defaultMethod: "compressed_air" },
      { name: "Booster reel", defaultFlowGpm: 20, defaultFlowBasis: "water", defaultMethod: "wetting" },
      {
        name: "Deck gun",
        foamCapable: false,
        defaultFlowGpm: 750,
        defaultFlowBasis: "water",
        defaultMethod: "monitor",
      },
    ],
  },
  {
    unitId: "E2",
    stationCode: "S2",
    description: "Engine 2 — pumper with compressed-air foam (demo)",
    concentrateTankGal: 30,
    proportionerMaxConcentrateGpm: 1.5,
    proportionerType: "direct_injection",
    waterFlowMinGpm: 5,
    waterFlowMaxGpm: 300,
    compressedAirCfm: 150,
    outlets: [
      { name: "Crosslay 1", defaultFlowGpm: 90, defaultFlowBasis: "water", defaultMethod: "compressed_air" },
      { name: "Front bumper line", defaultFlowGpm: 60, defaultFlowBasis: "water", defaultMethod: "compressed_air" },
      { name: "Booster reel", defaultFlowGpm: 20, defaultFlowBasis: "water", defaultMethod: "wetting" },
    ],
  },
  {
    unitId: "E3",
    stationCode: "S3",
    description: "Engine 3 — pumper with Class B direct injection (demo)",
    concentrateTankGal: 50,
    proportionerMaxConcentrateGpm: 10,
    proportionerType: "direct_injection",
    waterFlowMinGpm: 20,
    waterFlowMaxGpm: 500,
    compressedAirCfm: null,
    outlets: [
      { name: "Crosslay 1", defaultFlowGpm: 150, defaultFlowBasis: "water", defaultMethod: "aspirated" },
      { name: "Crosslay 2", defaultFlowGpm: 150, defaultFlowBasis: "water", defaultMethod: "non_aspirated" },
      { name: "Bumper turret", defaultFlowGpm: 250, defaultFlowBasis: "water", defaultMethod: "monitor" },
    ],
  },
  {
    unitId: "BR3",
    stationCode: "S3",
    description: "Brush 3 — wildland unit with Class A injection (demo)",
    concentrateTankGal: 5,
    proportionerMaxConcentrateGpm: 0.5,
    proportionerType: "direct_injection",
    waterFlowMinGpm: 2,
    waterFlowMaxGpm: 120,
    compressedAirCfm: null,
    outlets: [
      { name: "Hose reel", defaultFlowGpm: 20, defaultFlowBasis: "water", defaultMethod: "wetting" },
      { name: "Bumper nozzle", defaultFlowGpm: 30, defaultFlowBasis: "water", defaultMethod: "non_aspirated" },
    ],
  },
  {
    unitId: "FT1",
    stationCode: "S1",
    description: "Foam Tender 1 — trailer with Class B tank and eductor lines (demo)",
    concentrateTankGal: 250,
    proportionerMaxConcentrateGpm: 60,
    proportionerType: "eductor",
    waterFlowMinGpm: 60,
    waterFlowMaxGpm: 1250,
    compressedAirCfm: null,
    outlets: [
      { name: "Eductor line", defaultFlowGpm: 95, defaultFlowBasis: "solution", defaultMethod: "aspirated" },
      { name: "Trailer monitor", defaultFlowGpm: 500, defaultFlowBasis: "solution", defaultMethod: "monitor" },
    ],
  },
];

export async function seed(knex: Knex): Promise<void> {
  for (const station of DEMO_STATIONS) {
    await knex("stations").insert(stationRow(station)).onConflict("code").ignore();
  }
  const stations = new Map<string, number>(
    (await knex("stations").select("id", "code")).map((row) => [row.code as string, row.id as number]),
  );
  // Each demo officer belongs to a station; their station's returned and accepted reports are theirs to fix.
  for (const account of DEMO_ACCOUNTS) {
    if (!("station" in account)) continue;
    await knex("users")
      .where({ email: account.email })
      .whereNull("station_id")
      .update({ station_id: stations.get(account.station) ?? null });
  }
  for (const spec of DEMO_APPARATUS) {
    const existing = await knex("apparatus").where({ unit_id: spec.unitId }).first();
    if (existing) continue;
    const [id] = await knex("apparatus").insert(
      apparatusRow({ ...spec, stationId: stations.get(spec.stationCode) ?? null }),
    );
    await knex("apparatus_outlets").insert((spec.outlets ?? []).map((outlet) => outletRow(id, outlet)));
    await knex("audit_events").insert({
      actor_label: "demo seed",
      action: "apparatus_created",
      entity_type: "apparatus",
      entity_id: String(id),
      after_json: JSON.stringify({ unitId: spec.unitId, station: spec.stationCode }),
    });
  }
  for (const spec of DEMO_PRODUCTS) {
    const existing = await knex("foam_products").where({ name: spec.name }).first();
    if (existing) continue;
    const [id] = await knex("foam_products").insert(productRow(spec));
    await knex("audit_events").insert({
      actor_label: "demo seed",
      action: "product_created",
      entity_type: "foam_product",
      entity_id: String(id),
      after_json: JSON.stringify({ name: spec.name, foamClass: spec.foamClass, pfasContaining: spec.pfasContaining }),
    });
  }
}
