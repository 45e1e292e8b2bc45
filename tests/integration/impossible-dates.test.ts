// Dates no calendar has (30 February) or no record column holds (year 9999 in a zone west of
// Greenwich, year 0999) are refused at their field on the stock, notification and foam-system forms,
// and nothing is written: before, the database refused them (a 500) or the day rolled over silently.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { saveFoamSystem } from "~/models/foam-system.server";
import { action as notifyAction } from "~/routes/events.$id.notifications";
import { action as systemAction } from "~/routes/foam-systems.$systemId";
import { action as stockAction } from "~/routes/stock";
import { action as countAction } from "~/routes/stock.counts";
import { action as moveAction } from "~/routes/stock.movements";
import { makeApparatusRow } from "../support/catalogue-factories";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeEvent, makeProduct, makeStation } from "../support/usage-fixtures";

const IMPOSSIBLE_DAYS = ["2026-02-30", "2026-04-31", "0999-12-31", "9999-12-31"];
const IMPOSSIBLE_TIMES = ["2026-02-30T10:00", "2026-06-31T08:00", "0999-12-31T23:59", "9999-12-31T23:59"];
const WATCHED = ["stock_lots", "stock_movements", "stock_counts", "release_notifications", "foam_system_maintenance"];

let cookie: string;
let productId: number;
let storeId: number;
let cacheId: number;
let eventId: number;
let systemId: number;

const versionOf = async (id: number) => (await db("stock_locations").where({ id }).first("version")).version as number;

async function rowCounts() {
  const counts: Record<string, number> = {};
  for (const table of WATCHED) counts[table] = Number((await db(table).count({ n: "*" }).first())!.n);
  return counts;
}

/** The status and field errors of an action's answer; a thrown error (a 500) fails the test here. */
async function answerOf(run: () => Promise<unknown>) {
  const { value } = await settle(run);
  if (value instanceof Error) throw value;
  const reply = value as { init?: { status?: number }; data?: Record<string, { error?: Record<string, string[]> }> };
  const status = value instanceof Response ? value.status : (reply.init?.status ?? 200);
  const result = reply.data?.result ?? reply.data?.notification;
  return { status, errors: Object.keys(result?.error ?? {}) };
}

beforeAll(async () => {
  await ensureAgency();
  const station = await makeStation();
  productId = (await makeProduct({ foamClass: "B", foamType: "f3" })).id;
  const chief = await makeUser(["chief"], "Calendar Chief", { stationId: station.id });
  cookie = await signIn(chief.email, TEST_PASSWORD, "10.15.0.30");
  [storeId] = await db("stock_locations").insert({
    kind: "station_store",
    name: `Store ${randomUUID().slice(0, 6)}`,
    station_id: station.id,
  });
  [cacheId] = await db("stock_locations").insert({ kind: "cache", name: `Cache ${randomUUID().slice(0, 6)}` });
  eventId = (
    await makeEvent({
      createdBy: chief.id,
      status: "filed",
      stationId: station.id,
      startedAt: new Date("2026-05-01T15:00:00Z"),
      discharges: [{ percent: null, water: 100, concentrate: 0 }],
      dispositions: [{ disposition: "surface_water", sharePercent: 100, receivingWater: "Test Creek" }],
    })
  ).id;
  const apparatusId = (await makeApparatusRow({ stationId: station.id })).id;
  const saved = await saveFoamSystem(
    apparatusId,
    null,
    null,
    { name: "Calendar system", systemType: "around_the_pump", percentOf: "solution" },
    { id: chief.id, email: chief.email, name: chief.name, roles: ["chief"], stationId: null, epoch: 0 } as never,
  );
  if ("kind" in saved) throw new Error(saved.message);
  systemId = saved.id;
  const received = await answerOf(() =>
    stockAction(routeArgs(formRequest("/stock", receipt("2026-02-01"), { Cookie: cookie }))),
  );
  expect(received.status).toBe(302);
});

function receipt(day: string) {
  return {
    intent: "receive",
    locationId: String(storeId),
    productId: String(productId),
    lotNumber: `L-${randomUUID().slice(0, 6)}`,
    container: "drum",
    containerGal: "55",
    containerCount: "2",
    receivedOn: day,
    manufacturedOn: "2026-01-10",
  };
}

describe("a date no calendar or column has", () => {
  it("is refused at the field when stock is received, moved or counted", async () => {
    const before = await rowCounts();
    for (const day of IMPOSSIBLE_DAYS) {
      const answer = await answerOf(() =>
        stockAction(routeArgs(formRequest("/stock", receipt(day), { Cookie: cookie }))),
      );
      expect(answer, day).toEqual({ status: 400, errors: ["receivedOn"] });
    }
    for (const at of IMPOSSIBLE_TIMES) {
      const move = {
        kind: "transferred",
        locationId: String(storeId),
        version: String(await versionOf(storeId)),
        toLocationId: String(cacheId),
        productId: String(productId),
        gal: "1",
        at,
      };
      const moved = await answerOf(() =>
        moveAction(routeArgs(formRequest("/stock/movements", move, { Cookie: cookie }))),
      );
      expect(moved, at).toEqual({ status: 400, errors: ["at"] });
      const count = {
        locationId: String(storeId),
        version: String(await versionOf(storeId)),
        countedAt: at,
        reason: "Found a drum short",
        "lines[0].productId": String(productId),
        "lines[0].countedGal": "55",
      };
      const counted = await answerOf(() =>
        countAction(routeArgs(formRequest("/stock/counts", count, { Cookie: cookie }))),
      );
      expect(counted, at).toEqual({ status: 400, errors: ["countedAt"] });
    }
    expect(await rowCounts()).toEqual(before);
  });

  it("is refused at the field for a release notification and a foam system's maintenance", async () => {
    const before = await rowCounts();
    for (const at of IMPOSSIBLE_TIMES) {
      const notified = await answerOf(() =>
        notifyAction(
          routeArgs(
            formRequest(
              `/events/${eventId}/notifications`,
              { party: "state_spill_line", notifiedAt: at, notifiedBy: "Capt. Test" },
              { Cookie: cookie },
            ),
            { id: String(eventId) },
          ),
        ),
      );
      expect(notified, at).toEqual({ status: 400, errors: ["notifiedAt"] });
      const maintained = await answerOf(() =>
        systemAction(
          routeArgs(
            formRequest(
              `/foam-systems/${systemId}`,
              { intent: "maintenance", kind: "prime", performedAt: at },
              { Cookie: cookie },
            ),
            { systemId: String(systemId) },
          ),
        ),
      );
      expect(maintained, at).toEqual({ status: 400, errors: ["performedAt"] });
    }
    expect(await rowCounts()).toEqual(before);
  });
});
