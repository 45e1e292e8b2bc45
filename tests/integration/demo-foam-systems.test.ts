import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { listFleet } from "~/models/foam-system.server";
import { privateDatabase } from "../support/test-database";

// The demo's foam systems, seeded into a database of their own with the catalogue and events around them.
const demo = privateDatabase("seed_systems");
const knex = demo.knex;

const SEEDS = [
  "01_agency_and_accounts.ts",
  "02_catalogue.ts",
  "02_foam_systems.ts",
  "03_events.ts",
  "08_foam_system_records.ts",
];

beforeAll(() => demo.seed(SEEDS), 180_000);
afterAll(() => demo.drop());

describe("the demo's foam systems", () => {
  it("give each of the five apparatus a system with a year of flushes and at least one test", async () => {
    const systems = await knex("foam_systems as s")
      .join("apparatus as a", "a.id", "s.apparatus_id")
      .select("s.id", "a.unit_id");
    expect(systems.map((system) => system.unit_id).sort()).toEqual(["BR3", "E1", "E2", "E3", "FT1"]);
    for (const system of systems) {
      const flushes = await knex("foam_system_maintenance")
        .where({ foam_system_id: system.id, kind: "flush" })
        .orderBy("performed_at");
      expect(flushes.length, system.unit_id).toBeGreaterThanOrEqual(5);
      const span = new Date(flushes.at(-1)!.performed_at).getTime() - new Date(flushes[0].performed_at).getTime();
      expect(span / 86_400_000, system.unit_id).toBeGreaterThan(330);
      expect(await knex("foam_accuracy_tests").where({ foam_system_id: system.id }), system.unit_id).not.toHaveLength(
        0,
      );
    }
    // Every demo usage line is on its apparatus's system.
    expect(await knex("discharges").whereNotNull("apparatus_id").whereNull("foam_system_id")).toHaveLength(0);
  });

  it("show one system overdue and one failed and retested; the flush reports are linked", async () => {
    const fleet = await listFleet({ connection: knex, now: new Date("2026-12-02T18:00:00Z") });
    const byUnit = new Map(fleet.map((item) => [item.apparatus, item]));
    expect(byUnit.get("BR3")).toMatchObject({ status: "overdue", nextTestDue: "2026-11-18" });
    expect(fleet[0].apparatus).toBe("BR3");
    expect(fleet.filter((item) => item.status === "overdue")).toHaveLength(1);
    const ft1 = byUnit.get("FT1")!;
    expect(ft1).toMatchObject({ systemStatus: "in_service", lastTestPass: true });
    const tests = await knex("foam_accuracy_tests").where({ foam_system_id: ft1.id }).orderBy("tested_at");
    expect(tests.map((test) => Boolean(test.pass))).toEqual([false, true]);
    const linked = await knex("foam_system_maintenance").whereNotNull("event_id");
    expect(linked.length).toBeGreaterThan(0);
    const changeover = await knex("foam_system_maintenance")
      .where({ foam_system_id: ft1.id, kind: "changeover" })
      .first();
    expect(changeover.rinse_procedure).toMatch(/rinsed/);
  });
});
