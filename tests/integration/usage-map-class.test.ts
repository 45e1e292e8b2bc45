import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import type { MapFilters } from "~/lib/geo/map-filters";
import { usageSummary } from "~/models/usage-map.server";
import { makeUser } from "../support/factories";
import { ensureAgency, makeEvent, makeProduct } from "../support/usage-fixtures";

// Issue 10 §4: the map's Class B filter counts only Class B concentrate. An event that flowed 4 gal of
// Class A and 9 gal of Class B counts 9 gal under "Class B", not 13.
const filters = (foamClass: MapFilters["foamClass"]): MapFilters => ({
  from: "2037-03-01",
  to: "2037-03-31",
  startUtc: new Date("2037-03-01T00:00:00Z"),
  endUtc: new Date("2037-04-01T00:00:00Z"),
  bbox: null,
  foamClass,
  kind: null,
  stationId: null,
});

describe("the map summary under a foam-class filter", () => {
  beforeAll(async () => {
    await ensureAgency(db);
    const officer = await makeUser(["officer"], "Map Class Officer");
    const classA = await makeProduct({ foamClass: "A" });
    const classB = await makeProduct({ foamClass: "B", foamType: "f3" });
    const event = await makeEvent({
      createdBy: officer.id,
      startedAt: new Date("2037-03-10T15:00:00Z"),
      discharges: [
        { productId: classA.id, percent: 0.5, water: 800, concentrate: 4 },
        { productId: classB.id, percent: 3, water: 291, concentrate: 9 },
      ],
    });
    await db("events").where({ id: event.id }).update({ latitude: 44.5, longitude: -93.1 });
  });

  it("counts only Class B concentrate under the Class B filter", async () => {
    const summary = await usageSummary(filters("B"), "America/Chicago");
    expect(summary.totals.events).toBe(1);
    expect(summary.totals.concentrateGal).toBeCloseTo(9, 6);
    expect(summary.byProduct.map((row) => row.foamClass)).toEqual(["B"]);
    expect(summary.byFoamClass.find((row) => row.foamClass === "A")?.concentrateGal).toBe(0);
  });

  it("counts both classes without a filter", async () => {
    const summary = await usageSummary(filters(null), "America/Chicago");
    expect(summary.totals.concentrateGal).toBeCloseTo(13, 6);
  });
});
