import type { Knex } from "knex";

// A draft keeps exactly what was typed, valid or not, so that nothing is lost between visits.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("events", (t) => {
    t.specificType("draft_json", "LONGTEXT").nullable();
    // Warnings about the event as a whole (a tank drawdown that does not match), as JSON.
    t.text("event_warnings").nullable();
    t.index(["status", "updated_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("events", (t) => {
    t.dropIndex(["status", "updated_at"]);
    t.dropColumn("draft_json");
    t.dropColumn("event_warnings");
  });
}
