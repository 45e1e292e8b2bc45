import type { Knex } from "knex";

/**
 * Foam systems per apparatus, with their tanks, the outlets they serve, their maintenance records
 * and accuracy tests; the discharge line names the system it flowed through. Every apparatus that
 * had proportioner figures gets one system carrying them, serving all its outlets.
 */

const SYSTEM_TYPES = [
  "direct_injection",
  "around_the_pump",
  "balanced_pressure",
  "inline_eductor",
  "premix",
  "other",
] as const;

const FROM_PROPORTIONER: Record<string, (typeof SYSTEM_TYPES)[number]> = {
  direct_injection: "direct_injection",
  eductor: "inline_eductor",
  around_the_pump: "around_the_pump",
  balanced_pressure: "balanced_pressure",
  premix: "premix",
};

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("foam_systems", (t) => {
    t.increments("id").primary();
    t.integer("apparatus_id").unsigned().notNullable().references("apparatus.id").onDelete("CASCADE");
    t.string("name", 80).notNullable();
    t.enum("system_type", SYSTEM_TYPES).notNullable().defaultTo("other");
    t.enum("percent_of", ["solution", "water"]).notNullable().defaultTo("solution");
    t.decimal("min_concentrate_gpm", 10, 3).nullable();
    t.decimal("max_concentrate_gpm", 10, 3).nullable();
    t.decimal("water_flow_min_gpm", 10, 2).nullable();
    t.decimal("water_flow_max_gpm", 10, 2).nullable();
    t.enum("status", ["in_service", "out_of_tolerance"]).notNullable().defaultTo("in_service");
    t.text("status_reason").nullable();
    t.datetime("status_since").nullable();
    t.boolean("active").notNullable().defaultTo(true);
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.unique(["apparatus_id", "name"]);
    t.index(["status"]);
  });

  await knex.schema.createTable("foam_system_tanks", (t) => {
    t.increments("id").primary();
    t.integer("foam_system_id").unsigned().notNullable().references("foam_systems.id").onDelete("CASCADE");
    t.string("name", 60).notNullable();
    t.decimal("capacity_gal", 10, 2).nullable();
    t.integer("product_id").unsigned().nullable().references("foam_products.id");
  });

  // By outlet name, as a discharge line names its outlet: the apparatus form replaces outlet rows.
  await knex.schema.createTable("foam_system_outlets", (t) => {
    t.increments("id").primary();
    t.integer("foam_system_id").unsigned().notNullable().references("foam_systems.id").onDelete("CASCADE");
    t.integer("apparatus_id").unsigned().notNullable().references("apparatus.id").onDelete("CASCADE");
    t.string("outlet_name", 60).notNullable();
    t.unique(["apparatus_id", "outlet_name"]);
  });

  await knex.schema.createTable("foam_system_maintenance", (t) => {
    t.increments("id").primary();
    t.integer("foam_system_id").unsigned().notNullable().references("foam_systems.id").onDelete("CASCADE");
    t.enum("kind", ["flush", "prime", "strainer", "changeover"]).notNullable();
    t.enum("flush_reason", ["after_use", "before_change", "scheduled"]).nullable();
    t.datetime("performed_at").notNullable();
    t.integer("performed_by").unsigned().notNullable().references("users.id");
    t.text("notes").nullable();
    t.decimal("water_gal", 12, 3).nullable();
    t.decimal("concentrate_disposed_gal", 12, 3).nullable();
    t.integer("event_id").unsigned().nullable().references("events.id").onDelete("SET NULL");
    t.integer("from_product_id").unsigned().nullable().references("foam_products.id");
    t.integer("to_product_id").unsigned().nullable().references("foam_products.id");
    t.text("rinse_procedure").nullable();
    t.string("verification_result", 200).nullable();
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.index(["foam_system_id", "kind", "performed_at"]);
  });

  await knex.schema.createTable("foam_accuracy_tests", (t) => {
    t.increments("id").primary();
    t.integer("foam_system_id").unsigned().notNullable().references("foam_systems.id").onDelete("CASCADE");
    t.datetime("tested_at").notNullable();
    t.integer("tested_by").unsigned().notNullable().references("users.id");
    t.enum("method", ["refractometer", "conductivity", "flow"]).notNullable();
    t.enum("foam_class", ["A", "B"]).notNullable();
    t.integer("product_id").unsigned().nullable().references("foam_products.id");
    t.decimal("rated_percent", 8, 4).notNullable();
    t.decimal("set_percent", 8, 4).nullable();
    t.decimal("water_flow_gpm", 10, 2).nullable();
    t.text("readings_json").notNullable();
    t.decimal("achieved_percent", 10, 5).notNullable();
    t.double("slope").nullable();
    t.double("intercept").nullable();
    t.double("r2").nullable();
    t.decimal("band_low", 8, 4).notNullable();
    t.decimal("band_high", 8, 4).notNullable();
    t.boolean("pass").notNullable();
    t.text("notes").nullable();
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.index(["foam_system_id", "tested_at"]);
  });

  // One reminder per system, due date and stage, so a rerun never mails twice.
  await knex.schema.createTable("foam_system_reminders", (t) => {
    t.increments("id").primary();
    t.integer("foam_system_id").unsigned().notNullable().references("foam_systems.id").onDelete("CASCADE");
    t.enum("duty", ["accuracy_test", "flush"]).notNullable();
    t.enum("stage", ["due_soon", "overdue"]).notNullable();
    t.date("due_on").notNullable();
    t.integer("mail_id").unsigned().nullable();
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.unique(["foam_system_id", "duty", "stage", "due_on"]);
  });

  await knex.schema.alterTable("discharges", (t) => {
    t.integer("foam_system_id").unsigned().nullable().references("foam_systems.id").onDelete("SET NULL");
    t.index(["foam_system_id"]);
  });

  await knex.schema.alterTable("agency_settings", (t) => {
    t.smallint("accuracy_test_interval_months").unsigned().notNullable().defaultTo(12);
    t.smallint("flush_interval_days").unsigned().notNullable().defaultTo(90);
  });

  const apparatus = await knex("apparatus").select(
    "id",
    "proportioner_type",
    "proportioner_max_concentrate_gpm",
    "water_flow_min_gpm",
    "water_flow_max_gpm",
    "concentrate_tank_gal",
  );
  for (const row of apparatus) {
    const known =
      row.proportioner_type != null ||
      row.proportioner_max_concentrate_gpm != null ||
      row.water_flow_min_gpm != null ||
      row.water_flow_max_gpm != null ||
      row.concentrate_tank_gal != null;
    if (!known) continue;
    const systemType = FROM_PROPORTIONER[row.proportioner_type as string] ?? "other";
    const [systemId] = await knex("foam_systems").insert({
      apparatus_id: row.id,
      name: "Foam system",
      system_type: systemType,
      percent_of: systemType === "direct_injection" ? "water" : "solution",
      max_concentrate_gpm: row.proportioner_max_concentrate_gpm,
      water_flow_min_gpm: row.water_flow_min_gpm,
      water_flow_max_gpm: row.water_flow_max_gpm,
    });
    if (row.concentrate_tank_gal != null) {
      const product = await knex("discharges")
        .where({ apparatus_id: row.id })
        .whereNotNull("product_id")
        .orderBy("id", "desc")
        .first("product_id");
      await knex("foam_system_tanks").insert({
        foam_system_id: systemId,
        name: "Tank",
        capacity_gal: row.concentrate_tank_gal,
        product_id: product?.product_id ?? null,
      });
    }
    const outlets = await knex("apparatus_outlets").where({ apparatus_id: row.id }).select("name");
    if (outlets.length) {
      await knex("foam_system_outlets").insert(
        outlets.map((outlet) => ({ foam_system_id: systemId, apparatus_id: row.id, outlet_name: outlet.name })),
      );
    }
    await knex("discharges").where({ apparatus_id: row.id }).update({ foam_system_id: systemId });
  }
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("agency_settings", (t) => {
    t.dropColumn("flush_interval_days");
    t.dropColumn("accuracy_test_interval_months");
  });
  await knex.schema.alterTable("discharges", (t) => {
    t.dropForeign(["foam_system_id"]);
    t.dropIndex(["foam_system_id"]);
    t.dropColumn("foam_system_id");
  });
  for (const table of [
    "foam_system_reminders",
    "foam_accuracy_tests",
    "foam_system_maintenance",
    "foam_system_outlets",
    "foam_system_tanks",
    "foam_systems",
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}
