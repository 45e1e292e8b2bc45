import type { Knex } from "knex";

/** A message taken out of the outbox by hand is kept and marked discarded, never deleted. */
export async function up(knex: Knex): Promise<void> {
  await knex.raw(
    "ALTER TABLE mail_outbox MODIFY status ENUM('queued','sending','sent','failed','discarded') NOT NULL DEFAULT 'queued'",
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex("mail_outbox").where({ status: "discarded" }).update({ status: "failed" });
  await knex.raw(
    "ALTER TABLE mail_outbox MODIFY status ENUM('queued','sending','sent','failed') NOT NULL DEFAULT 'queued'",
  );
}
