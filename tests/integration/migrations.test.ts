import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { privateDatabase } from "../support/test-database";

// Its own database, so that rolling everything back does not disturb other test files.
const database = privateDatabase("migrations");
const knex = database.knex;

beforeAll(() => database.create());
afterAll(() => database.drop());

async function tableNames(): Promise<string[]> {
  const [rows] = await knex.raw("SHOW TABLES");
  return (rows as Record<string, string>[])
    .map((row) => Object.values(row)[0])
    .filter((table) => !table.startsWith("knex_"));
}

describe("migrations", () => {
  // Every migration down and up again takes longer than the default timeout on a loaded machine.
  it("run up from zero, down to zero, and up again", { timeout: 120_000 }, async () => {
    await knex.migrate.latest();
    const tables = await tableNames();
    expect(tables).toEqual(expect.arrayContaining(["users", "user_roles", "audit_events", "events", "discharges"]));

    await knex.migrate.rollback(undefined, true);
    expect(await tableNames()).toEqual([]);

    await knex.migrate.latest();
    expect((await tableNames()).sort()).toEqual(tables.sort());
  });

  it("make the audit log append-only in the database itself", async () => {
    await knex("audit_events").insert({ action: "probe", entity_type: "test" });
    await expect(knex("audit_events").update({ action: "changed" })).rejects.toThrow(/append-only/);
    await expect(knex("audit_events").delete()).rejects.toThrow(/append-only/);
    expect(await knex("audit_events").where({ action: "probe" }).count({ n: "*" })).toEqual([{ n: 1 }]);
  });
});
