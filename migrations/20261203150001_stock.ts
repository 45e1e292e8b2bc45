import type { Knex } from "knex";

// The stock book: where concentrate is kept, the lots it came in, every movement of it, counts,
// reorder points and the stock alerts already sent (issue 15), and a product held for disposal with
// the reason a report gives for using it anyway (issue 10 §4).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("foam_products", (t) => {
    t.boolean("held_for_disposal").notNullable().defaultTo(false);
    t.smallint("shelf_life_months").unsigned().nullable();
  });
  await knex.schema.alterTable("agency_settings", (t) => {
    // NFPA 11 (2021) §13.2.6: concentrate samples are sent for quality-condition tests periodically.
    t.smallint("quality_sample_interval_months").unsigned().notNullable().defaultTo(12);
    t.decimal("class_b_attack_solution_gpm", 8, 2).notNullable().defaultTo(95);
    t.decimal("class_b_attack_percent", 5, 2).notNullable().defaultTo(3);
  });
  await knex.schema.alterTable("discharges", (t) => {
    t.string("held_use_reason", 500).nullable();
  });

  await knex.schema.createTable("stock_locations", (t) => {
    t.increments("id").primary();
    t.enum("kind", ["station_store", "apparatus_tank", "foam_tender", "cache"]).notNullable();
    t.string("name", 120).notNullable().unique();
    t.integer("station_id").unsigned().nullable().references("stations.id");
    // Keyed by apparatus until the apparatus's foam systems carry their own tanks.
    t.integer("apparatus_id").unsigned().nullable().unique().references("apparatus.id");
    t.boolean("active").notNullable().defaultTo(true);
    // Every movement in or out adds one: a form names the version it read.
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.index(["station_id"]);
  });

  await knex.schema.createTable("stock_lots", (t) => {
    t.increments("id").primary();
    t.integer("product_id").unsigned().notNullable().references("foam_products.id");
    t.string("lot_number", 60).notNullable();
    t.date("manufactured_on").nullable();
    t.enum("container", ["pail", "drum", "tote", "bulk"]).notNullable();
    t.decimal("container_gal", 10, 2).notNullable();
    t.integer("container_count").unsigned().notNullable();
    t.decimal("quantity_gal", 14, 4).notNullable();
    t.string("supplier", 120).notNullable().defaultTo("");
    t.string("delivery_reference", 120).notNullable().defaultTo("");
    t.date("received_on").notNullable();
    t.integer("created_by").unsigned().notNullable().references("users.id");
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.unique(["product_id", "lot_number"]);
  });

  await knex.schema.createTable("stock_counts", (t) => {
    t.increments("id").primary();
    t.integer("location_id").unsigned().notNullable().references("stock_locations.id");
    t.datetime("counted_at").notNullable();
    t.string("reason", 500).notNullable();
    t.integer("counted_by").unsigned().notNullable().references("users.id");
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.index(["location_id", "counted_at"]);
  });

  await knex.schema.createTable("stock_count_lines", (t) => {
    t.increments("id").primary();
    t.integer("count_id").unsigned().notNullable().references("stock_counts.id").onDelete("CASCADE");
    t.integer("product_id").unsigned().notNullable().references("foam_products.id");
    t.integer("lot_id").unsigned().nullable().references("stock_lots.id");
    t.decimal("book_gal", 14, 4).notNullable();
    t.decimal("counted_gal", 14, 4).notNullable();
    t.decimal("variance_gal", 14, 4).notNullable();
    t.index(["count_id"]);
  });

  await knex.schema.createTable("stock_movements", (t) => {
    t.increments("id").primary();
    t.enum("kind", ["received", "transferred", "used", "sampled", "disposed", "adjusted"]).notNullable();
    t.integer("location_id").unsigned().notNullable().references("stock_locations.id");
    t.integer("product_id").unsigned().notNullable().references("foam_products.id");
    t.integer("lot_id").unsigned().nullable().references("stock_lots.id");
    // Signed: into the location positive, out of it negative.
    t.decimal("gal", 14, 4).notNullable();
    t.datetime("at").notNullable();
    t.integer("event_id").unsigned().nullable().references("events.id").onDelete("SET NULL");
    t.integer("count_id").unsigned().nullable().references("stock_counts.id");
    // The other half of a transfer.
    t.integer("counterpart_location_id").unsigned().nullable().references("stock_locations.id");
    t.string("reason", 500).notNullable().defaultTo("");
    t.string("reference", 160).notNullable().defaultTo("");
    t.integer("created_by").unsigned().nullable().references("users.id");
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.index(["location_id", "product_id", "lot_id"]);
    t.index(["event_id", "kind"]);
    t.index(["kind", "at"]);
    t.index(["lot_id", "kind"]);
  });

  await knex.schema.createTable("stock_reorder_points", (t) => {
    t.increments("id").primary();
    t.integer("location_id").unsigned().notNullable().references("stock_locations.id");
    t.integer("product_id").unsigned().notNullable().references("foam_products.id");
    t.decimal("reorder_gal", 12, 2).notNullable();
    t.unique(["location_id", "product_id"]);
  });

  // One row per alert condition while it holds, so an alert is queued once, not on every look.
  await knex.schema.createTable("stock_alerts_sent", (t) => {
    t.string("alert_key", 120).primary();
    t.timestamp("sent_at").notNullable().defaultTo(knex.fn.now());
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of [
    "stock_alerts_sent",
    "stock_reorder_points",
    "stock_movements",
    "stock_count_lines",
    "stock_counts",
    "stock_lots",
    "stock_locations",
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
  await knex.schema.alterTable("discharges", (t) => {
    t.dropColumn("held_use_reason");
  });
  await knex.schema.alterTable("agency_settings", (t) => {
    t.dropColumn("quality_sample_interval_months");
    t.dropColumn("class_b_attack_solution_gpm");
    t.dropColumn("class_b_attack_percent");
  });
  await knex.schema.alterTable("foam_products", (t) => {
    t.dropColumn("held_for_disposal");
    t.dropColumn("shelf_life_months");
  });
}
