import knexFactory, { type Knex } from "knex";
import { connectionTo, recreateDatabase, throwawayName } from "../../scripts/throwaway-database";

export function testDatabaseName(): string {
  return throwawayName(process.env.TEST_DB_NAME, "foamtally_test", "foamtally_test");
}

/** Drops and recreates the test database, then migrates it from zero. */
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

export function testKnex(): Knex {
  return knexFactory(connectionTo(testDatabaseName()));
}
