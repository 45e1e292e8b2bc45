import type { Knex } from "knex";

/** Optimistic concurrency for the catalogue: a save names the version it started from. */
const TABLES = ["foam_products", "apparatus", "stations"] as const;

export async function up(knex: Knex): Promise<void> {
  for (const table of TABLES) {
    await knex.schema.alterTable(table, (t) => {
      t.integer("version").unsigned().notNullable().defaultTo(1);
    });
  }
}

export async function down(knex: Knex): Promise<void> {
  for (const table of [...TABLES].reverse()) {
    await knex.schema.alterTable(table, (t) => {
      t.dropColumn("version");
    });
  }
}
