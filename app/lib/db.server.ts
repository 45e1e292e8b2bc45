import knexFactory, { type Knex } from "knex";
import { env } from "./env.server";

declare global {
  var __foamtallyDb: Knex | undefined;
}

function createDb(): Knex {
  const config = env();
  return knexFactory({
    client: "mysql2",
    connection: {
      host: config.DB_HOST,
      port: config.DB_PORT,
      user: config.DB_USER,
      password: config.DB_PASSWORD,
      database: config.DB_NAME,
      charset: "utf8mb4",
      timezone: "Z",
      connectTimeout: 5_000,
    },
    pool: { min: 0, max: 10, idleTimeoutMillis: 10_000 },
    acquireConnectionTimeout: 5_000,
  });
}

/** The one Knex instance of the process (kept across dev-server reloads). */
export const db: Knex = (globalThis.__foamtallyDb ??= createDb());

export type Db = Knex | Knex.Transaction;
