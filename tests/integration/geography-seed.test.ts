import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { seed as seedGeography } from "../../seeds/04_geography";
import { privateDatabase } from "../support/test-database";

// Its own database, so that an empty one (no accounts, no events) can be seeded.
const database = privateDatabase("geo_seed");
const knex = database.knex;

// Migrated with no seed files: each test runs the geography seed itself.
beforeAll(() => database.seed([]));
afterAll(() => database.drop());

describe("the demo geography seed", () => {
  it("loads the invented district's five layers into an empty database", async () => {
    await seedGeography(knex);
    const layers = await knex("geo_layers").orderBy("kind").select("kind", "feature_count", "version");
    expect(layers.map((layer) => layer.kind)).toEqual([
      "address_points",
      "drainage_basins",
      "jurisdiction",
      "storm_inlets",
      "waterways",
    ]);
    expect(layers.find((layer) => layer.kind === "drainage_basins")?.feature_count).toBe(4);
    expect(await knex("audit_events").where({ action: "geo_layer_replaced" }).count({ n: "*" })).toEqual([{ n: 5 }]);
  });

  it("run again, keeps the layers and rechecks the events already there", async () => {
    const [userId] = await knex("users").insert({ email: "seed@test.example", name: "Seed test", password_hash: "x" });
    const [eventId] = await knex("events").insert({
      number: "SEED-1",
      kind: "training",
      latitude: 38.735,
      longitude: -98.15,
      created_by: userId,
    });
    await seedGeography(knex);
    const event = await knex("events").where({ id: eventId }).first();
    // Station S2's site (demo) lies in the Millrace basin, a few hundred metres from Millrace Run.
    expect(event.drainage_basin).toBe("Millrace");
    expect(event.nearest_waterway).toBe("Millrace Run");
    expect(event.geo_checked_at).not.toBeNull();
    const versions = await knex("geo_layers").pluck("version");
    expect(versions.every((version) => version === 1)).toBe(true);
  });
});
