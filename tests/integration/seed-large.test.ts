import { spawnSync } from "node:child_process";
import knexFactory, { type Knex } from "knex";
import { afterAll, describe, expect, it } from "vitest";
import knexConfig from "../../knexfile";
import { testDatabaseName } from "../support/test-database";

const name = `${testDatabaseName()}_large`;

function run(args: string[], database: string) {
  return spawnSync(process.execPath, ["--import", "tsx", "scripts/seed-large.ts", ...args], {
    env: { ...process.env, DB_NAME: database, NODE_OPTIONS: "" },
    encoding: "utf8",
    timeout: 120_000,
  });
}

function connect(database?: string): Knex {
  const connection = { ...(knexConfig.connection as Knex.MySqlConnectionConfig) };
  if (database) connection.database = database;
  else delete connection.database;
  return knexFactory({ ...knexConfig, connection });
}

afterAll(async () => {
  const server = connect();
  await server.raw(`DROP DATABASE IF EXISTS \`${name}\``);
  await server.destroy();
});

describe("npm run seed:large", () => {
  it("refuses the main database without --force, before touching it", () => {
    const outcome = run(["--events", "5"], "foamtally");
    expect(outcome.status).toBe(2);
    expect(outcome.stderr).toMatch(/Refusing to add synthetic events to the main database/);
  });

  it("refuses a count that is not a whole number", () => {
    const outcome = run(["--events", "lots"], name);
    expect(outcome.status).toBe(2);
    expect(outcome.stderr).toMatch(/--events must be a whole number/);
  });

  it("creates, migrates and fills the named database in batches, and says what it did", async () => {
    const outcome = run(["--events", "1203", "--seed", "3"], name);
    expect(outcome.stderr).not.toMatch(/Error/);
    expect(outcome.status).toBe(0);
    expect(outcome.stdout).toMatch(
      /Inserted 1203 events, \d+ discharges, \d+ runoff dispositions and \d+ tank readings/,
    );
    expect(outcome.stdout).toMatch(/checked them against the demo's drainage layers/);
    const knex = connect(name);
    try {
      expect(Number((await knex("events").count({ n: "*" }).first())!.n)).toBe(1203);
      // Every event's stored totals are the sum of its discharges' stored volumes.
      const mismatched = await knex("events")
        .join("discharges", "discharges.event_id", "events.id")
        .groupBy("events.id", "events.concentrate_gal", "events.solution_gal")
        .havingRaw("ABS(events.concentrate_gal - SUM(discharges.concentrate_gal)) > 0.00001")
        .orHavingRaw("ABS(events.solution_gal - SUM(discharges.solution_gal)) > 0.00001")
        .select("events.id");
      expect(mismatched).toEqual([]);
      const orphans = await knex("events")
        .leftJoin("discharges", "discharges.event_id", "events.id")
        .whereNull("discharges.id")
        .count({ n: "*" })
        .first();
      expect(Number(orphans!.n)).toBe(0);
      // The PFAS and geography sheets have rows to work on: PFAS-containing lines, and events checked
      // against the demo's layers, inside a basin and near a waterway.
      const share = async (query: Knex.QueryBuilder) => Number((await query.count({ n: "*" }).first())!.n) / 1203;
      expect(await share(knex("events").where({ pfas_containing: true }))).toBeGreaterThan(0.005);
      expect(await share(knex("events").whereNotNull("geo_checked_at"))).toBe(1);
      expect(await share(knex("events").whereNotNull("drainage_basin"))).toBeGreaterThan(0.5);
      expect(await share(knex("events").whereNotNull("nearest_waterway"))).toBeGreaterThan(0.5);
    } finally {
      await knex.destroy();
    }
  });
});
