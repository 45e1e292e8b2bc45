import type { Knex } from "knex";

// Whether release alerts also go to every active chief (issue 10 §2: "the chief also receives release alerts").
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("agency_settings", (t) => {
    t.boolean("release_alerts_to_chief").notNullable().defaultTo(true);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("agency_settings", (t) => {
    t.dropColumn("release_alerts_to_chief");
  });
}
