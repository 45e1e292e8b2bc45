import type { Knex } from "knex";

/**
 * Every event row carries a stamp that a trigger raises on each UPDATE, whatever makes it (a save, a
 * review, a geography recheck, a class total, a hand-made correction in SQL). Answers built from
 * event rows can then be kept per row and rebuilt for the rows whose stamp moved (decision 181).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("events", (t) => {
    t.bigInteger("row_stamp").unsigned().notNullable().defaultTo(0);
  });
  await knex.raw("DROP TRIGGER IF EXISTS events_row_stamp");
  await knex.raw(`
    CREATE DEFINER = CURRENT_USER TRIGGER events_row_stamp BEFORE UPDATE ON events FOR EACH ROW
    SET NEW.row_stamp = OLD.row_stamp + 1`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("DROP TRIGGER IF EXISTS events_row_stamp");
  await knex.schema.alterTable("events", (t) => {
    t.dropColumn("row_stamp");
  });
}
