// Databases that are dropped and made afresh: the test database, the benchmarks' databases and the
// large synthetic seed's. One set-up for all, on the server knexfile.ts names, and each refused
// unless its name says it is throwaway.
import knexFactory, { type Knex } from "knex";
import config from "../knexfile";

/** The name in `envValue` (or `fallback`), refused unless it starts with `prefix`. */
export function throwawayName(envValue: string | undefined, fallback: string, prefix: string): string {
  const name = envValue || fallback;
  if (!new RegExp(`^${prefix}\\w*$`).test(name)) throw new Error(`Refusing to use ${name} as a throwaway database`);
  return name;
}

/** knexfile.ts's configuration on `database`, or on the server alone without one. */
export function connectionTo(database?: string): Knex.Config {
  const connection = { ...(config.connection as Knex.MySqlConnectionConfig) };
  if (database) connection.database = database;
  else delete connection.database;
  return { ...config, connection };
}

async function onServer(statements: string[]): Promise<void> {
  const server = knexFactory(connectionTo());
  try {
    for (const statement of statements) await server.raw(statement);
  } finally {
    await server.destroy();
  }
}

const CREATE = (name: string, ifMissing = false) =>
  `CREATE DATABASE ${ifMissing ? "IF NOT EXISTS " : ""}\`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`;

/** Drops `name` if it exists and creates it empty. */
export function recreateDatabase(name: string): Promise<void> {
  return onServer([`DROP DATABASE IF EXISTS \`${name}\``, CREATE(name)]);
}

/** Creates `name` unless it exists. */
export function createDatabaseIfMissing(name: string): Promise<void> {
  return onServer([CREATE(name, true)]);
}

export function dropDatabase(name: string): Promise<void> {
  return onServer([`DROP DATABASE IF EXISTS \`${name}\``]);
}

/** A benchmark's database: BENCH_DB_NAME or the benchmark's default, starting foamtally_bench. */
export function benchDatabaseName(fallback: string): string {
  return throwawayName(process.env.BENCH_DB_NAME, fallback, "foamtally_bench");
}

/** A fresh, migrated database of that name, with the agency's settings row; the caller destroys the connection. */
export async function freshBenchDatabase(name: string, agency: Record<string, unknown>): Promise<Knex> {
  await recreateDatabase(name);
  const knex = knexFactory(connectionTo(name));
  await knex.migrate.latest();
  await knex("agency_settings").insert({ id: 1, report_recipients: "", release_alert_recipients: "", ...agency });
  return knex;
}

export const dropBenchDatabase = dropDatabase;
