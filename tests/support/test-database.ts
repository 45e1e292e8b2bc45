import knexFactory, { type Knex } from "knex";
import { connectionTo, recreateDatabase, throwawayName } from "../../scripts/throwaway-database";

export function testDatabaseName(): string {
  return throwawayName(process.env.TEST_DB_NAME, "foamtally_test", "foamtally_test");
}

/** Drops and recreates the test database, then migrates it from zero (as the migration account, see knexfile.ts). */
export async function freshTestDatabase({ seed = false } = {}): Promise<void> {
  const name = testDatabaseName();
  await recreateDatabase(name);
  const database = knexFactory(connectionTo(name));
  try {
    await database.migrate.latest();
    if (seed) await database.seed.run();
  } finally {
    await database.destroy();
  }
}

/** The test database as the migration account (the schema's owner): for set-up and for reading back. */
export function testKnex(): Knex {
  return knexFactory(connectionTo(testDatabaseName()));
}

/** The test database as the app's own account, which may only read and write rows. */
export function appAccountKnex(): Knex {
  const config = connectionTo(testDatabaseName());
  return knexFactory({
    ...config,
    connection: {
      ...(config.connection as Knex.MySqlConnectionConfig),
      user: process.env.DB_USER || "foamtally",
      password: process.env.DB_PASSWORD ?? "",
    },
  });
}
