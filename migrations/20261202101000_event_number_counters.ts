import type { Knex } from "knex";

// Generated event numbers are allocated from a counter row per series and year, locked in the
// save's transaction, so that reports saved at the same moment never get the same number. The
// incident series' prefix becomes an agency setting.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("event_number_counters", (t) => {
    t.string("series", 8).notNullable();
    t.smallint("year").unsigned().notNullable();
    t.integer("last_sequence").unsigned().notNullable();
    t.primary(["series", "year"]);
  });
  await knex.schema.alterTable("agency_settings", (t) => {
    t.string("event_number_prefix", 6).notNullable().defaultTo("AB");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("agency_settings", (t) => {
    t.dropColumn("event_number_prefix");
  });
  await knex.schema.dropTableIfExists("event_number_counters");
}
