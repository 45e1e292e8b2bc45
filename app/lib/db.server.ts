import knexFactory, { type Knex } from "knex";
import Mysql2Client from "knex/lib/dialects/mysql2/index.js";
import { env } from "./env.server";
import { databaseDownResponse, isDatabaseDown } from "./http.server";

/**
 * The one place a database outage becomes a 503: every query and every connection the app's Knex
 * makes (transactions included, which build their client from this prototype) turns "connection
 * refused / lost / timed out" into the 503 answer pages and APIs show, so no route needs its own
 * `.catch`. Other errors pass unchanged.
 */
export class OutageAwareClient extends (Mysql2Client as unknown as new (config: Knex.Config) => Knex.Client) {
  async acquireConnection(): Promise<unknown> {
    try {
      return await super.acquireConnection();
    } catch (error) {
      throw isDatabaseDown(error) ? databaseDownResponse() : error;
    }
  }

  query(connection: unknown, queryParam: unknown): Promise<unknown> {
    return super.query(connection, queryParam).catch((error: unknown) => {
      throw isDatabaseDown(error) ? databaseDownResponse() : error;
    });
  }
}

declare global {
  var __foamtallyDb: Knex | undefined;
}

function createDb(): Knex {
  const config = env();
  return knexFactory({
    client: OutageAwareClient as unknown as typeof Knex.Client,
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
