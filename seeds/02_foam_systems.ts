import type { Knex } from "knex";
import { computeAccuracyTest, type AccuracyTestInput } from "../app/lib/foam/accuracy-test";
import { failureReason } from "../app/models/foam-system-facts.server";
import { readAgencySettings } from "../app/models/agency-settings.server";
import { DEMO_APPARATUS } from "./02_catalogue";

// Demo data only: the invented Alder Bend district's foam systems (one per apparatus, from its figures)
// and a year of accuracy tests — BR3's is overdue, FT1 failed in February and passed its retest. It runs
// before the events, so the usage lines are placed on these systems as a save would place them.

const PRODUCTS = {
  classA: "Bendwater Class A (demo)",
  f3: "Millrace F3 3% (demo)",
  legacy: "Legacy AR-AFFF 3x6 (demo, held for disposal)",
} as const;

type SystemSpec = {
  unitId: string;
  name: string;
  type: "direct_injection" | "inline_eductor";
  product: keyof typeof PRODUCTS;
  enteredAt: string;
};

export const DEMO_FOAM_SYSTEMS: SystemSpec[] = [
  {
    unitId: "E1",
    name: "Class A direct injection",
    type: "direct_injection",
    product: "classA",
    enteredAt: "2025-11-01",
  },
  {
    unitId: "E2",
    name: "Class A direct injection",
    type: "direct_injection",
    product: "classA",
    enteredAt: "2025-11-01",
  },
  { unitId: "E3", name: "Class B direct injection", type: "direct_injection", product: "f3", enteredAt: "2025-11-01" },
  { unitId: "BR3", name: "Class A injection", type: "direct_injection", product: "classA", enteredAt: "2025-11-01" },
  { unitId: "FT1", name: "Class B eductor lines", type: "inline_eductor", product: "f3", enteredAt: "2025-11-01" },
];

const curve = (readings: number[], percents: number[]) =>
  percents.map((percent, index) => ({ percent, reading: readings[index] }));

/** Invented readings: each test's verdict is computed from them as the server computes it. */
export const DEMO_ACCURACY_TESTS: Array<{
  unitId: string;
  testedAt: string;
  setPercent: number;
  waterFlowGpm: number;
  input: AccuracyTestInput;
  notes: string;
}> = [
  {
    unitId: "BR3",
    testedAt: "2025-11-18T16:00:00Z",
    setPercent: 0.5,
    waterFlowGpm: 25,
    input: { method: "flow", foamClass: "A", ratedPercent: 0.5, concentrateGal: 0.25, waterGal: 49.8 },
    notes: "Concentrate drawn from a graduated 1 gal container over 2 min against the flow meter (demo).",
  },
  {
    unitId: "E1",
    testedAt: "2026-01-14T17:00:00Z",
    setPercent: 0.3,
    waterFlowGpm: 100,
    input: {
      method: "conductivity",
      foamClass: "A",
      ratedPercent: 0.3,
      calibration: curve([310, 395, 482, 655], [0, 0.15, 0.3, 0.6]),
      sampleReading: 470,
    },
    notes: "Known mixes made up in 1 L flasks from the tank's concentrate and hydrant water (demo).",
  },
  {
    unitId: "FT1",
    testedAt: "2026-02-17T15:30:00Z",
    setPercent: 3,
    waterFlowGpm: 95,
    input: {
      method: "refractometer",
      foamClass: "B",
      ratedPercent: 3,
      calibration: curve([0.02, 0.56, 1.1, 2.18], [0, 1.5, 3, 6]),
      sampleReading: 0.95,
    },
    notes: "Lean: the eductor's metering orifice was found worn (demo).",
  },
  {
    unitId: "FT1",
    testedAt: "2026-03-03T15:30:00Z",
    setPercent: 3,
    waterFlowGpm: 95,
    input: {
      method: "refractometer",
      foamClass: "B",
      ratedPercent: 3,
      calibration: curve([0.01, 0.55, 1.09, 2.17], [0, 1.5, 3, 6]),
      sampleReading: 1.15,
    },
    notes: "Retest after the metering orifice was replaced (demo).",
  },
  {
    unitId: "E3",
    testedAt: "2026-05-06T14:30:00Z",
    setPercent: 3,
    waterFlowGpm: 250,
    input: {
      method: "refractometer",
      foamClass: "B",
      ratedPercent: 3,
      calibration: curve([0, 0.55, 1.08, 2.2], [0, 1.5, 3, 6]),
      sampleReading: 1.2,
    },
    notes: "Annual test on the lined pad at Station S3 (demo).",
  },
  {
    unitId: "E2",
    testedAt: "2026-06-22T16:00:00Z",
    setPercent: 0.5,
    waterFlowGpm: 90,
    input: {
      method: "conductivity",
      foamClass: "A",
      ratedPercent: 0.5,
      calibration: curve([305, 452, 598, 890], [0, 0.25, 0.5, 1]),
      sampleReading: 612,
    },
    notes: "Acceptance test of the rebuilt compressed-air foam system (demo).",
  },
];

export async function seed(knex: Knex): Promise<void> {
  if (Number((await knex("foam_systems").count({ n: "*" }).first())?.n ?? 0) > 0) return;
  const settings = await readAgencySettings(knex);
  const apparatus = new Map<string, number>(
    (await knex("apparatus").select("id", "unit_id")).map((row) => [row.unit_id as string, row.id as number]),
  );
  const products = new Map<string, number>(
    (await knex("foam_products").select("id", "name")).map((row) => [row.name as string, row.id as number]),
  );
  const tester = (await knex("users").where({ email: "officer@alderbend.example" }).first("id")).id as number;
  const systems = new Map<string, number>();
  for (const spec of DEMO_FOAM_SYSTEMS) {
    const apparatusId = apparatus.get(spec.unitId);
    const figures = DEMO_APPARATUS.find((unit) => unit.unitId === spec.unitId);
    if (apparatusId == null || !figures) continue;
    const [id] = await knex("foam_systems").insert({
      apparatus_id: apparatusId,
      name: spec.name,
      system_type: spec.type,
      percent_of: spec.type === "direct_injection" ? "water" : "solution",
      max_concentrate_gpm: figures.proportionerMaxConcentrateGpm ?? null,
      water_flow_min_gpm: figures.waterFlowMinGpm ?? null,
      water_flow_max_gpm: figures.waterFlowMaxGpm ?? null,
      created_at: new Date(`${spec.enteredAt}T12:00:00Z`),
    });
    systems.set(spec.unitId, id);
    await knex("foam_system_tanks").insert({
      foam_system_id: id,
      name: "Tank",
      capacity_gal: figures.concentrateTankGal ?? null,
      product_id: products.get(PRODUCTS[spec.product]) ?? null,
    });
    const outlets = (figures.outlets ?? []).filter((outlet) => outlet.foamCapable !== false);
    if (outlets.length) {
      await knex("foam_system_outlets").insert(
        outlets.map((outlet) => ({ foam_system_id: id, apparatus_id: apparatusId, outlet_name: outlet.name })),
      );
    }
  }
  for (const test of DEMO_ACCURACY_TESTS) {
    const systemId = systems.get(test.unitId);
    if (systemId == null) continue;
    const result = computeAccuracyTest(test.input, settings.classAAccuracyShare);
    await knex("foam_accuracy_tests").insert({
      foam_system_id: systemId,
      tested_at: new Date(test.testedAt),
      tested_by: tester,
      method: test.input.method,
      foam_class: test.input.foamClass,
      product_id: products.get(test.input.foamClass === "A" ? PRODUCTS.classA : PRODUCTS.f3) ?? null,
      rated_percent: test.input.ratedPercent,
      set_percent: test.setPercent,
      water_flow_gpm: test.waterFlowGpm,
      readings_json: JSON.stringify(test.input),
      achieved_percent: Number(result.achievedPercent.toFixed(5)),
      slope: result.slope,
      intercept: result.intercept,
      r2: result.r2,
      band_low: result.band[0],
      band_high: result.band[1],
      pass: result.pass,
      notes: test.notes,
    });
    // The system's state follows its latest test, as a recorded test sets it.
    await knex("foam_systems")
      .where({ id: systemId })
      .update(
        result.pass
          ? { status: "in_service", status_reason: null, status_since: null }
          : {
              status: "out_of_tolerance",
              status_reason: failureReason(result.achievedPercent, result.band, test.testedAt.slice(0, 10)),
              status_since: new Date(test.testedAt),
            },
      );
  }
  await knex("audit_events").insert({
    actor_label: "demo seed",
    action: "foam_systems_seeded",
    entity_type: "foam_system",
    summary: `${systems.size} demo foam systems and ${DEMO_ACCURACY_TESTS.length} accuracy tests`,
  });
}
