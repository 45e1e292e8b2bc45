// The hourly checks: a lot passes its shelf life with no one moving stock or opening a page, and
// the stock keepers hear of it once.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import type { SessionUser } from "~/lib/auth.server";
import { db } from "~/lib/db.server";
import { runScheduledChecks } from "~/models/scheduled-checks.server";
import { receiveStock, stationStoreLocation } from "~/models/stock.server";
import { makeUser } from "../support/factories";
import { ensureAgency, makeProduct, makeStation } from "../support/usage-fixtures";

const stockAlerts = async () => db("mail_outbox").where({ kind: "stock_alert" }).orderBy("id", "desc");

describe("scheduled checks", () => {
  let productId: number;
  let lotNumber: string;

  beforeAll(async () => {
    await ensureAgency();
    const station = await makeStation();
    const keeper = await makeUser(["environmental"], "Keeper Scheduled");
    const actor = {
      id: keeper.id,
      roles: ["environmental"],
      stationId: null,
      email: keeper.email,
      name: keeper.name,
      epoch: 0,
    } as SessionUser;
    productId = (await makeProduct({ foamClass: "A" })).id;
    const storeId = await db.transaction((trx) => stationStoreLocation(trx, station.id));
    lotNumber = `SCH-${randomUUID().slice(0, 6)}`;
    const received = await receiveStock(actor, {
      locationId: storeId,
      version: (await db("stock_locations").where({ id: storeId }).first("version")).version,
      productId,
      lotNumber,
      manufacturedOn: "2020-01-15",
      container: "pail",
      containerGal: 5,
      containerCount: 2,
      supplier: "Test Supply (test)",
      deliveryReference: "DEL-SCH",
      receivedOn: "2020-02-01",
    });
    expect(received.kind).toBe("done");
  });

  it("mails a lot that has passed its shelf life without any stock change, once", async () => {
    const before = (await stockAlerts()).length;
    // The shelf life is learned later (a corrected safety sheet): nothing in stock moves.
    await db("foam_products").where({ id: productId }).update({ shelf_life_months: 24 });
    const first = await runScheduledChecks();
    expect(first.stockAlerts).toBeGreaterThanOrEqual(1);
    const mails = await stockAlerts();
    expect(mails.length).toBe(before + 1);
    expect(mails[0].text_body).toContain(`Lot ${lotNumber}`);
    expect(mails[0].text_body).toContain("passed its shelf life");

    await runScheduledChecks();
    expect((await stockAlerts()).length).toBe(before + 1);
  });
});
