import type { Knex } from "knex";

/**
 * Who was notified of a release, when, by whom, and the case number they gave: a record kept beside
 * the report, because the report itself notifies no one (CERCLA §103, EPCRA §304 require notice
 * immediately; 40 CFR 302.6(a), 355.40).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("release_notifications", (t) => {
    t.increments("id");
    t.integer("event_id").unsigned().notNullable().references("events.id").onDelete("CASCADE");
    t.enum("party", ["national_response_center", "state_spill_line", "local_sewer_authority", "other"]).notNullable();
    t.string("party_detail", 160).notNullable().defaultTo("");
    t.datetime("notified_at").notNullable();
    t.string("notified_by", 160).notNullable();
    t.string("case_number", 80).notNullable().defaultTo("");
    t.text("notes").nullable();
    t.integer("recorded_by").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.datetime("created_at").notNullable().defaultTo(knex.fn.now());
    t.index(["event_id", "notified_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("release_notifications");
}
