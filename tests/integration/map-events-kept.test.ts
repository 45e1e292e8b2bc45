// The map's events are written in pieces kept by each event's row stamp: whatever changes a row (a
// save, a hand-made SQL correction), a station renamed, an event added or leaving the map, the body
// must be exactly the straightforward query's JSON, and only the pieces that changed are written again.
import { gunzipSync } from "node:zlib";
import { beforeAll, describe, expect, it } from "vitest";
import type { SessionUser } from "~/lib/auth.server";
import { db } from "~/lib/db.server";
import { parseMapFilters } from "~/lib/geo/map-filters";
import { saveStation } from "~/models/apparatus.server";
import { bumpDataVersion, currentDataVersions } from "~/models/data-version.server";
import { mapEvents, mapEventsBody, mapPieceTextsWritten } from "~/models/usage-map.server";
import { makeUser } from "../support/factories";
import { ensureAgency, makeEvent, makeProduct, makeStation } from "../support/usage-fixtures";

const EVENTS = 240;
let chief: SessionUser;
let stationId: number;
let eventIds: number[];

const parsed = parseMapFilters(new URLSearchParams("from=2047-01-01&to=2047-12-31"), "America/Chicago");
if (!parsed.ok) throw new Error(parsed.message);
const { filters } = parsed;

async function body(): Promise<string> {
  return gunzipSync((await mapEventsBody(filters, await currentDataVersions(db))).gzipped).toString("utf8");
}
const straightforward = async () => JSON.stringify(await mapEvents(filters));

beforeAll(async () => {
  await ensureAgency(db);
  const made = await makeUser(["chief"], "Kept Map Chief");
  chief = { id: made.id, email: made.email, name: made.name, roles: made.roles, stationId: null };
  stationId = (await makeStation()).id;
  const productId = (await makeProduct({ foamClass: "B" })).id;
  eventIds = [];
  for (let index = 0; index < EVENTS; index++) {
    const { id } = await makeEvent({
      createdBy: chief.id,
      stationId,
      startedAt: new Date(Date.UTC(2047, 0, 1 + (index % 300), 12, index % 60)),
      discharges: [{ productId, percent: 3, water: 100 + index, concentrate: 3 + index / 100 }],
    });
    eventIds.push(id);
  }
  await db("events")
    .whereIn("id", eventIds)
    .update({ latitude: db.raw("38.6 + (id % 97) / 1000"), longitude: db.raw("-98.3 + (id % 89) / 1000") });
  await bumpDataVersion(db, "reports");
});

describe("the map's events, kept in pieces by row stamp", () => {
  it("raise an event's row stamp on every update, however it is made", async () => {
    const stampOf = async () => Number((await db("events").where({ id: eventIds[0] }).first("row_stamp")).row_stamp);
    const before = await stampOf();
    await db("events").where({ id: eventIds[0] }).update({ address: "101 Test Road" });
    await db.raw("UPDATE events SET address = '100 Test Road' WHERE id = ?", [eventIds[0]]);
    expect(await stampOf()).toBe(before + 2);
  });

  it("are the straightforward query's JSON, first and after a hand-made correction, writing one piece again", async () => {
    const first = await body();
    expect(first).toBe(await straightforward());
    expect((JSON.parse(first) as { features: unknown[] }).features).toHaveLength(EVENTS);

    const written = mapPieceTextsWritten();
    await db.transaction(async (trx) => {
      await trx("events").where({ id: eventIds[100] }).increment({ water_gal: 1, solution_gal: 1 });
      await bumpDataVersion(trx, "reports");
    });
    const corrected = await body();
    expect(corrected).not.toBe(first);
    expect(corrected).toBe(await straightforward());
    expect(mapPieceTextsWritten() - written).toBe(1);
  });

  it("follow an event added, one leaving the map, and a station's new code", async () => {
    const productId = (await makeProduct({ foamClass: "A" })).id;
    const { id } = await makeEvent({
      createdBy: chief.id,
      stationId,
      startedAt: new Date(Date.UTC(2047, 5, 15, 9)),
      discharges: [{ productId, percent: 0.5, water: 400, concentrate: 2 }],
    });
    await db("events").where({ id }).update({ latitude: 38.65, longitude: -98.25 });
    await bumpDataVersion(db, "reports");
    expect(await body()).toBe(await straightforward());

    await db("events").where({ id: eventIds[7] }).update({ status: "draft" });
    await bumpDataVersion(db, "reports");
    const withoutDraft = await body();
    expect(withoutDraft).toBe(await straightforward());
    expect(withoutDraft).not.toContain(`"id":${eventIds[7]},`);

    const station = await db("stations").where({ id: stationId }).first();
    const newCode = `${station.code}N`;
    await saveStation(
      stationId,
      Number(station.version),
      { code: newCode, name: station.name, address: "", latitude: null, longitude: null, active: true },
      chief,
    );
    const renamed = await body();
    expect(renamed).toBe(await straightforward());
    expect(renamed.split(`"station":"${newCode}"`).length - 1).toBe(EVENTS);
  });
});
