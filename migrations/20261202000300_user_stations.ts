import type { Knex } from "knex";

/** A person's own station: the rules on returned and accepted reports compare it with the report's. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("users", (t) => {
    t.integer("station_id").unsigned().nullable().references("stations.id").onDelete("SET NULL");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("users", (t) => {
    t.dropForeign(["station_id"]);
    t.dropColumn("station_id");
  });
}
