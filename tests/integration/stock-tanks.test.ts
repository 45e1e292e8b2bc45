// Stock tanks are the foam systems' tanks: the migration tying each apparatus-tank location to a
// system tank, a transfer refused beyond the tank's capacity, and a report's use drawn from the tank
// of the system its line was placed on.
import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { SessionUser } from "~/lib/auth.server";
import { db } from "~/lib/db.server";
import type { FiledReport } from "~/lib/foam/report-schema";
import { saveReport } from "~/models/event.server";
import { saveFoamSystem } from "~/models/foam-system.server";
import { apparatusTankLocation, moveStock, receiveStock, tankFill } from "~/models/stock.server";
import { makeApparatusRow } from "../support/catalogue-factories";
import { makeUser } from "../support/factories";
import { privateDatabase } from "../support/test-database";
import { ensureAgency, makeProduct, makeStation } from "../support/usage-fixtures";

const MIGRATION = "20261203170001_stock_tank_locations.ts";

describe("the stock-tank migration", () => {
  const database = privateDatabase("tank_locations");
  const knex = database.knex;

  beforeAll(() => database.create());
  afterAll(() => database.drop());

  it("ties each apparatus tank to its system tank, keeps the balance on the first and adds the others", async () => {
    const [, pending] = (await knex.migrate.list()) as [unknown[], Array<{ file: string }>];
    for (const migration of pending) if (migration.file < MIGRATION) await knex.migrate.up({ name: migration.file });

    const [stationId] = await knex("stations").insert({ code: "K1", name: "Tank station" });
    const [twoSystems] = await knex("apparatus").insert({ station_id: stationId, unit_id: "K-E1" });
    const [noLocation] = await knex("apparatus").insert({ station_id: stationId, unit_id: "K-E2" });
    const [productId] = await knex("foam_products").insert({ name: "K Class B", foam_class: "B", foam_type: "f3" });
    const system = async (apparatusId: number, systemName: string, tankName: string, capacity: number) => {
      const [id] = await knex("foam_systems").insert({
        apparatus_id: apparatusId,
        name: systemName,
        system_type: "around_the_pump",
        percent_of: "solution",
      });
      const [tankId] = await knex("foam_system_tanks").insert({
        foam_system_id: id,
        name: tankName,
        capacity_gal: capacity,
        product_id: productId,
      });
      return tankId;
    };
    const firstTank = await system(twoSystems, "Class B pump", "Tank B", 30);
    const secondTank = await system(twoSystems, "Class A injection", "Tank A", 20);
    const loneTank = await system(noLocation, "Class B pump", "Tank", 25);
    const [existing] = await knex("stock_locations").insert({
      kind: "apparatus_tank",
      name: "K-E1 tank",
      station_id: stationId,
      apparatus_id: twoSystems,
    });
    await knex("stock_movements").insert({
      kind: "adjusted",
      location_id: existing,
      product_id: productId,
      gal: 18.5,
      at: new Date("2026-01-05T10:00:00Z"),
    });

    await knex.migrate.up({ name: MIGRATION });

    const locations = await knex("stock_locations").orderBy("id");
    expect(locations).toHaveLength(3);
    expect(locations[0]).toMatchObject({ id: existing, foam_system_tank_id: firstTank, apparatus_id: twoSystems });
    expect(locations[1]).toMatchObject({
      foam_system_tank_id: secondTank,
      apparatus_id: twoSystems,
      kind: "apparatus_tank",
    });
    expect(locations[1].name).toBe("K-E1 Class A injection · Tank A");
    expect(locations[2]).toMatchObject({ foam_system_tank_id: loneTank, apparatus_id: noLocation });
    const balance = await knex("stock_movements").where({ location_id: existing }).sum({ gal: "gal" }).first();
    expect(Number(balance?.gal)).toBe(18.5);
    expect(await knex("stock_movements").whereNot({ location_id: existing }).first()).toBeUndefined();

    // Undone: the further, empty locations go and the one-per-apparatus rule returns.
    await knex.migrate.down({ name: MIGRATION });
    expect(await knex("stock_locations").pluck("id")).toEqual([existing, locations[2].id]);
    expect(await knex.schema.hasColumn("stock_locations", "foam_system_tank_id")).toBe(false);
  });
});

describe("stock in foam system tanks", () => {
  let keeper: SessionUser;
  let officer: SessionUser;
  let stationId: number;
  let apparatusId: number;
  let classB: number;
  let classA: number;
  let pumpSystem: number;
  let injectionSystem: number;
  let storeId: number;

  const session = (
    user: { id: number; email: string; name: string },
    roles: SessionUser["roles"],
    station: number | null,
  ) => ({ id: user.id, email: user.email, name: user.name, roles, stationId: station, epoch: 0 }) as SessionUser;
  const version = async (id: number) => (await db("stock_locations").where({ id }).first("version")).version as number;

  beforeAll(async () => {
    await ensureAgency();
    stationId = (await makeStation()).id;
    keeper = session(await makeUser(["environmental"], "Tank Keeper"), ["environmental"], null);
    officer = session(await makeUser(["officer"], "Tank Officer", { stationId }), ["officer"], stationId);
    const chief = session(await makeUser(["chief"], "Tank Chief"), ["chief"], null);
    classB = (await makeProduct({ foamClass: "B", foamType: "f3" })).id;
    classA = (await makeProduct({ foamClass: "A" })).id;
    apparatusId = (
      await makeApparatusRow({
        stationId,
        outlets: [
          { name: "Bumper line", foamCapable: true, defaultFlowGpm: 95, defaultFlowBasis: "solution" },
          { name: "Crosslay", foamCapable: true, defaultFlowGpm: 95, defaultFlowBasis: "water" },
        ],
      })
    ).id;
    const system = async (name: string, outlets: string, tankCapacityGal: number, tankProductId: number) => {
      const saved = await saveFoamSystem(
        apparatusId,
        null,
        null,
        {
          name,
          systemType: name.includes("injection") ? "direct_injection" : "around_the_pump",
          percentOf: name.includes("injection") ? "water" : "solution",
          maxConcentrateGpm: 10,
          outlets,
          tankName: "Tank",
          tankCapacityGal,
          tankProductId,
        },
        chief as never,
      );
      if ("kind" in saved) throw new Error(saved.message);
      return saved.id;
    };
    pumpSystem = await system("Class B pump", "Bumper line", 30, classB);
    injectionSystem = await system("Class A injection", "Crosslay", 20, classA);
    [storeId] = await db("stock_locations").insert({
      kind: "station_store",
      name: `Tank store ${randomUUID().slice(0, 6)}`,
      station_id: stationId,
    });
    for (const productId of [classB, classA]) {
      const received = await receiveStock(keeper, {
        locationId: storeId,
        version: await version(storeId),
        productId,
        lotNumber: `K-${randomUUID().slice(0, 6)}`,
        manufacturedOn: "2026-01-15",
        container: "drum",
        containerGal: 55,
        containerCount: 1,
        supplier: "Test Supply (test)",
        deliveryReference: "DEL-K",
        receivedOn: "2026-02-01",
      });
      if (received.kind !== "done") throw new Error(received.message);
    }
  });

  const tankOf = (systemId: number) => db.transaction((trx) => apparatusTankLocation(trx, apparatusId, systemId));
  const transfer = async (toLocationId: number, gal: number, productId = classB) =>
    moveStock(keeper, {
      kind: "transferred",
      locationId: storeId,
      toLocationId,
      version: await version(storeId),
      productId,
      gal,
      at: new Date("2026-02-02T10:00:00Z"),
      reason: "Fill the tank",
      reference: "",
    });

  it("gives each system its own tank location, and refuses a transfer beyond the tank's capacity at the quantity", async () => {
    const pumpTank = await tankOf(pumpSystem);
    const injectionTank = await tankOf(injectionSystem);
    expect(pumpTank).not.toBe(injectionTank);
    expect(await tankOf(pumpSystem)).toBe(pumpTank);

    expect((await transfer(pumpTank, 20)).kind).toBe("done");
    const movementsBefore = await db("stock_movements").where({ location_id: pumpTank }).count({ n: "*" }).first();
    const refused = await transfer(pumpTank, 15);
    expect(refused).toMatchObject({ kind: "refused", status: 400 });
    const errors = (refused as { fieldErrors?: Record<string, string[]> }).fieldErrors ?? {};
    expect(errors.gal?.[0]).toMatch(/holds 30 gal and has 20 gal in it: at most 10 gal more fits/);
    expect(await db("stock_movements").where({ location_id: pumpTank }).count({ n: "*" }).first()).toEqual(
      movementsBefore,
    );
    expect((await transfer(pumpTank, 10)).kind).toBe("done");

    const fill = (await tankFill()).find((tank) => tank.locationId === pumpTank);
    expect(fill).toMatchObject({ capacityGal: 30, onHandGal: 30, fillPercent: 100 });
  });

  it("draws a report's use from the tank of the system its line was placed on", async () => {
    const injectionTank = await tankOf(injectionSystem);
    const pumpTank = await tankOf(pumpSystem);
    expect((await transfer(injectionTank, 15, classA)).kind).toBe("done");
    // 100 gpm of water at 1 % of the water for 5 minutes: 5 gal of Class A concentrate.
    const report: FiledReport = {
      kind: "training",
      startedAt: "2026-02-10T09:00",
      address: "1 Drill Yard",
      latitude: 38.7,
      longitude: -98.2,
      stationId,
      discharges: [
        {
          apparatusId,
          outlet: "Crosslay",
          productId: classA,
          percent: 1,
          percentOf: "water",
          flow: 100,
          flowUnit: "gpm",
          basis: "water",
          minutes: 5,
        },
      ],
      dispositions: [{ disposition: "evaporated_unknown", sharePercent: 100 }],
    };
    const saved = await saveReport({
      user: officer,
      intent: "file",
      submissionKey: randomUUID(),
      payload: report,
      report,
    });
    if (saved.kind !== "saved") throw new Error(JSON.stringify(saved));
    const discharge = await db("discharges").where({ event_id: saved.eventId }).first("foam_system_id");
    expect(discharge.foam_system_id).toBe(injectionSystem);
    const used = await db("stock_movements")
      .where({ event_id: saved.eventId, kind: "used" })
      .select("location_id", "gal");
    expect(used).toHaveLength(1);
    expect(used[0].location_id).toBe(injectionTank);
    expect(Number(used[0].gal)).toBeCloseTo(-5, 4);
    expect(
      await db("stock_movements").where({ event_id: saved.eventId, location_id: pumpTank }).first(),
    ).toBeUndefined();
  });
});
