import type { Knex } from "knex";
import {
  addStockLocation,
  apparatusTankLocation,
  tankFill,
  moveStock,
  postReportStock,
  receiveStock,
  recordStockCount,
  setReorderPoint,
  stationStoreLocation,
  stockItems,
} from "../app/models/stock.server";
import { queueStockAlerts } from "../app/models/stock-alerts.server";
import type { Refusal } from "../app/lib/refusal";

// Demo data only: a year (December 2025 – November 2026) of the invented Alder Bend district's
// concentrate stock. Deliveries of invented lots, tank fills, every filed demo report's use and
// refills posted as the app posts them, quality samples, a count with a variance, a product below
// its reorder point, an expired Class A lot, and the legacy AR-AFFF held for disposal with part of
// it already sent to a hauler. Shelf lives are invented demo values.

const SHELF_LIFE_MONTHS: Record<string, number> = { "class-a": 60, f3: 120, "ar-afff": 240 };

function must<T extends { kind: "done" }>(outcome: T | Refusal): T {
  if (outcome.kind !== "done") throw new Error(`demo stock: ${outcome.message}`);
  return outcome;
}

export async function seed(knex: Knex): Promise<void> {
  if (await knex("stock_movements").first("id")) return;
  const keeper = await knex("users").where({ email: "enviro@alderbend.example" }).first("id", "email");
  if (!keeper) return;
  const actor = { id: keeper.id as number, email: keeper.email as string };
  const product = async (type: string) =>
    (await knex("foam_products").where({ foam_type: type }).first("id"))?.id as number;
  const classA = await product("class-a");
  const f3 = await product("f3");
  const legacy = await product("ar-afff");
  const station = async (code: string) => (await knex("stations").where({ code }).first("id")).id as number;
  const unit = async (unitId: string) => (await knex("apparatus").where({ unit_id: unitId }).first("id"))?.id as number;
  if (!classA || !f3 || !legacy) return;
  for (const [type, months] of Object.entries(SHELF_LIFE_MONTHS)) {
    await knex("foam_products").where({ foam_type: type }).update({ shelf_life_months: months });
  }

  const at = (day: string | Date) => (day instanceof Date ? day : new Date(`${day}T15:00:00Z`));
  const locations = await knex.transaction(async (trx) => ({
    s1: await stationStoreLocation(trx, await station("S1")),
    s2: await stationStoreLocation(trx, await station("S2")),
    s3: await stationStoreLocation(trx, await station("S3")),
    e1: await apparatusTankLocation(trx, await unit("E1")),
    e2: await apparatusTankLocation(trx, await unit("E2")),
    e3: await apparatusTankLocation(trx, await unit("E3")),
    br3: await apparatusTankLocation(trx, await unit("BR3")),
    ft1: await apparatusTankLocation(trx, await unit("FT1")),
  }));
  await knex("stock_locations")
    .where({ id: locations.ft1 })
    .update({ kind: "foam_tender", name: "Foam Tender 1 tanks" });
  const cache = must(
    await addStockLocation(
      actor,
      { kind: "cache", name: "District mutual-aid cache (demo)", stationId: null, apparatusId: null },
      undefined,
      knex,
    ),
  ).id;

  const receive = async (
    locationId: number,
    productId: number,
    lotNumber: string,
    manufacturedOn: string,
    container: "pail" | "drum" | "tote",
    containerGal: number,
    containerCount: number,
    receivedOn: string,
    deliveryReference: string,
  ) =>
    must(
      await receiveStock(
        actor,
        {
          locationId,
          version: null,
          productId,
          lotNumber,
          manufacturedOn,
          container,
          containerGal,
          containerCount,
          supplier: "Prairie Fire Supply Co. (invented)",
          deliveryReference,
          receivedOn,
        },
        undefined,
        knex,
      ),
    ).lotId;
  const move = async (
    kind: "transferred" | "sampled" | "disposed",
    from: number,
    to: number | null,
    productId: number,
    gal: number,
    day: string | Date,
    reason: string,
    reference = "",
    lotId: number | null = null,
  ) =>
    must(
      await moveStock(
        actor,
        {
          kind,
          locationId: from,
          toLocationId: to,
          version: null,
          productId,
          lotId,
          gal,
          at: at(day),
          reason,
          reference,
        },
        undefined,
        knex,
      ),
    );

  // The book's opening balances: legacy foam bought long ago, and an old Class A lot at South Fork.
  const legacyLot = await receive(
    locations.s1,
    legacy,
    "LEG-2009-114",
    "2009-04-20",
    "drum",
    55,
    5,
    "2010-02-01",
    "Opening balance (demo)",
  );
  // Past its shelf life by the demo year (the alerts' expired lot): the top-ups below leave it in the store.
  const expiredLot = await receive(
    locations.s3,
    classA,
    "CA-2003-118",
    "2020-03-10",
    "pail",
    5,
    3,
    "2020-06-15",
    "Opening balance (demo)",
  );
  await move(
    "transferred",
    locations.s1,
    locations.ft1,
    legacy,
    100,
    "2025-12-01",
    "Legacy foam carried on the tender",
  );

  // December deliveries, then the tanks filled from the stores.
  await receive(locations.s1, f3, "F3-2510-A07", "2025-10-15", "drum", 55, 8, "2025-12-03", "PO 26-0112 (demo)");
  const classALot = await receive(
    locations.s1,
    classA,
    "CA-2510-221",
    "2025-10-02",
    "pail",
    5,
    40,
    "2025-12-03",
    "PO 26-0112 (demo)",
  );
  await receive(locations.s2, classA, "CA-2510-221", "2025-10-02", "pail", 5, 30, "2025-12-04", "PO 26-0112 (demo)");
  await receive(locations.s3, f3, "F3-2510-A07", "2025-10-15", "pail", 5, 24, "2025-12-04", "PO 26-0112 (demo)");
  await receive(cache, f3, "F3-2510-A07", "2025-10-15", "tote", 275, 1, "2025-12-05", "PO 26-0113 (demo)");
  await move("transferred", locations.s1, locations.e1, classA, 25, "2025-12-06", "Fill E1 Class A tank");
  await move("transferred", locations.s2, locations.e2, classA, 15, "2025-12-06", "Fill E2 Class A tank");
  await move("transferred", locations.s1, locations.s3, classA, 60, "2025-12-07", "Stock South Fork");
  await move(
    "transferred",
    locations.s3,
    locations.br3,
    classA,
    5,
    "2025-12-07",
    "Fill BR3 Class A tank",
    "",
    classALot,
  );
  await move("transferred", locations.s1, locations.ft1, f3, 150, "2025-12-08", "Fill Foam Tender 1 F3 tank");
  // E3's one system is Class B direct injection: its 50 gal tank (the catalogue figure) holds F3 only.
  await move("transferred", locations.s1, locations.e3, f3, 50, "2025-12-08", "Fill E3 Class B tank");

  // Spring delivery and the annual quality samples (NFPA 11 §13.2.6).
  await receive(locations.s1, classA, "CA-2603-045", "2026-03-01", "pail", 5, 20, "2026-04-02", "PO 26-0388 (demo)");
  await move("sampled", locations.s1, null, f3, 0.25, "2026-01-20", "Annual quality sample", "LAB-26-0031 (demo)");
  await move(
    "sampled",
    locations.s1,
    null,
    classA,
    0.25,
    "2026-01-20",
    "Annual quality sample",
    "LAB-26-0032 (demo)",
    classALot,
  );

  // Every filed demo report's use and refills, as filing posts them; after each call the crew tops
  // the apparatus tanks back up to full from the station store, as far as its sound lots go.
  const tankFills: [number, number, number, number][] = [
    [locations.e1, locations.s1, classA, 25],
    [locations.e2, locations.s2, classA, 15],
    [locations.br3, locations.s3, classA, 5],
    [locations.e3, locations.s1, f3, 50],
    [locations.ft1, locations.s1, f3, 150],
  ];
  const hundredthsDown = (gal: number) => Math.floor(gal * 100 + 1e-6) / 100;
  const topUp = async (on: Date) => {
    for (const [tank, store, productId, full] of tankFills) {
      const inTank = (await stockItems({ locationId: tank, productId }, knex)).reduce(
        (sum, item) => sum + item.onHandGal,
        0,
      );
      // A transfer beyond the tank's capacity is refused: fill only the room left in it.
      const fill = (await tankFill(knex)).find((row) => row.locationId === tank);
      const room = fill?.capacityGal == null ? Infinity : fill.capacityGal - fill.onHandGal;
      // Back to full to the hundredth: a tank left short would let the next call draw past what the
      // book holds, booked as "lot not known" below zero that no later fill offsets.
      let wanted = hundredthsDown(Math.min(full - inTank, room));
      const lots = (await stockItems({ locationId: store, productId }, knex)).filter(
        (item) => item.lot && item.lot.id !== expiredLot && item.onHandGal > 0,
      );
      for (const item of lots) {
        const gal = hundredthsDown(Math.min(wanted, item.onHandGal));
        if (gal < 0.01) continue;
        await move("transferred", store, tank, productId, gal, on, "Top-up after the call", "", item.lot!.id);
        wanted = Math.round((wanted - gal) * 100) / 100;
      }
    }
  };
  const events: Array<{ id: number; cleared_at: Date | null; started_at: Date }> = await knex("events")
    .whereIn("status", ["filed", "returned", "accepted"])
    .orderBy("started_at")
    .select("id", "started_at", "cleared_at");
  for (const event of events) {
    await knex.transaction((trx) => postReportStock(trx, event.id, actor));
    // An hour after the call cleared, so that the book never shows a tank filled before its call.
    await topUp(new Date((event.cleared_at ?? event.started_at).getTime() + 3_600_000));
  }

  // The legacy AR-AFFF is held for disposal from now on; the first drums went to a licensed hauler.
  await knex("foam_products").where({ id: legacy }).update({ held_for_disposal: true });
  await move(
    "disposed",
    locations.s1,
    null,
    legacy,
    110,
    "2026-09-14",
    "Two drums to the licensed hauler for incineration (demo)",
    "MANIFEST 026-44817 (demo)",
    legacyLot,
  );

  // A count at Millrace that found one cracked pail, and a reorder point Millrace is below.
  const millrace = (await stockItems({ locationId: locations.s2 }, knex)).filter((item) => item.onHandGal > 0);
  if (millrace.length) {
    must(
      await recordStockCount(
        actor,
        {
          locationId: locations.s2,
          version: null,
          countedAt: at("2026-10-30"),
          reason: "One pail cracked in storage; contents absorbed and bagged (demo)",
          lines: millrace.map((item, index) => ({
            productId: item.product.id,
            lotId: item.lot?.id ?? null,
            countedGal: index === 0 ? Math.max(0, item.onHandGal - 2.5) : item.onHandGal,
          })),
        },
        undefined,
        knex,
      ),
    );
  }
  must(await setReorderPoint(actor, { locationId: locations.s2, productId: classA, reorderGal: 30 }, undefined, knex));
  must(await setReorderPoint(actor, { locationId: locations.s1, productId: f3, reorderGal: 110 }, undefined, knex));
  must(await setReorderPoint(actor, { locationId: locations.s1, productId: classA, reorderGal: 40 }, undefined, knex));
  await knex.transaction((trx) => queueStockAlerts(trx));
}
