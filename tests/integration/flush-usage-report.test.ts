// A flush that flowed and names no usage report files its own, through the one report save path and
// in the maintenance entry's transaction: one report, linked from the flush, whose water and
// concentrate the quarter's totals count once.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import type { SessionUser } from "~/lib/auth.server";
import { db } from "~/lib/db.server";
import { parseReportPeriod } from "~/lib/reporting/period";
import { readAgencySettings } from "~/models/agency-settings.server";
import { stationRow } from "~/models/catalogue-rows.server";
import { periodAggregates } from "~/models/environmental-report.server";
import { reviewReport } from "~/models/event.server";
import { saveFoamSystem } from "~/models/foam-system.server";
import { action as systemAction } from "~/routes/foam-systems.$systemId";
import { makeApparatusRow } from "../support/catalogue-factories";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeProduct } from "../support/usage-fixtures";

// A quarter no other test files reports in, so its totals are this file's alone.
const YEAR = "2013";
const QUARTER = "2";

describe("a flush that flowed files its usage report", () => {
  let officerCookie: string;
  let reviewer: SessionUser;
  let stationId: number;
  let apparatusId: number;
  let systemId: number;
  let productId: number;

  beforeAll(async () => {
    await ensureAgency();
    const code = `FL${randomUUID().slice(0, 5)}`;
    [stationId] = await db("stations").insert(
      stationRow({
        code,
        name: `Flush station ${code} (test)`,
        address: "4 Rinse Row",
        latitude: 45.1,
        longitude: -122.2,
      }),
    );
    const officer = await makeUser(["officer"], "Officer Flush", { stationId });
    officerCookie = await signIn(officer.email, TEST_PASSWORD);
    const chief = await makeUser(["chief"], "Chief Flush");
    const environmental = await makeUser(["environmental"], "Reviewer Flush");
    reviewer = {
      id: environmental.id,
      email: environmental.email,
      name: environmental.name,
      roles: ["environmental"],
      stationId: null,
      epoch: 0,
    } as SessionUser;
    productId = (await makeProduct({ foamClass: "A" })).id;
    apparatusId = (
      await makeApparatusRow({
        stationId,
        outlets: [{ name: "Crosslay", foamCapable: true, defaultFlowGpm: 95, defaultFlowBasis: "water" }],
      })
    ).id;
    const saved = await saveFoamSystem(
      apparatusId,
      null,
      null,
      {
        name: "Class A injection",
        systemType: "direct_injection",
        percentOf: "water",
        maxConcentrateGpm: 2,
        outlets: "Crosslay",
        tankName: "Tank A",
        tankCapacityGal: 30,
        tankProductId: productId,
      },
      { id: chief.id, email: chief.email, name: chief.name, roles: ["chief"], stationId: null, epoch: 0 } as never,
    );
    if ("kind" in saved) throw new Error(saved.message);
    systemId = saved.id;
  });

  const post = (fields: Record<string, string>) =>
    settle(() =>
      systemAction(
        routeArgs(formRequest(`/foam-systems/${systemId}`, fields, { Cookie: officerCookie }), {
          systemId: String(systemId),
        }),
      ),
    );
  const statusOf = (value: unknown) =>
    value instanceof Response ? value.status : ((value as { init?: { status?: number } }).init?.status ?? 200);

  it("creates one filed flush report for the apparatus's station, linked from the flush and counted once", async () => {
    const saved = await post({
      intent: "maintenance",
      kind: "flush",
      flushReason: "after_use",
      performedAt: `${YEAR}-05-14T10:00`,
      waterGal: "200",
      concentrateDisposedGal: "5",
      notes: "After the hay-barn fire",
    });
    expect(statusOf(saved.value)).toBe(302);

    const row = await db("foam_system_maintenance").where({ foam_system_id: systemId }).first();
    expect(row.event_id).not.toBeNull();
    const event = await db("events").where({ id: row.event_id }).first();
    expect(event).toMatchObject({ kind: "flush", incident_type: "flush", status: "filed", station_id: stationId });
    expect(event.address).toBe("4 Rinse Row");
    expect(event.narrative).toMatch(/apparatus's station/);
    expect(event.number).toBeTruthy();
    expect(Number(event.water_gal)).toBeCloseTo(200, 3);
    expect(Number(event.concentrate_gal)).toBeCloseTo(5, 3);
    const audited = await db("audit_events")
      .where({ entity_type: "event", entity_id: event.id })
      .count({ n: "*" })
      .first();
    expect(Number(audited?.n)).toBeGreaterThan(0);

    // The stock book posts the use once, from the apparatus's tank.
    const used = await db("stock_movements").where({ event_id: event.id, kind: "used" }).select("gal");
    expect(used).toHaveLength(1);
    expect(Number(used[0].gal)).toBeCloseTo(-5, 3);

    // A second flush naming the report links it and makes none.
    const linked = await post({
      intent: "maintenance",
      kind: "flush",
      flushReason: "scheduled",
      performedAt: `${YEAR}-05-14T11:00`,
      waterGal: "200",
      eventNumber: event.number,
    });
    expect(statusOf(linked.value)).toBe(302);
    const flushEvents = await db("events as e")
      .join("foam_system_maintenance as m", "m.event_id", "e.id")
      .where("m.foam_system_id", systemId)
      .countDistinct({ n: "e.id" })
      .first();
    expect(Number(flushEvents?.n)).toBe(1);

    const accepted = await reviewReport({
      user: reviewer,
      eventId: event.id,
      version: event.version,
      decision: "accept",
    });
    expect(accepted).toEqual({ kind: "done", status: "accepted" });
    const { timeZone } = await readAgencySettings();
    const period = parseReportPeriod(new URLSearchParams({ year: YEAR, quarter: QUARTER }), timeZone);
    if (!period.ok) throw new Error(period.message);
    const totals = await periodAggregates(period.period);
    expect(totals.eventsByKind.flush).toBe(1);
    expect(totals.eventTotals.water).toBeCloseTo(200, 3);
    expect(totals.eventTotals.concentrate).toBeCloseTo(5, 3);
    expect(totals.byClass.reduce((sum, row) => sum + row.concentrate, 0)).toBeCloseTo(5, 3);
  });

  it("refuses at the field, writing nothing, when the report cannot be filed", async () => {
    const before = await db("foam_system_maintenance").where({ foam_system_id: systemId }).count({ n: "*" }).first();
    const eventsBefore = await db("events").where({ station_id: stationId }).count({ n: "*" }).first();
    await db("foam_system_tanks").where({ foam_system_id: systemId }).update({ product_id: null });
    try {
      const refused = await post({
        intent: "maintenance",
        kind: "flush",
        flushReason: "after_use",
        performedAt: `${YEAR}-05-20T10:00`,
        waterGal: "50",
        concentrateDisposedGal: "2",
      });
      expect(statusOf(refused.value)).toBe(400);
      const errors = (refused.value as { data: { result: { error: Record<string, string[]> } } }).data.result.error;
      expect(errors.concentrateDisposedGal?.[0]).toMatch(/no product loaded/);
    } finally {
      await db("foam_system_tanks").where({ foam_system_id: systemId }).update({ product_id: productId });
    }
    expect(await db("foam_system_maintenance").where({ foam_system_id: systemId }).count({ n: "*" }).first()).toEqual(
      before,
    );
    expect(await db("events").where({ station_id: stationId }).count({ n: "*" }).first()).toEqual(eventsBefore);
  });
});
