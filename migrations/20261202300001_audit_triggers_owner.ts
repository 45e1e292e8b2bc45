import type { Knex } from "knex";

/**
 * The audit log's append-only triggers are made again by the account that runs migrations. A trigger
 * runs with its definer's privileges; where an older set-up created them as the app's own account,
 * that account no longer holds TRIGGER, and the refusal would read as a privilege error instead of
 * "append-only".
 */
async function createTriggers(knex: Knex): Promise<void> {
  await knex.raw("DROP TRIGGER IF EXISTS audit_events_no_update");
  await knex.raw("DROP TRIGGER IF EXISTS audit_events_no_delete");
  await knex.raw(`
    CREATE DEFINER = CURRENT_USER TRIGGER audit_events_no_update BEFORE UPDATE ON audit_events FOR EACH ROW
    SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'audit_events is append-only'`);
  await knex.raw(`
    CREATE DEFINER = CURRENT_USER TRIGGER audit_events_no_delete BEFORE DELETE ON audit_events FOR EACH ROW
    SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'audit_events is append-only'`);
}

export async function up(knex: Knex): Promise<void> {
  await createTriggers(knex);
}

export async function down(knex: Knex): Promise<void> {
  // The same triggers stand before and after; rolling back keeps the log append-only.
  await createTriggers(knex);
}
