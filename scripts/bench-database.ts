// The throwaway database a benchmark fills: dropped, created and migrated afresh, named by
// BENCH_DB_NAME (or the benchmark's default) and refused unless its name starts foamtally_bench.
import knexFactory, { type Knex } from "knex";
import config from "../knexfile";

export function benchDatabaseName(fallback: string): string {
  const name = process.env.BENCH_DB_NAME || fallback;
  if (!/^foamtally_bench\w*$/.test(name)) throw new Error(`Refusing to use ${name} as a throwaway database`);
  return name;
}

function serverConnection(): Knex {
  return knexFactory({ ...config, connection: { ...(config.connection as object), database: undefined } });
}

/** A fresh, migrated database of that name, with the agency's settings row; the caller destroys the connection. */
export async function freshBenchDatabase(name: string, agency: Record<string, unknown>): Promise<Knex> {
  const server = serverConnection();
  await server.raw(`DROP DATABASE IF EXISTS \`${name}\``);
  await server.raw(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await server.destroy();
  const knex = knexFactory({ ...config, connection: { ...(config.connection as object), database: name } });
  await knex.migrate.latest();
  await knex("agency_settings").insert({ id: 1, report_recipients: "", release_alert_recipients: "", ...agency });
  return knex;
}

export async function dropBenchDatabase(name: string): Promise<void> {
  const server = serverConnection();
  await server.raw(`DROP DATABASE IF EXISTS \`${name}\``);
  await server.destroy();
}
