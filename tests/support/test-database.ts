import knexFactory, { type Knex } from "knex";
import knexConfig from "../../knexfile";

export function testDatabaseName(): string {
  const name = process.env.TEST_DB_NAME || "foamtally_test";
  if (!/^foamtally_test\w*$/.test(name)) throw new Error(`Refusing to use ${name} as a test database`);
  return name;
}

function connectionWith(database?: string): Knex.Config {
  const connection = { ...(knexConfig.connection as Knex.MySqlConnectionConfig) };
  if (database) connection.database = database;
  else delete connection.database;
  return { ...knexConfig, connection };
}

/** Drops and recreates the test database, then migrates it from zero. */
export async function freshTestDatabase({ seed = false } = {}): Promise<void> {
  const name = testDatabaseName();
  const server = knexFactory(connectionWith());
  try {
    await server.raw(`DROP DATABASE IF EXISTS \`${name}\``);
    await server.raw(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  } finally {
    await server.destroy();
  }
  const database = knexFactory(connectionWith(name));
  try {
    await database.migrate.latest();
    if (seed) await database.seed.run();
  } finally {
    await database.destroy();
  }
}

export function testKnex(): Knex {
  return knexFactory(connectionWith(testDatabaseName()));
}
