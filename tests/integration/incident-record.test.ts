// The incident record: an incident type and a dispatch (CAD) number beside the report number, both
// filtering the lists and carried into the exports; discharges from another agency's unit (mutual
// aid), counted in the totals and marked, with no capacity checks.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import type { Role } from "~/lib/access";
import type { SessionUser } from "~/lib/auth.server";
import { db } from "~/lib/db.server";
import { parseReportPeriod } from "~/lib/reporting/period";
import { streamDischargeRows, streamEventRows } from "~/models/environmental-report.server";
import { readAgencySettings } from "~/models/agency-settings.server";
import { createApiToken } from "~/models/api-token.server";
import { action as createAction, loader as listLoader } from "~/routes/api.events";
import { loader as detailLoader } from "~/routes/api.events.$id";
import { loader as csvLoader } from "~/routes/events.csv";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { signIn } from "../support/session";
import { getRequest, jsonRequest, routeArgs, settle } from "../support/requests";
import { ensureAgency, makeApparatus, makeProduct, makeStation } from "../support/usage-fixtures";

let stationId: number;
let engineId: number;
let productId: number;
let officerAuth: Record<string, string>;
let officerCookie: string;
const dispatchTag = randomUUID().slice(0, 6).toUpperCase();

beforeAll(async () => {
  await ensureAgency();
  stationId = (await makeStation()).id;
  engineId = (await makeApparatus(stationId)).id;
  // A proportioner that cannot inject more than 0.2 gpm and a narrow water range: our line trips both.
  await db("apparatus")
    .where({ id: engineId })
    .update({ proportioner_max_concentrate_gpm: 0.2, water_flow_min_gpm: 10, water_flow_max_gpm: 100 });
  productId = (await makeProduct({ foamClass: "A" })).id;
  const roles: Role[] = ["officer"];
  const user = await makeUser(roles, "Officer Incident Record", { stationId });
  const session = { id: user.id, roles, stationId, email: user.email, name: user.name, epoch: 0 } as SessionUser;
  officerAuth = { Authorization: `Bearer ${(await createApiToken(session, "incident record")).token}` };
  officerCookie = await signIn(user.email, TEST_PASSWORD);
});

const line = (extra: Record<string, unknown>) => ({
  productId,
  percent: 0.3,
  flow: 200,
  flowUnit: "gpm",
  basis: "water",
  minutes: 10,
  ...extra,
});

function report(overrides: Record<string, unknown> = {}) {
  return {
    intent: "file",
    number: `INC-${randomUUID().slice(0, 8)}`,
    kind: "incident",
    incidentType: "vehicle_fire",
    dispatchNumber: `31-${dispatchTag}`,
    startedAt: "2031-02-10T09:00",
    clearedAt: "2031-02-10T11:00",
    address: "100 Test Street",
    latitude: 38.7,
    longitude: -98.2,
    stationId,
    discharges: [
      line({ apparatusId: engineId }),
      line({ mutualAidAgency: "Cedar Ford Fire Protection District (test)", mutualAidUnit: "BR61" }),
    ],
    dispositions: [{ disposition: "evaporated_unknown", sharePercent: 100 }],
    ...overrides,
  };
}

async function json(run: () => Promise<unknown>) {
  const { value } = await settle(run);
  const response = value as Response;
  return { status: response.status, body: (await response.json()) as Record<string, unknown> };
}

const create = (body: unknown) => json(() => createAction(routeArgs(jsonRequest("/api/events", body, officerAuth))));
const list = (query: string) => json(() => listLoader(routeArgs(getRequest(`/api/events?${query}`, officerAuth))));

describe("the incident record", () => {
  let eventId: number;

  it("files an incident type, a dispatch number and a mutual-aid line, counted in the totals", async () => {
    const filed = await create(report());
    expect(filed.status).toBe(201);
    eventId = filed.body.id as number;
    const row = await db("events").where({ id: eventId }).first();
    expect(row.incident_type).toBe("vehicle_fire");
    expect(row.dispatch_number).toBe(`31-${dispatchTag}`);
    const lines = await db("discharges").where({ event_id: eventId }).orderBy("position");
    expect(lines.map((stored) => [stored.apparatus_id, stored.mutual_aid_agency, stored.mutual_aid_unit])).toEqual([
      [engineId, null, null],
      [null, "Cedar Ford Fire Protection District (test)", "BR61"],
    ]);
    // 200 gpm water at 0.3 % of the water for 10 min: 6 gal concentrate wanted (common practice, no
    // source). Our proportioner stops at 0.2 gpm (2 gal); the mutual-aid unit's system is unknown, so
    // its line is computed as set, and both count in the event's total.
    expect(Number(lines[0].concentrate_gal)).toBeCloseTo(2, 6);
    expect(Number(lines[1].concentrate_gal)).toBeCloseTo(6, 6);
    expect(Number(row.concentrate_gal)).toBeCloseTo(8, 6);
    const codes = (stored: { warnings: string }) => JSON.parse(stored.warnings).map((w: { code: string }) => w.code);
    expect(codes(lines[0])).toEqual(expect.arrayContaining(["proportioner_limit", "flow_out_of_range"]));
    expect(codes(lines[1])).toEqual([]);
  });

  it("reads them back from GET /api/events/:id", async () => {
    const detail = await json(() =>
      detailLoader(routeArgs(getRequest(`/api/events/${eventId}`, officerAuth), { id: String(eventId) })),
    );
    expect(detail.status).toBe(200);
    expect(detail.body).toMatchObject({ incidentType: "vehicle_fire", dispatchNumber: `31-${dispatchTag}` });
    expect((detail.body.discharges as Array<Record<string, unknown>>)[1]).toMatchObject({
      apparatusId: null,
      mutualAidAgency: "Cedar Ford Fire Protection District (test)",
      mutualAidUnit: "BR61",
    });
  });

  it("filters /api/events by type and by part of the dispatch number", async () => {
    const byBoth = await list(`type=vehicle_fire&dispatch=${dispatchTag}`);
    expect(byBoth.status).toBe(200);
    expect((byBoth.body.items as Array<{ id: number }>).map((item) => item.id)).toEqual([eventId]);
    expect(byBoth.body.items).toEqual([
      expect.objectContaining({ incidentType: "vehicle_fire", dispatchNumber: `31-${dispatchTag}` }),
    ]);
    expect((await list(`type=structure_fire&dispatch=${dispatchTag}`)).body.count).toBe(0);
    // Wildcards typed are taken literally.
    expect((await list(`dispatch=${encodeURIComponent("%")}`)).body.count).toBe(0);
    const bad = await list("type=arson");
    expect(bad.status).toBe(400);
    expect(bad.body.errors).toHaveProperty("type");
  });

  it("gives a training its kind as its type when none is chosen", async () => {
    const filed = await create(report({ kind: "training", incidentType: undefined, dispatchNumber: undefined }));
    expect(filed.status).toBe(201);
    const row = await db("events")
      .where({ id: filed.body.id as number })
      .first();
    expect(row.incident_type).toBe("training");
    expect(row.dispatch_number).toBeNull();
  });

  it("refuses at the field: a mismatched type, a bad dispatch number, a half-named or doubled mutual-aid unit", async () => {
    const body = report({
      kind: "training",
      incidentType: "structure_fire",
      dispatchNumber: "26-0045;DROP",
      discharges: [
        line({ mutualAidAgency: "Cedar Ford Fire Protection District (test)" }),
        line({ apparatusId: engineId, mutualAidAgency: "Cedar Ford (test)", mutualAidUnit: "E41" }),
      ],
    });
    const refused = await create(body);
    expect(refused.status).toBe(400);
    const errors = refused.body.errors as Record<string, string[]>;
    expect(errors.incidentType?.[0]).toMatch(/not a type of training/);
    expect(errors.dispatchNumber?.[0]).toMatch(/letters, digits/);
    expect(errors["discharges.0.mutualAidUnit"]?.[0]).toMatch(/unit's id/);
    expect(errors["discharges.1.apparatusId"]?.[0]).toMatch(/not both/);
    expect(
      await db("events")
        .where({ number: refused.body.number ?? "" })
        .count({ n: "*" }),
    ).toEqual([{ n: 0 }]);
  });

  it("carries the type, the dispatch number and the mutual-aid unit into the events CSV and the workbook tables", async () => {
    const { value } = await settle(() =>
      csvLoader(
        routeArgs(getRequest(`/events.csv?dispatch=${dispatchTag}&type=vehicle_fire`, { Cookie: officerCookie })),
      ),
    );
    const csv = await (value as Response).text();
    const [header, first] = csv.trim().split("\r\n");
    expect(header).toContain("incident type,dispatch number");
    expect(first).toContain(`Vehicle fire,31-${dispatchTag}`);

    await db("events").where({ id: eventId }).update({ status: "accepted" });
    const { timeZone } = await readAgencySettings();
    const parsed = parseReportPeriod(new URLSearchParams({ from: "2031-02-01", to: "2031-02-28" }), timeZone);
    if (!parsed.ok) throw new Error(parsed.message);
    const events = [];
    for await (const row of streamEventRows(parsed.period)) events.push(row);
    const event = events.find((row) => row.dispatchNumber === `31-${dispatchTag}`);
    expect(event).toMatchObject({
      incidentType: "Vehicle fire",
      mutualAid: "Cedar Ford Fire Protection District (test) BR61",
    });
    const discharges = [];
    for await (const row of streamDischargeRows(parsed.period)) discharges.push(row);
    const mine = discharges.filter((row) => row.eventNumber === event!.number);
    expect(mine.map((row) => [row.apparatus, row.mutualAid])).toEqual([
      [expect.stringMatching(/^E-/), "No"],
      ["Mutual aid: Cedar Ford Fire Protection District (test) BR61", "Yes"],
    ]);
  });
});
