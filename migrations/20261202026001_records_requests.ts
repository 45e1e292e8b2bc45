import type { Knex } from "knex";

/**
 * Public-records requests: the request, its log, the release packages built for it and their
 * files (kept in object storage with their SHA-256), the agency's due-date rule, and the counters
 * that slow a flood of requests from one client address across every app server.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("agency_settings", (t) => {
    // A key of RECORDS_DUE_RULES (app/lib/records/due-date.ts); the statutes are named there.
    t.string("records_due_rule", 32).notNullable().defaultTo("federal");
    // Requests received after this local time count from the next business day.
    t.string("records_office_closes", 5).notNullable().defaultTo("17:00");
    // The agency's own closure days, ISO dates separated by commas or new lines.
    t.text("records_closure_days").nullable();
    // The rule the cover letter names for what is withheld.
    t.string("records_withholding_rule", 300).notNullable().defaultTo("");
  });

  await knex.schema.createTable("records_requests", (t) => {
    t.increments("id").primary();
    t.string("tracking_code", 20).notNullable().unique();
    // received | in_progress | fulfilled | partly_withheld | withheld | withdrawn
    t.string("status", 20).notNullable().defaultTo("received");
    t.string("requester_name", 200).notNullable();
    t.string("requester_email", 254).notNullable();
    t.string("requester_phone", 40).nullable();
    t.string("requester_organisation", 200).nullable();
    t.text("description").notNullable();
    t.date("range_from").nullable();
    t.date("range_to").nullable();
    t.string("place_address", 300).nullable();
    t.decimal("place_lat", 9, 6).nullable();
    t.decimal("place_lon", 9, 6).nullable();
    t.timestamp("received_at", { precision: 3 }).notNullable();
    // The local date the count starts from (day 0) and the due date it gives.
    t.date("counted_from").notNullable();
    t.date("due_on").notNullable();
    t.integer("assignee_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("closed_at", { precision: 3 }).nullable();
    t.index(["status", "due_on"]);
    t.index(["received_at"]);
  });

  await knex.schema.createTable("records_request_log", (t) => {
    t.increments("id").primary();
    t.integer("request_id").unsigned().notNullable().references("records_requests.id").onDelete("CASCADE");
    t.timestamp("at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.integer("actor_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.string("action", 40).notNullable();
    t.text("detail").notNullable();
    t.index(["request_id", "at"]);
  });

  await knex.schema.createTable("records_packages", (t) => {
    t.increments("id").primary();
    t.integer("request_id").unsigned().notNullable().references("records_requests.id").onDelete("CASCADE");
    t.integer("built_by").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("built_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    // The selection and redaction choices the package was built with (JSON).
    t.text("selection").notNullable();
    t.string("manifest_sha256", 64).notNullable();
    t.timestamp("sent_at", { precision: 3 }).nullable();
    t.integer("mail_id").unsigned().nullable();
  });

  await knex.schema.createTable("records_package_files", (t) => {
    t.increments("id").primary();
    t.integer("package_id").unsigned().notNullable().references("records_packages.id").onDelete("CASCADE");
    t.string("file_name", 160).notNullable();
    t.string("content_type", 100).notNullable();
    t.integer("byte_size").unsigned().notNullable();
    t.string("sha256", 64).notNullable();
    t.string("storage_key", 300).notNullable();
  });

  // The table rate-limiter-flexible's MySQL store uses (its own statement, created here).
  await knex.schema.createTable("rate_limits", (t) => {
    t.string("key", 255).notNullable().primary();
    t.integer("points").notNullable().defaultTo(0);
    t.bigInteger("expire").unsigned().nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("rate_limits");
  await knex.schema.dropTableIfExists("records_package_files");
  await knex.schema.dropTableIfExists("records_packages");
  await knex.schema.dropTableIfExists("records_request_log");
  await knex.schema.dropTableIfExists("records_requests");
  await knex.schema.alterTable("agency_settings", (t) => {
    t.dropColumn("records_due_rule");
    t.dropColumn("records_office_closes");
    t.dropColumn("records_closure_days");
    t.dropColumn("records_withholding_rule");
  });
}
