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
