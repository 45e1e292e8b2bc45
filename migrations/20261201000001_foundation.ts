import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("agency_settings", (t) => {
    t.tinyint("id").unsigned().primary();
    t.string("name", 200).notNullable();
    t.string("time_zone", 64).notNullable().defaultTo("America/Chicago");
    t.string("display_units", 8).notNullable().defaultTo("us");
    // 300 ft (91.44 m): USDA Forest Service aerial-application guide; local rules govern.
    t.decimal("waterway_buffer_m", 10, 2).notNullable().defaultTo(91.44);
    t.decimal("drawdown_tolerance_share", 6, 4).notNullable().defaultTo(0.15);
    // 1 lb in 24 h: CERCLA reportable quantity for PFOA/PFOS, 40 CFR 302.4 (89 FR 39124).
    t.decimal("pfas_reportable_lb", 10, 4).notNullable().defaultTo(1);
    t.decimal("class_a_accuracy_share", 6, 4).notNullable().defaultTo(0.3);
    t.text("report_recipients").notNullable().defaultTo("");
    t.text("release_alert_recipients").notNullable().defaultTo("");
    t.timestamp("updated_at").notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable("users", (t) => {
    t.increments("id").primary();
    t.string("email", 254).notNullable().unique();
    t.string("name", 120).notNullable();
    t.string("password_hash", 100).notNullable();
    t.boolean("active").notNullable().defaultTo(true);
    // Bumped on password change or deactivation so that older sessions stop working.
    t.integer("session_epoch").unsigned().notNullable().defaultTo(0);
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at").notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable("user_roles", (t) => {
    t.integer("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.enum("role", ["officer", "environmental", "chief", "records", "admin"]).notNullable();
    t.primary(["user_id", "role"]);
  });

  await knex.schema.createTable("sign_in_attempts", (t) => {
    t.bigIncrements("id").primary();
    t.string("email", 254).notNullable();
    t.string("client_address", 64).notNullable();
    t.boolean("succeeded").notNullable();
    t.timestamp("attempted_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["email", "attempted_at"]);
    t.index(["client_address", "attempted_at"]);
  });

  await knex.schema.createTable("api_tokens", (t) => {
    t.increments("id").primary();
    t.integer("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.string("name", 80).notNullable();
    t.string("token_prefix", 16).notNullable();
    t.string("token_hash", 64).notNullable().unique();
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.timestamp("last_used_at").nullable();
    t.timestamp("revoked_at").nullable();
  });

  await knex.schema.createTable("audit_events", (t) => {
    t.bigIncrements("id").primary();
    t.timestamp("occurred_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.integer("actor_user_id").unsigned().nullable();
    t.string("actor_label", 254).nullable();
    t.string("action", 64).notNullable();
    t.string("entity_type", 40).notNullable();
    t.string("entity_id", 64).nullable();
    t.text("summary").nullable();
    t.specificType("before_json", "LONGTEXT").nullable();
    t.specificType("after_json", "LONGTEXT").nullable();
    t.string("client_address", 64).nullable();
    t.index(["entity_type", "entity_id", "occurred_at"]);
    t.index(["occurred_at"]);
  });

  // The audit log is append-only: the database itself refuses changes and deletions.
  await knex.raw(`
    CREATE TRIGGER audit_events_no_update BEFORE UPDATE ON audit_events FOR EACH ROW
    SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'audit_events is append-only'`);
  await knex.raw(`
    CREATE TRIGGER audit_events_no_delete BEFORE DELETE ON audit_events FOR EACH ROW
    SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'audit_events is append-only'`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("audit_events");
  await knex.schema.dropTableIfExists("api_tokens");
  await knex.schema.dropTableIfExists("sign_in_attempts");
  await knex.schema.dropTableIfExists("user_roles");
  await knex.schema.dropTableIfExists("users");
  await knex.schema.dropTableIfExists("agency_settings");
}
