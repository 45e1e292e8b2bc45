import type { Knex } from "knex";

// Password-reset links: only a SHA-256 of each link's secret is kept, with its expiry and the time
// it was used, so that a link works once and a copy of this table opens no account.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("password_resets", (t) => {
    t.increments("id").primary();
    t.integer("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.string("token_hash", 64).notNullable().unique();
    // Who asked: the person themselves (null) or an administrator's "send reset link".
    t.integer("requested_by").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("expires_at", { precision: 3 }).notNullable();
    t.timestamp("used_at", { precision: 3 }).nullable();
    t.index(["user_id", "used_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("password_resets");
}
