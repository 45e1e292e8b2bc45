// The stock book against the real database: receiving, moving and counting concentrate; a filed
// report's use and refills posted exactly once however often it is filed; foam held for disposal;
// readiness; stock alerts; and GET /api/stock and /api/stock/movements agreeing with each other.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import type { Role } from "~/lib/access";
import type { SessionUser } from "~/lib/auth.server";
import { db } from "~/lib/db.server";
import { createApiToken } from "~/models/api-token.server";
import { reviewReport } from "~/models/event.server";
import { moveStock, receiveStock, recordStockCount, setReorderPoint, stockItems } from "~/models/stock.server";
import { queueStockAlerts } from "~/models/stock-alerts.server";
import { stockReadiness } from "~/models/stock-readiness.server";
import { action as updateAction } from "~/routes/api.events.$id";
import { action as createAction } from "~/routes/api.events";
import { loader as stockLoader } from "~/routes/api.stock";
import { loader as movementsLoader } from "~/routes/api.stock.movements";
import { action as stockAction } from "~/routes/stock";
import { action as moveAction } from "~/routes/stock.movements";
import { signIn } from "../support/session";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, jsonRequest, routeArgs, settle } from "../support/requests";
import { ensureAgency, makeApparatus, makeProduct, makeStation } from "../support/usage-fixtures";

const ORIGIN = new URL(jsonRequest("/", {}).url).origin;

let stationId: number;
let engineId: number;
let classB: number;
let officer: { auth: Record<string, string> };
let keeper: SessionUser;
let keeperAuth: Record<string, string>;
let storeId: number;

async function person(roles: Role[], name: string, station: number | null) {
  const user = await makeUser(roles, name, { stationId: station });
  const session = {
    id: user.id,
    roles,
    stationId: station,
    email: user.email,
    name: user.name,
    epoch: 0,
  } as SessionUser;
  const { token } = await createApiToken(session, "stock test");
  return { session, auth: { Authorization: `Bearer ${token}` } };
}

async function answer(run: () => Promise<unknown>) {
  const { value } = await settle(run);
  const response = value as Response;
  return { status: response.status, body: (await response.json()) as Record<string, unknown> };
}

const fileNew = (body: unknown) =>
  answer(() => createAction(routeArgs(jsonRequest("/api/events", body, officer.auth))));
const fileAgain = (id: number, body: unknown, auth = officer.auth) =>
  answer(() =>
    updateAction(
      routeArgs(
        new Request(`${ORIGIN}/api/events/${id}`, {
          method: "PUT",
          body: JSON.stringify(body),
          headers: { "Content-Type": "application/json", Origin: ORIGIN, ...auth },
        }),
        { id: String(id) },
      ),
    ),
  );

const versionOf = async (table: string, id: number) =>
  (await db(table).where({ id }).first("version")).version as number;

function report(minutes: number, extra: Record<string, unknown> = {}) {
  return {
    intent: "file",
    number: `STK-${randomUUID().slice(0, 8)}`,
    kind: "incident",
    startedAt: "2026-06-01T09:00",
    clearedAt: "2026-06-01T11:00",
    address: "12 Stock Lane",
    latitude: 38.7,
    longitude: -98.2,
    stationId,
    // 100 gpm of water at 3 % of the water flow: 3 gal of concentrate a minute (common practice, no source).
    discharges: [
      {
        apparatusId: engineId,
        productId: classB,
        percent: 3,
        percentOf: "water",
        flow: 100,
        flowUnit: "gpm",
        basis: "water",
        minutes,
      },
    ],
    dispositions: [{ disposition: "evaporated_unknown", sharePercent: 100 }],
    tankReadings: [{ apparatusId: engineId, productId: classB, refillGal: 30 }],
    ...extra,
  };
}

async function eventUse(eventId: number) {
  const rows = await db("stock_movements").where({ event_id: eventId }).select("kind", "gal");
  const sum = (kind: string) =>
    rows.filter((row) => row.kind === kind).reduce((total, row) => total + Number(row.gal), 0);
  return { rows: rows.length, used: Number(sum("used").toFixed(4)) };
}

async function onHandAt(locationId: number, productId = classB) {
  return (await stockItems({ locationId, productId })).reduce((sum, item) => sum + item.onHandGal, 0);
}

let tankId: number;
let lotId: number;

beforeAll(async () => {
  await ensureAgency();
  await db("agency_settings").where({ id: 1 }).update({ class_b_attack_solution_gpm: 95, class_b_attack_percent: 3 });
  stationId = (await makeStation()).id;
  engineId = (await makeApparatus(stationId)).id;
  classB = (await makeProduct({ foamClass: "B", foamType: "f3" })).id;
  officer = await person(["officer"], "Stock Officer", stationId);
  const stockKeeper = await person(["environmental"], "Stock Keeper", null);
  keeper = stockKeeper.session;
  keeperAuth = stockKeeper.auth;
  const [store] = await db("stock_locations").insert({
    kind: "station_store",
    name: `Store ${randomUUID().slice(0, 6)}`,
    station_id: stationId,
  });
  storeId = store;
  const [tank] = await db("stock_locations").insert({
    kind: "apparatus_tank",
    name: `Tank ${randomUUID().slice(0, 6)}`,
    station_id: stationId,
    apparatus_id: engineId,
  });
  tankId = tank;
  const received = await receiveStock(keeper, {
    locationId: storeId,
    version: await versionOf("stock_locations", storeId),
    productId: classB,
    lotNumber: `L-${randomUUID().slice(0, 6)}`,
    manufacturedOn: "2026-01-15",
    container: "drum",
    containerGal: 55,
    containerCount: 2,
    supplier: "Test Supply (test)",
    deliveryReference: "DEL-1",
    receivedOn: "2026-02-01",
  });
  if (received.kind !== "done") throw new Error(received.message);
  lotId = received.lotId;
  const moved = await moveStock(keeper, {
    kind: "transferred",
    locationId: storeId,
    toLocationId: tankId,
    version: await versionOf("stock_locations", storeId),
    productId: classB,
    gal: 50,
    at: new Date("2026-02-02T10:00:00Z"),
    reason: "Fill the tank",
    reference: "",
  });
  if (moved.kind !== "done") throw new Error(moved.message);
});

describe("a report's stock", () => {
  it("moves once across filing, return, filing again and a revision", async () => {
    expect(await onHandAt(storeId)).toBe(60);
    expect(await onHandAt(tankId)).toBe(50);

    const filed = await fileNew(report(10));
    expect(filed.status).toBe(201);
    const eventId = filed.body.id as number;
    // 30 gal used from the tank; the 30 gal refill moved from the store into the tank.
    expect((await eventUse(eventId)).used).toBe(-30);
    expect(await onHandAt(tankId)).toBe(50);
    expect(await onHandAt(storeId)).toBe(30);
    const afterFirst = (await eventUse(eventId)).rows;

    const returned = await reviewReport({
      user: keeper,
      eventId,
      version: await versionOf("events", eventId),
      decision: "return",
      comment: "Check the times",
    });
    expect(returned).toEqual({ kind: "done", status: "returned" });
    expect((await eventUse(eventId)).rows).toBe(afterFirst);

    const refiled = await fileAgain(eventId, { ...report(10), version: await versionOf("events", eventId) });
    expect(refiled.status).toBe(200);
    expect(await eventUse(eventId)).toEqual({ rows: afterFirst, used: -30 });

    const accepted = await reviewReport({
      user: keeper,
      eventId,
      version: await versionOf("events", eventId),
      decision: "accept",
    });
    expect(accepted.kind).toBe("done");
    const revised = await fileAgain(
      eventId,
      { ...report(20), version: await versionOf("events", eventId), revisionReason: "The line ran 20 minutes" },
      keeperAuth,
    );
    expect(revised.status).toBe(200);
    // 20 minutes × 3 gpm = 60 gal in all, never 30 + 60.
    expect((await eventUse(eventId)).used).toBe(-60);
    expect(await onHandAt(tankId)).toBe(20);
    expect(await onHandAt(storeId)).toBe(30);
  });

  it("refuses a product held for disposal without a reason at the line, and keeps the reason given", async () => {
    const legacy = (await makeProduct({ foamClass: "B", foamType: "ar-afff", pfasContaining: true })).id;
    await db("foam_products").where({ id: legacy }).update({ held_for_disposal: true });
    const base = report(1);
    const line = { ...base.discharges[0], productId: legacy };
    const before = await db("events").count({ n: "*" }).first();
    const refused = await fileNew({ ...base, discharges: [line], tankReadings: [] });
    expect(refused.status).toBe(400);
    expect(refused.body.errors).toEqual({
      "discharges[0].heldUseReason": [expect.stringContaining("held for disposal")],
    });
    expect(await db("events").count({ n: "*" }).first()).toEqual(before);

    const reason = "Only foam on the rig at a fuel spill; replacement on order";
    const filed = await fileNew({
      ...base,
      number: `STK-${randomUUID().slice(0, 8)}`,
      discharges: [{ ...line, heldUseReason: reason }],
      tankReadings: [],
    });
    expect(filed.status).toBe(201);
    const stored = await db("discharges")
      .where({ event_id: filed.body.id as number })
      .first("held_use_reason");
    expect(stored.held_use_reason).toBe(reason);
    // In stock, held foam goes only to disposal.
    const moved = await moveStock(keeper, {
      kind: "transferred",
      locationId: storeId,
      toLocationId: tankId,
      version: null,
      productId: legacy,
      gal: 1,
      at: new Date(),
      reason: "",
      reference: "",
    });
    expect(moved).toMatchObject({ kind: "refused", fieldErrors: { productId: [expect.stringContaining("disposal")] } });
  });
});

describe("moving and counting stock", () => {
  it("refuses more than the source holds, a lot the location does not hold, and a stale page, writing nothing", async () => {
    const count = async () => Number((await db("stock_movements").count({ n: "*" }).first())!.n);
    const before = await count();
    const base = {
      kind: "transferred" as const,
      locationId: storeId,
      toLocationId: tankId,
      productId: classB,
      at: new Date(),
      reason: "",
      reference: "",
    };
    const tooMuch = await moveStock(keeper, {
      ...base,
      version: await versionOf("stock_locations", storeId),
      gal: 5000,
    });
    expect(tooMuch).toMatchObject({
      kind: "refused",
      status: 400,
      fieldErrors: { gal: [expect.stringContaining("holds")] },
    });
    const emptyTank = (
      await db("stock_locations").insert({ kind: "cache", name: `Cache ${randomUUID().slice(0, 6)}` })
    )[0];
    const wrongLot = await moveStock(keeper, {
      ...base,
      kind: "sampled",
      locationId: emptyTank,
      version: await versionOf("stock_locations", emptyTank),
      lotId,
      gal: 1,
    });
    expect(wrongLot).toMatchObject({ fieldErrors: { lotId: ["This location does not hold this lot."] } });
    const stale = await moveStock(keeper, {
      ...base,
      version: (await versionOf("stock_locations", storeId)) - 1,
      gal: 1,
    });
    expect(stale).toMatchObject({ kind: "conflict" });
    expect(await count()).toBe(before);
  });

  it("draws a lot within its shelf life before an older one past it, and the old one only when the rest runs out", async () => {
    // A 20-year shelf life: the lot made in 2000 ended its life in 2020, the one made in 2020 lasts to 2040.
    const product = (await makeProduct({ foamClass: "B", foamType: "f3" })).id;
    await db("foam_products").where({ id: product }).update({ shelf_life_months: 240 });
    const [cache] = await db("stock_locations").insert({ kind: "cache", name: `Cache ${randomUUID().slice(0, 6)}` });
    const [spare] = await db("stock_locations").insert({ kind: "cache", name: `Spare ${randomUUID().slice(0, 6)}` });
    const receive = async (manufacturedOn: string) => {
      const received = await receiveStock(keeper, {
        locationId: cache,
        version: await versionOf("stock_locations", cache),
        productId: product,
        lotNumber: `SL-${randomUUID().slice(0, 6)}`,
        manufacturedOn,
        container: "pail",
        containerGal: 5,
        containerCount: 2,
        supplier: "Test Supply (test)",
        deliveryReference: "",
        receivedOn: "2026-03-01",
      });
      if (received.kind !== "done") throw new Error(received.message);
      return received.lotId;
    };
    const pastItsLife = await receive("2000-01-01");
    const withinItsLife = await receive("2020-01-01");
    const move = async (gal: number) => {
      const moved = await moveStock(keeper, {
        kind: "transferred",
        locationId: cache,
        toLocationId: spare,
        version: await versionOf("stock_locations", cache),
        productId: product,
        gal,
        at: new Date(),
        reason: "Move to the spare cache",
        reference: "",
      });
      if (moved.kind !== "done") throw new Error(moved.message);
      return db("stock_movements")
        .whereIn("id", moved.movementIds)
        .where({ location_id: cache })
        .select("lot_id", "gal");
    };
    expect((await move(4)).map((row) => [row.lot_id, Number(row.gal)])).toEqual([[withinItsLife, -4]]);
    const rest = (await move(8)).map((row) => [row.lot_id, Number(row.gal)]);
    expect(rest).toEqual(
      expect.arrayContaining([
        [withinItsLife, -6],
        [pastItsLife, -2],
      ]),
    );
    expect(rest).toHaveLength(2);
  });

  it("answers a delivery larger than a movement may be with 400 at the container count, writing no lot", async () => {
    const cookie = await signIn(keeper.email, TEST_PASSWORD, "10.15.0.2");
    const lots = async () => Number((await db("stock_lots").count({ n: "*" }).first())!.n);
    const before = await lots();
    // 1,000,000 gal × 10,000 is past the lot's DECIMAL(14,4) quantity as well as the movement limit.
    for (const containerCount of ["10000", "2"]) {
      const { value } = await settle(() =>
        stockAction(
          routeArgs(
            formRequest(
              "/stock",
              {
                intent: "receive",
                locationId: String(storeId),
                productId: String(classB),
                lotNumber: `L-${randomUUID().slice(0, 6)}`,
                container: "tote",
                containerGal: "1000000",
                containerCount,
                receivedOn: "2026-03-01",
              },
              { Cookie: cookie },
            ),
          ),
        ),
      );
      const answer = value as { init: { status: number }; data: { result: { error: Record<string, string[]> } } };
      expect(answer.init?.status, containerCount).toBe(400);
      expect(answer.data.result.error.containerCount?.[0]).toMatch(/at most 1,000,000 gallons/);
    }
    expect(await lots()).toBe(before);
  });

  it("answers the move form's negative or non-numeric quantity with 400 at the field", async () => {
    const cookie = await signIn(keeper.email, TEST_PASSWORD, "10.15.0.1");
    const count = async () => Number((await db("stock_movements").count({ n: "*" }).first())!.n);
    const before = await count();
    for (const gal of ["-4", "ten"]) {
      const { value } = await settle(() =>
        moveAction(
          routeArgs(
            formRequest(
              "/stock/movements",
              {
                kind: "transferred",
                locationId: String(storeId),
                version: String(1),
                toLocationId: String(tankId),
                productId: String(classB),
                gal,
                at: "2026-07-01T10:00",
              },
              { Cookie: cookie },
            ),
          ),
        ),
      );
      const answer = value as { init: { status: number }; data: { result: { error: Record<string, string[]> } } };
      expect(answer.init.status).toBe(400);
      expect(answer.data.result.error.gal?.[0]).toMatch(/gallons/);
    }
    expect(await count()).toBe(before);
  });

  it("posts a count's variance as an adjustment with its reason", async () => {
    const book = await onHandAt(storeId);
    const input = {
      locationId: storeId,
      countedAt: new Date("2026-07-01T15:00:00Z"),
      lines: [{ productId: classB, lotId, countedGal: book - 2.5 }],
    };
    const noReason = await recordStockCount(keeper, {
      ...input,
      version: await versionOf("stock_locations", storeId),
      reason: "",
    });
    expect(noReason).toMatchObject({ fieldErrors: { reason: [expect.any(String)] } });
    const counted = await recordStockCount(keeper, {
      ...input,
      version: await versionOf("stock_locations", storeId),
      reason: "Drum seam weeping",
    });
    expect(counted).toMatchObject({
      kind: "done",
      lines: [{ bookGal: book, countedGal: book - 2.5, varianceGal: -2.5 }],
    });
    const adjustment = await db("stock_movements").where({ kind: "adjusted", location_id: storeId }).first();
    expect(Number(adjustment.gal)).toBe(-2.5);
    expect(adjustment.reason).toBe("Drum seam weeping");
    expect(await onHandAt(storeId)).toBe(book - 2.5);
  });
});

describe("readiness and alerts", () => {
  it("gives minutes of a Class B attack from what the station holds", async () => {
    const readiness = await stockReadiness();
    const station = readiness.stations.find((row) => row.stationId === stationId)!;
    const held = (await stockItems()).filter(
      (item) =>
        item.location.stationId === stationId && item.product.foamClass === "B" && !item.product.heldForDisposal,
    );
    const classBGal = held.reduce((sum, item) => sum + item.onHandGal, 0);
    expect(station.classBGal).toBeCloseTo(classBGal, 4);
    // 95 gpm at 3 % = 2.85 gpm of concentrate; minutes = gallons ÷ 2.85.
    expect(readiness.attack.concentrateGpm).toBeCloseTo(2.85, 10);
    expect(station.classBAttackMinutes).toBeCloseTo(classBGal / 2.85, 6);
  });

  it("mails a reorder alert once while stock stays below the point", async () => {
    await db("users").where({ id: keeper.id }).update({ active: true });
    const before = Number((await db("mail_outbox").where({ kind: "stock_alert" }).count({ n: "*" }).first())!.n);
    const result = await setReorderPoint(keeper, { locationId: tankId, productId: classB, reorderGal: 500 });
    expect(result).toEqual({ kind: "done" });
    const mails = await db("mail_outbox").where({ kind: "stock_alert" }).orderBy("id", "desc");
    expect(mails.length).toBe(before + 1);
    expect(mails[0].text_body).toContain("below the reorder point of 500 gal");
    await db.transaction((trx) => queueStockAlerts(trx));
    expect(Number((await db("mail_outbox").where({ kind: "stock_alert" }).count({ n: "*" }).first())!.n)).toBe(
      before + 1,
    );
  });
});

describe("GET /api/stock and /api/stock/movements", () => {
  it("agree: what a location holds is the sum of its movements", async () => {
    const stock = await answer(() => stockLoader(routeArgs(getRequest(`/api/stock?location=${tankId}`, officer.auth))));
    expect(stock.status).toBe(200);
    const items = stock.body.items as { location: { id: number }; lot: unknown; onHandGal: number; product: unknown }[];
    expect(Object.keys(items[0]).sort()).toEqual(["location", "lot", "onHandGal", "product"]);
    const movements = await answer(() =>
      movementsLoader(routeArgs(getRequest(`/api/stock/movements?location=${tankId}`, officer.auth))),
    );
    const list = movements.body.items as { gal: number; eventId?: number; kind: string }[];
    expect(list.some((item) => item.kind === "used" && typeof item.eventId === "number")).toBe(true);
    const summed = list.reduce((sum, item) => sum + item.gal, 0);
    expect(items.reduce((sum, item) => sum + item.onHandGal, 0)).toBeCloseTo(summed, 4);
  });

  it("answers 400 at the parameter for bad input, and 403 outside the roles", async () => {
    const bad = await answer(() =>
      movementsLoader(routeArgs(getRequest("/api/stock/movements?kind=spilled&location=abc", officer.auth))),
    );
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.errors as object).sort()).toEqual(["kind", "location"]);
    const clerk = await person(["records"], "Stock Clerk", null);
    const forbidden = await answer(() => stockLoader(routeArgs(getRequest("/api/stock", clerk.auth))));
    expect(forbidden.status).toBe(403);
  });
});
