import type { Knex } from "knex";

const volume = (t: Knex.CreateTableBuilder, name: string) => t.decimal(name, 16, 6).notNullable().defaultTo(0);

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("stations", (t) => {
    t.increments("id").primary();
    t.string("code", 16).notNullable().unique();
    t.string("name", 120).notNullable();
    t.string("address", 200).notNullable().defaultTo("");
    t.decimal("latitude", 9, 6).nullable();
    t.decimal("longitude", 9, 6).nullable();
    t.boolean("active").notNullable().defaultTo(true);
  });

  await knex.schema.createTable("apparatus", (t) => {
    t.increments("id").primary();
    t.integer("station_id").unsigned().nullable().references("stations.id");
    t.string("unit_id", 24).notNullable().unique();
    t.string("description", 160).notNullable().defaultTo("");
    t.decimal("concentrate_tank_gal", 10, 2).nullable();
    t.decimal("proportioner_max_concentrate_gpm", 10, 3).nullable();
    t.decimal("water_flow_min_gpm", 10, 2).nullable();
    t.decimal("water_flow_max_gpm", 10, 2).nullable();
    t.decimal("compressed_air_cfm", 10, 2).nullable();
    t.boolean("active").notNullable().defaultTo(true);
  });

  await knex.schema.createTable("apparatus_outlets", (t) => {
    t.increments("id").primary();
    t.integer("apparatus_id").unsigned().notNullable().references("apparatus.id").onDelete("CASCADE");
    t.string("name", 60).notNullable();
    t.boolean("foam_capable").notNullable().defaultTo(true);
    t.decimal("default_flow_gpm", 10, 2).nullable();
    t.string("default_flow_basis", 10).notNullable().defaultTo("water");
    t.string("default_method", 24).nullable();
    t.unique(["apparatus_id", "name"]);
  });

  await knex.schema.createTable("foam_products", (t) => {
    t.increments("id").primary();
    t.string("name", 120).notNullable().unique();
    t.string("maker", 120).notNullable().defaultTo("");
    t.enum("foam_class", ["A", "B"]).notNullable();
    // class-a, afff, ar-afff, fffp, ar-fffp, f3 (fluorine-free), protein, fluoroprotein, other
    t.string("foam_type", 24).notNullable();
    t.string("nominal_percents", 40).notNullable().defaultTo("");
    t.boolean("pfas_containing").notNullable().defaultTo(false);
    t.decimal("pfas_content", 14, 6).nullable();
    // g_per_l of concentrate, mg_per_l, or percent_w_w
    t.string("pfas_content_unit", 16).nullable();
    t.text("pfas_content_basis").nullable();
    t.text("pfas_content_source").nullable();
    t.decimal("unit_cost_per_gal", 10, 2).nullable();
    t.string("safety_sheet_key", 255).nullable();
    t.string("safety_sheet_name", 255).nullable();
    t.boolean("active").notNullable().defaultTo(true);
    t.text("notes").nullable();
  });

  await knex.schema.createTable("events", (t) => {
    t.increments("id").primary();
    t.string("number", 32).notNullable().unique();
    t.enum("kind", ["incident", "training", "test", "flush"]).notNullable();
    t.enum("status", ["draft", "filed", "returned", "accepted"]).notNullable().defaultTo("draft");
    // Optimistic concurrency: every save must name the version it started from.
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.integer("revision").unsigned().notNullable().defaultTo(0);
    t.datetime("started_at").nullable();
    t.datetime("cleared_at").nullable();
    t.string("address", 200).notNullable().defaultTo("");
    t.decimal("latitude", 9, 6).nullable();
    t.decimal("longitude", 9, 6).nullable();
    t.integer("station_id").unsigned().nullable().references("stations.id");
    t.text("narrative").nullable();
    t.integer("created_by").unsigned().notNullable().references("users.id");
    t.integer("filed_by").unsigned().nullable().references("users.id");
    t.datetime("filed_at").nullable();
    t.integer("reviewed_by").unsigned().nullable().references("users.id");
    t.datetime("reviewed_at").nullable();
    t.text("review_comment").nullable();
    volume(t, "water_gal");
    volume(t, "concentrate_gal");
    volume(t, "solution_gal");
    t.boolean("pfas_containing").notNullable().defaultTo(false);
    t.boolean("has_warnings").notNullable().defaultTo(false);
    // Geography checks, stored with the event (recomputed when the location or the layers change).
    t.string("drainage_basin", 120).nullable();
    t.string("nearest_waterway", 120).nullable();
    t.decimal("nearest_waterway_m", 12, 2).nullable();
    t.string("nearest_inlet", 120).nullable();
    t.decimal("nearest_inlet_m", 12, 2).nullable();
    t.boolean("within_waterway_buffer").nullable();
    t.boolean("outside_jurisdiction").nullable();
    t.datetime("geo_checked_at").nullable();
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at").notNullable().defaultTo(knex.fn.now());
    t.index(["started_at"]);
    t.index(["status", "started_at"]);
    t.index(["kind", "started_at"]);
    t.index(["station_id", "started_at"]);
    t.index(["latitude", "longitude"]);
    t.index(["created_by", "status"]);
  });

  await knex.schema.createTable("discharges", (t) => {
    t.increments("id").primary();
    t.integer("event_id").unsigned().notNullable().references("events.id").onDelete("CASCADE");
    t.smallint("position").unsigned().notNullable();
    t.integer("apparatus_id").unsigned().nullable().references("apparatus.id");
    t.string("outlet", 60).notNullable().defaultTo("");
    t.integer("product_id").unsigned().nullable().references("foam_products.id");
    t.decimal("percent", 8, 4).nullable();
    t.decimal("flow", 12, 3).nullable();
    t.enum("flow_unit", ["gpm", "lpm"]).notNullable().defaultTo("gpm");
    t.enum("flow_basis", ["water", "solution"]).notNullable().defaultTo("water");
    t.datetime("started_at").nullable();
    t.datetime("ended_at").nullable();
    t.decimal("minutes", 10, 3).nullable();
    t.enum("method", ["compressed_air", "aspirated", "non_aspirated", "monitor", "wetting"]).nullable();
    t.decimal("air_flow_cfm", 10, 2).nullable();
    t.decimal("latitude", 9, 6).nullable();
    t.decimal("longitude", 9, 6).nullable();
    volume(t, "water_gal");
    volume(t, "concentrate_gal");
    volume(t, "solution_gal");
    t.decimal("effective_percent", 8, 4).nullable();
    t.text("warnings").nullable();
    t.unique(["event_id", "position"]);
    t.index(["product_id"]);
    t.index(["apparatus_id"]);
  });

  await knex.schema.createTable("runoff_dispositions", (t) => {
    t.increments("id").primary();
    t.integer("event_id").unsigned().notNullable().references("events.id").onDelete("CASCADE");
    t.enum("disposition", [
      "contained",
      "soil",
      "storm_drain",
      "surface_water",
      "sanitary_sewer",
      "evaporated_unknown",
    ]).notNullable();
    t.decimal("share_percent", 7, 3).nullable();
    t.decimal("volume_gal", 16, 6).nullable();
    t.string("receiving_water", 120).notNullable().defaultTo("");
    t.string("disposal_reference", 160).notNullable().defaultTo("");
    t.string("sewer_notice", 200).notNullable().defaultTo("");
    t.text("notes").nullable();
    t.index(["event_id"]);
  });

  await knex.schema.createTable("tank_readings", (t) => {
    t.increments("id").primary();
    t.integer("event_id").unsigned().notNullable().references("events.id").onDelete("CASCADE");
    t.integer("apparatus_id").unsigned().nullable().references("apparatus.id");
    t.integer("product_id").unsigned().nullable().references("foam_products.id");
    t.enum("kind", ["refill", "levels"]).notNullable();
    t.decimal("refill_gal", 10, 3).nullable();
    t.decimal("level_before_gal", 10, 3).nullable();
    t.decimal("level_after_gal", 10, 3).nullable();
    t.index(["event_id"]);
  });

  await knex.schema.createTable("event_revisions", (t) => {
    t.increments("id").primary();
    t.integer("event_id").unsigned().notNullable().references("events.id").onDelete("CASCADE");
    t.integer("revision").unsigned().notNullable();
    t.text("reason").notNullable();
    t.specificType("snapshot_json", "LONGTEXT").notNullable();
    t.integer("created_by").unsigned().notNullable().references("users.id");
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.unique(["event_id", "revision"]);
  });

  // A repeated "file" click or a resubmitted form carries the same key and is answered, not repeated.
  await knex.schema.createTable("form_submissions", (t) => {
    t.string("submission_key", 64).primary();
    t.integer("user_id").unsigned().notNullable();
    t.integer("event_id").unsigned().nullable();
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of [
    "form_submissions",
    "event_revisions",
    "tank_readings",
    "runoff_dispositions",
    "discharges",
    "events",
    "foam_products",
    "apparatus_outlets",
    "apparatus",
    "stations",
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}
