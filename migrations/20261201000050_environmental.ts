import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  // A quarter (or any period) marked as submitted: the exact file that went out, its digest, who and when.
  await knex.schema.createTable("quarterly_submissions", (t) => {
    t.increments("id").primary();
    t.date("period_from").notNullable();
    // Last day of the period, inclusive.
    t.date("period_to").notNullable();
    t.string("label", 40).notNullable();
    t.string("file_name", 160).notNullable();
    t.string("content_type", 100).notNullable();
    t.specificType("content", "LONGBLOB").notNullable();
    t.string("sha256", 64).notNullable();
    t.integer("byte_size").unsigned().notNullable();
    t.integer("accepted_reports").unsigned().notNullable().defaultTo(0);
    t.integer("submitted_by").unsigned().notNullable().references("users.id");
    t.timestamp("submitted_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.text("note").nullable();
    t.index(["period_from", "period_to", "submitted_at"]);
  });

  // Outgoing mail is queued inside the transaction that causes it and delivered after commit,
  // so a mail server that is down never loses or blocks a report.
  await knex.schema.createTable("mail_outbox", (t) => {
    t.increments("id").primary();
    // release_alert | returned_report | quarterly_workbook
    t.string("kind", 32).notNullable();
    t.text("to_addresses").notNullable();
    t.string("subject", 250).notNullable();
    t.specificType("text_body", "MEDIUMTEXT").notNullable();
    t.string("attachment_name", 160).nullable();
    t.string("attachment_type", 100).nullable();
    t.specificType("attachment_content", "LONGBLOB").nullable();
    t.integer("event_id").unsigned().nullable().references("events.id").onDelete("SET NULL");
    t.integer("submission_id").unsigned().nullable().references("quarterly_submissions.id").onDelete("SET NULL");
    // queued → sending → sent, or back to queued with a later next_attempt_at, or failed after the last attempt
    t.enum("status", ["queued", "sending", "sent", "failed"]).notNullable().defaultTo("queued");
    t.smallint("attempts").unsigned().notNullable().defaultTo(0);
    t.text("last_error").nullable();
    t.timestamp("next_attempt_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("claimed_at", { precision: 3 }).nullable();
    t.timestamp("sent_at", { precision: 3 }).nullable();
    t.string("message_id", 250).nullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["status", "next_attempt_at"]);
    t.index(["created_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("mail_outbox");
  await knex.schema.dropTableIfExists("quarterly_submissions");
}
