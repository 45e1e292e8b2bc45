// The demo's year of concentrate stock, seeded into a database of its own: a product below its
// reorder point, an expired lot, the legacy AR-AFFF held for disposal, and every filed report's use
// posted once.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { currentStockConditions } from "~/models/stock-alerts.server";
import { stockItems, tankFill } from "~/models/stock.server";
import { privateDatabase } from "../support/test-database";

const demo = privateDatabase("stock_seed");
const knex = demo.knex;

// The demo's order, with the foam systems whose tanks are the stock's apparatus locations.
const SEEDS = [
  "01_agency_and_accounts.ts",
  "02_catalogue.ts",
  "02_foam_systems.ts",
  "03_events.ts",
  "08_foam_system_records.ts",
  "08_stock.ts",
];

beforeAll(() => demo.seed(SEEDS), 180_000);
afterAll(() => demo.drop());

describe("the demo stock book", () => {
  it("covers the demo year and posts each filed report's concentrate exactly once", async () => {
    const span = await knex("stock_movements")
      .where("at", ">=", "2025-12-01")
      .min({ first: "at" })
      .max({ last: "at" })
      .first();
    expect(new Date(span!.first).toISOString() < "2026-01-01").toBe(true);
    expect(new Date(span!.last).toISOString() >= "2026-11-01").toBe(true);
    const events = await knex("events as e")
      .whereIn("e.status", ["filed", "returned", "accepted"])
      .select(
        "e.id",
        knex.raw(
          "(SELECT COALESCE(SUM(d.concentrate_gal), 0) FROM discharges d WHERE d.event_id = e.id AND d.product_id IS NOT NULL) AS concentrate",
        ),
      );
    expect(events.length).toBeGreaterThan(10);
    for (const event of events) {
      const used = await knex("stock_movements")
        .where({ event_id: event.id, kind: "used" })
        .sum({ gal: "gal" })
        .first();
      expect(-Number(used?.gal ?? 0)).toBeCloseTo(Number(event.concentrate), 3);
    }
  });

  it("has a product below its reorder point, an expired lot, and legacy foam held for disposal", async () => {
    const conditions = await currentStockConditions(knex, "2026-12-02");
    expect(conditions.some((condition) => condition.kind === "reorder")).toBe(true);
    expect(conditions.some((condition) => condition.kind === "expired")).toBe(true);
    const held = (await stockItems({}, knex)).filter((item) => item.product.heldForDisposal);
    expect(held.reduce((sum, item) => sum + item.onHandGal, 0)).toBeGreaterThan(0);
    expect(
      await knex("stock_movements").where({ kind: "disposed" }).whereNot({ reference: "" }).first("id"),
    ).toBeTruthy();
    expect(await knex("mail_outbox").where({ kind: "stock_alert" }).first("id")).toBeTruthy();
  });

  it("holds no figure below zero anywhere: every lot, and concentrate whose lot is not known", async () => {
    const lines: Array<{ location: string; product: string; lot: string | null; gal: unknown }> = await knex(
      "stock_movements as m",
    )
      .join("stock_locations as l", "l.id", "m.location_id")
      .join("foam_products as p", "p.id", "m.product_id")
      .leftJoin("stock_lots as t", "t.id", "m.lot_id")
      .groupBy("l.name", "p.name", "t.lot_number")
      .select("l.name as location", "p.name as product", "t.lot_number as lot", knex.raw("SUM(m.gal) AS gal"));
    expect(lines.length).toBeGreaterThan(10);
    const negative = lines.filter((line) => Number(line.gal) < -0.0001);
    expect(negative).toEqual([]);
    // The tanks are back to full after the year's calls, within their capacity.
    for (const tank of await tankFill(knex)) {
      if (tank.capacityGal == null) continue;
      expect(tank.onHandGal, tank.name).toBeGreaterThanOrEqual(0);
      expect(tank.onHandGal, tank.name).toBeLessThanOrEqual(tank.capacityGal + 0.05);
    }
  });

  it("keeps in each apparatus tank only concentrate of the class its foam system's tank is loaded with", async () => {
    const tanks: Array<{ id: number; name: string; foam_class: string }> = await knex("stock_locations as l")
      .join("foam_system_tanks as k", "k.id", "l.foam_system_tank_id")
      .join("foam_products as p", "p.id", "k.product_id")
      .where("l.kind", "apparatus_tank")
      .select("l.id", "l.name", "p.foam_class");
    expect(tanks.map((tank) => tank.name)).toContain("E3 tank");
    for (const tank of tanks) {
      const held = (await stockItems({ locationId: tank.id }, knex)).filter((item) => item.onHandGal > 0);
      const classes = [...new Set(held.map((item) => item.product.foamClass))];
      expect({ tank: tank.name, classes }).toEqual({ tank: tank.name, classes: held.length ? [tank.foam_class] : [] });
    }
  });
});
