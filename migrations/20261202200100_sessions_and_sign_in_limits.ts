import type { Knex } from "knex";

/**
 * Sessions live in the database so that signing out, a password change, deactivation or an
 * administrator's "End sessions" ends them on every app server; the cookie carries only a random id.
 * Sign-in throttles live here too (rate-limiter-flexible's MySQL layout), shared by every app server.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("sessions", (t) => {
    // SHA-256 of the cookie's random id: a copy of this table signs no one in.
    t.string("id_hash", 64).primary();
    t.integer("user_id").unsigned().nullable().references("users.id").onDelete("CASCADE");
    t.text("data").notNullable();
    t.timestamp("expires_at", { precision: 3 }).notNullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("updated_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["user_id"]);
    t.index(["expires_at"]);
  });
  // The exact layout RateLimiterMySQL expects (key, points, expire in epoch milliseconds).
  await knex.raw(`CREATE TABLE sign_in_limits (
    \`key\` VARCHAR(255) CHARACTER SET utf8mb4 NOT NULL,
    \`points\` INT(9) NOT NULL DEFAULT 0,
    \`expire\` BIGINT UNSIGNED,
    PRIMARY KEY (\`key\`),
    KEY sign_in_limits_expire (\`expire\`)
  ) ENGINE = InnoDB`);
  await knex.schema.dropTableIfExists("sign_in_attempts");
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.createTable("sign_in_attempts", (t) => {
    t.bigIncrements("id").primary();
    t.string("email", 254).notNullable();
    t.string("client_address", 64).notNullable();
    t.boolean("succeeded").notNullable();
    t.timestamp("attempted_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["email", "attempted_at"]);
    t.index(["client_address", "attempted_at"]);
  });
  await knex.schema.dropTableIfExists("sign_in_limits");
  await knex.schema.dropTableIfExists("sessions");
}
