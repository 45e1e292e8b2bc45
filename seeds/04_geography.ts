import { readFileSync } from "node:fs";
import path from "node:path";
import type { Knex } from "knex";
import type { LayerKind } from "~/lib/geo/layers";
import { recomputeAllEventGeography, replaceLayer } from "~/models/geography.server";

// Demo data only: the invented Alder Bend Fire District's layers (tiles/sources/alder-bend, made by
// scripts/make-demo-geography.ts). A layer an agency has already uploaded is left alone.
export const DEMO_LAYER_FILES: Record<LayerKind, string> = {
  drainage_basins: "drainage-basins.geojson",
  waterways: "waterways.geojson",
  storm_inlets: "storm-inlets.geojson",
  jurisdiction: "jurisdiction.geojson",
  address_points: "address-points.geojson",
};

export async function seed(knex: Knex): Promise<void> {
  const directory = path.resolve("tiles/sources/alder-bend");
  for (const [kind, fileName] of Object.entries(DEMO_LAYER_FILES) as [LayerKind, string][]) {
    if (await knex("geo_layers").where({ kind }).first("id")) continue;
    const text = readFileSync(path.join(directory, fileName), "utf8");
    // The seed may run before the file store is up; the first replacement stores the seeded file as its earlier version.
    const result = await replaceLayer({ kind, text, fileName }, null, null, {
      connection: knex,
      recheckEvents: false,
      keepFile: false,
    });
    if (!result.ok) throw new Error(`demo layer ${fileName} is invalid: ${result.errors.join(" ")}`);
  }
  // Events seeded before this file (or already present) get their stored checks now.
  await recomputeAllEventGeography(knex);
}
