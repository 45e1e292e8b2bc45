import knexFactory, { type Knex } from "knex";
import { connectionTo, dropDatabase, recreateDatabase, throwawayName } from "../../scripts/throwaway-database";

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

/**
 * A database of one test file's own beside the test database (`<test database>_<suffix>`), so that
 * what the file migrates, rolls back or seeds cannot disturb the others. `knex` connects as the
 * migration account; `create` makes the database empty, `seed` also migrates it to the latest and
 * runs the named seed files in order, `drop` closes the connection and removes the database.
 */
export function privateDatabase(suffix: string) {
  const name = `${testDatabaseName()}_${suffix}`;
  const knex = knexFactory(connectionTo(name));
  return {
    name,
    knex,
    create: () => recreateDatabase(name),
    async seed(files: readonly string[]) {
      await recreateDatabase(name);
      await knex.migrate.latest();
      for (const file of files) await knex.seed.run({ specific: file });
    },
    async drop() {
      await knex.destroy();
      await dropDatabase(name);
    },
  };
}
