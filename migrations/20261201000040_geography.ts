import type { Knex } from "knex";

// One current GeoJSON file per layer kind; a new upload replaces the row only once it is valid.
// Every replacement is in the audit log (with the old and new feature counts).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("geo_layers", (t) => {
    t.increments("id").primary();
    // drainage_basins, waterways, storm_inlets, jurisdiction, address_points
    t.string("kind", 32).notNullable().unique();
    t.string("file_name", 255).notNullable().defaultTo("");
    t.specificType("geojson", "LONGTEXT").notNullable();
    t.integer("feature_count").unsigned().notNullable();
    t.integer("byte_size").unsigned().notNullable();
    // Bumped on every replacement so cached parsed layers know they are stale.
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.integer("uploaded_by").unsigned().nullable().references("users.id");
    t.timestamp("uploaded_at").notNullable().defaultTo(knex.fn.now());
  });
  await knex.schema.alterTable("events", (t) => {
    t.index(["geo_checked_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("events", (t) => {
    t.dropIndex(["geo_checked_at"]);
  });
  await knex.schema.dropTableIfExists("geo_layers");
}
