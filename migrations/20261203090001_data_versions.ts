import type { Knex } from "knex";

// One row per kind of data that app servers keep derived answers of in memory (list totals, the
// map's events, summaries, catalogue facts). Every write of that data gives its row a new stamp
// in the same transaction; a server that holds an answer under an older stamp computes it again.
// The list's totals and map filters read events by date and visibility: the index carries the
// summed columns too, so totals over any date range are read from the index alone.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("data_versions", (t) => {
    t.string("name", 32).primary();
    t.string("stamp", 36).notNullable();
  });
  await knex("data_versions").insert([
    { name: "reports", stamp: knex.raw("UUID()") },
    { name: "catalogue", stamp: knex.raw("UUID()") },
  ]);
  await knex.schema.alterTable("events", (t) => {
    t.index(
      ["started_at", "status", "created_by", "water_gal", "concentrate_gal", "solution_gal"],
      "events_started_visibility_totals",
    );
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("events", (t) => {
    t.dropIndex([], "events_started_visibility_totals");
  });
  await knex.schema.dropTable("data_versions");
}
