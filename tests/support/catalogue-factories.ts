// Catalogue rows for tests, built with the same builders as the demo seed.
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { db } from "~/lib/db.server";
import {
  apparatusRow,
  outletRow,
  productRow,
  stationRow,
  type ApparatusSpec,
  type ProductSpec,
} from "~/models/catalogue-rows.server";
import { bumpDataVersion } from "~/models/data-version.server";

const unique = () => randomUUID().slice(0, 6);

export async function makeStationRow(connection: Knex = db) {
  const code = `T${unique()}`;
  const [id] = await connection("stations").insert(stationRow({ code, name: `Test station ${code} (test)` }));
  await bumpDataVersion(connection, "catalogue");
  return { id, code };
}

export async function makeProductRow(spec: Partial<ProductSpec> = {}, connection: Knex = db) {
  const full: ProductSpec = {
    name: `Test concentrate ${unique()} (test)`,
    foamClass: "B",
    foamType: "f3",
    nominalPercents: [3],
    ...spec,
  };
  const [id] = await connection("foam_products").insert(productRow(full));
  await bumpDataVersion(connection, "catalogue");
  return { id, ...full };
}

export async function makeApparatusRow(spec: Partial<ApparatusSpec> = {}, connection: Knex = db) {
  const full: ApparatusSpec = { unitId: `E-${unique()}`, ...spec };
  const [id] = await connection("apparatus").insert(apparatusRow(full));
  for (const outlet of full.outlets ?? []) await connection("apparatus_outlets").insert(outletRow(id, outlet));
  await bumpDataVersion(connection, "catalogue");
  return { id, ...full };
}

/**
 * A foam system on an apparatus of its own with one passing flow test on it, with the figures the server
 * keeps for it: 3.2 gal of concentrate in 100 gal of solution is 3.2 %, inside 3.0–3.9 % at a rated 3 %.
 */
export async function makeSystemWithFlowTest(systemName: string, testedBy: number, connection: Knex = db) {
  const apparatus = await makeApparatusRow({}, connection);
  const [systemId] = await connection("foam_systems").insert({ apparatus_id: apparatus.id, name: systemName });
  const [testId] = await connection("foam_accuracy_tests").insert({
    foam_system_id: systemId,
    tested_at: new Date("2026-04-01T15:00:00Z"),
    tested_by: testedBy,
    method: "flow",
    foam_class: "B",
    rated_percent: 3,
    readings_json: JSON.stringify({
      method: "flow",
      foamClass: "B",
      ratedPercent: 3,
      concentrateGal: 3.2,
      waterGal: 96.8,
    }),
    achieved_percent: 3.2,
    band_low: 3,
    band_high: 3.9,
    pass: true,
  });
  return { systemId: systemId as number, testId: testId as number };
}
