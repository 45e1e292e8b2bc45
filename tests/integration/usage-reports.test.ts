import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { computeUsage } from "~/lib/foam/totals";
import { apparatusFactsMap, productFactsMap } from "~/models/catalogue.server";
import { loader as eventApiLoader } from "~/routes/api.events.$id";
import { loader as eventsApiLoader } from "~/routes/api.events";
import { action as totalsAction } from "~/routes/api.totals";
import { action as editAction } from "~/routes/events.$id.edit";
import { action as reviewAction, loader as reportLoader } from "~/routes/events.$id";
import { action as newAction } from "~/routes/events.new";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, jsonRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";

let stationId: number;
let engineId: number;
let classAId: number;
let legacyId: number;
let officerCookie: string;
let reviewerCookie: string;

beforeAll(async () => {
  const tag = randomUUID().slice(0, 6);
  [stationId] = await db("stations").insert({ code: `T${tag}`, name: "Test station" });
  [engineId] = await db("apparatus").insert({
    unit_id: `E-${tag}`,
    station_id: stationId,
    proportioner_max_concentrate_gpm: 2,
    water_flow_min_gpm: 10,
    water_flow_max_gpm: 1000,
  });
  [classAId] = await db("foam_products").insert({
    name: `Test Class A ${tag}`,
    foam_class: "A",
    foam_type: "class-a",
    nominal_percents: "0.3",
  });
  [legacyId] = await db("foam_products").insert({
    name: `Test AR-AFFF ${tag}`,
    foam_class: "B",
    foam_type: "ar-afff",
    nominal_percents: "3,6",
    pfas_containing: true,
  });
  const officer = await makeUser(["officer"], "Officer Test", { stationId });
  const reviewer = await makeUser(["environmental"], "Reviewer Test");
  officerCookie = await signIn(officer.email, TEST_PASSWORD);
  reviewerCookie = await signIn(reviewer.email, TEST_PASSWORD);
});

function reportFields(overrides: Record<string, string> = {}) {
  return {
    intent: "file",
    submissionKey: randomUUID(),
    number: `IT-${randomUUID().slice(0, 8)}`,
    kind: "incident",
    startedAt: "2026-03-01T09:00",
    clearedAt: "2026-03-01T11:00",
    address: "100 Test Street",
    latitude: "38.7",
    longitude: "-98.2",
    stationId: String(stationId),
    "discharges[0].apparatusId": String(engineId),
    "discharges[0].productId": String(classAId),
    "discharges[0].percent": "0.3",
    "discharges[0].flow": "200",
    "discharges[0].flowUnit": "gpm",
    "discharges[0].basis": "water",
    "discharges[0].minutes": "10",
    "discharges[1].productId": String(legacyId),
    "discharges[1].percent": "3",
    "discharges[1].flow": "100",
    "discharges[1].flowUnit": "gpm",
    "discharges[1].basis": "solution",
    "discharges[1].startedAt": "2026-03-01T09:30",
    "discharges[1].endedAt": "2026-03-01T09:45",
    "dispositions[0].disposition": "contained",
    "dispositions[0].sharePercent": "80",
    "dispositions[0].disposalReference": "DRUM-7",
    "dispositions[1].disposition": "storm_drain",
    "dispositions[1].sharePercent": "20",
    ...overrides,
  };
}

type AnyAction = (args: never) => Promise<unknown>;

async function post(
  action: AnyAction,
  path: string,
  fields: Record<string, string>,
  cookie = officerCookie,
  params = {},
) {
  return settle(() => action(routeArgs(formRequest(path, fields, { Cookie: cookie }), params)));
}

function statusOf(value: unknown): number {
  if (value instanceof Response) return value.status;
  return (value as { init?: { status?: number } }).init?.status ?? 200;
}

function replyErrors(value: unknown): Record<string, string[]> {
  return (value as { data: { result: { error: Record<string, string[]> } } }).data.result.error;
}

describe("filing a usage report", () => {
  it("stores the server's totals, equal to the computation module's, and the API returns them", async () => {
    const fields = reportFields();
    const outcome = await post(newAction, "/events/new", fields);
    expect(statusOf(outcome.value)).toBe(302);
    const event = await db("events").where({ number: fields.number }).first();
    expect(event.status).toBe("filed");
    // Typed as the agency's local time (America/Chicago, UTC−6 in March), stored as the UTC instant.
    expect(new Date(event.started_at).toISOString()).toBe("2026-03-01T15:00:00.000Z");

    const expected = computeUsage(
      [
        {
          flow: 200,
          flowUnit: "gpm",
          basis: "water",
          percent: 0.3,
          minutes: 10,
          productId: classAId,
          apparatusId: engineId,
        },
        { flow: 100, flowUnit: "gpm", basis: "solution", percent: 3, minutes: 15, productId: legacyId },
      ],
      { products: await productFactsMap([classAId, legacyId]), apparatus: await apparatusFactsMap([engineId]) },
    );
    expect(Number(event.water_gal)).toBeCloseTo(expected.totals.water.gal, 5);
    expect(Number(event.concentrate_gal)).toBeCloseTo(expected.totals.concentrate.gal, 5);
    expect(Number(event.solution_gal)).toBeCloseTo(expected.totals.solution.gal, 5);
    // 200 gpm × 0.3 % × 10 min = 6 gal; 100 gpm solution × 3 % × 15 min = 45 gal (computed by hand).
    expect(Number(event.concentrate_gal)).toBeCloseTo(51, 6);
    expect(Boolean(event.pfas_containing)).toBe(true);

    const response = (await eventApiLoader(
      routeArgs(getRequest(`/api/events/${event.id}`, { Cookie: reviewerCookie }), { id: String(event.id) }),
    )) as Response;
    const body = await response.json();
    expect(body.totals.concentrate).toEqual({ gal: 51, L: 193.06 });
    expect(body.discharges).toHaveLength(2);
    expect(body.discharges[1].minutes).toBe(15);
    expect(body.startedAt).toBe("2026-03-01T09:00");
    expect(body.discharges[1].startedAt).toBe("2026-03-01T09:30");
    expect(body.dispositions.map((line: { released: { gal: number } }) => line.released.gal)).toEqual([
      Number((0.8 * expected.totals.solution.gal).toFixed(2)),
      Number((0.2 * expected.totals.solution.gal).toFixed(2)),
    ]);

    const list = (await eventsApiLoader(
      routeArgs(getRequest(`/api/events?status=filed&size=500`, { Cookie: reviewerCookie })),
    )) as Response;
    const page = await list.json();
    expect(page.items.find((item: { number: string }) => item.number === fields.number).totals.concentrate.gal).toBe(
      51,
    );
    // The class filter keeps a report with a discharge of that class (this one has Class A and B).
    for (const foamClass of ["A", "B"]) {
      const filtered = (await eventsApiLoader(
        routeArgs(getRequest(`/api/events?status=filed&class=${foamClass}&size=500`, { Cookie: reviewerCookie })),
      )) as Response;
      const numbers = (await filtered.json()).items.map((item: { number: string }) => item.number);
      expect(numbers).toContain(fields.number);
    }
  });

  it("writes nothing when filing fails validation, and names every field", async () => {
    const fields = reportFields({
      "discharges[0].percent": "0",
      "discharges[1].flow": "-5",
      "dispositions[1].sharePercent": "30",
    });
    const before = await db("events").count({ n: "*" });
    const outcome = await post(newAction, "/events/new", fields);
    expect(statusOf(outcome.value)).toBe(400);
    const errors = replyErrors(outcome.value);
    expect(errors["discharges[0].percent"]).toEqual(["The percent must be more than 0."]);
    expect(errors["discharges[1].flow"]).toEqual(["The flow must be more than 0."]);
    expect(errors.dispositions?.[0]).toMatch(/add up to 110 %/);
    expect(await db("events").count({ n: "*" })).toEqual(before);
    expect(await db("events").where({ number: fields.number }).first()).toBeUndefined();
  });

  it("keeps a draft exactly as typed, even with values that would not file", async () => {
    const fields = reportFields({ intent: "save-draft", "discharges[0].flow": "two hundred", stationId: "" });
    const outcome = await post(newAction, "/events/new", fields);
    expect(statusOf(outcome.value)).toBe(302);
    const event = await db("events").where({ number: fields.number }).first();
    expect(event.status).toBe("draft");
    const draft = JSON.parse(event.draft_json);
    expect(draft.discharges[0].flow).toBe("two hundred");
    // The complete line is computed and stored; the incomplete one waits in the draft.
    expect(await db("discharges").where({ event_id: event.id }).count({ n: "*" })).toEqual([{ n: 1 }]);
  });

  it("answers a repeated submission with the report it already made", async () => {
    const fields = reportFields();
    const first = await post(newAction, "/events/new", fields);
    const second = await post(newAction, "/events/new", fields);
    expect((first.value as Response).headers.get("Location")).toBe((second.value as Response).headers.get("Location"));
    expect(await db("events").where({ number: fields.number }).count({ n: "*" })).toEqual([{ n: 1 }]);
  });

  it("refuses a second event with the same number at the field", async () => {
    const fields = reportFields();
    await post(newAction, "/events/new", fields);
    const again = await post(newAction, "/events/new", { ...fields, submissionKey: randomUUID() });
    expect(statusOf(again.value)).toBe(400);
    expect(replyErrors(again.value).number).toEqual(["Another report already uses this event number."]);
  });

  it("detects two people saving one report: the second gets a conflict and nothing is overwritten", async () => {
    const fields = reportFields({ intent: "save-draft" });
    await post(newAction, "/events/new", fields);
    const event = await db("events").where({ number: fields.number }).first();
    const edit = (changes: Record<string, string>) =>
      post(
        editAction,
        `/events/${event.id}/edit`,
        { ...fields, ...changes, version: "1", submissionKey: randomUUID() },
        officerCookie,
        {
          id: String(event.id),
        },
      );
    expect(statusOf((await edit({ address: "First edit" })).value)).toBe(302);
    const conflict = await edit({ address: "Second edit" });
    expect(statusOf(conflict.value)).toBe(409);
    expect(replyErrors(conflict.value)[""]?.[0]).toMatch(/Someone else saved this report/);
    const reply = (conflict.value as { data: { result: { initialValue: Record<string, unknown> } } }).data.result;
    expect(reply.initialValue.address).toBe("Second edit");
    expect((await db("events").where({ id: event.id }).first()).address).toBe("First edit");
  });
});

describe("review", () => {
  it("returns with a comment, refiles, accepts, revises with a reason, and keeps the history", async () => {
    const fields = reportFields();
    await post(newAction, "/events/new", fields);
    const event = await db("events").where({ number: fields.number }).first();
    const params = { id: String(event.id) };

    const officerTry = await post(
      reviewAction,
      `/events/${event.id}`,
      { decision: "accept", version: "1" },
      officerCookie,
      params,
    );
    expect(statusOf(officerTry.value)).toBe(403);

    const noComment = await post(
      reviewAction,
      `/events/${event.id}`,
      { decision: "return", version: "1" },
      reviewerCookie,
      params,
    );
    expect(replyErrors(noComment.value).comment).toEqual(["Say what the officer should fix."]);

    await post(
      reviewAction,
      `/events/${event.id}`,
      { decision: "return", version: "1", comment: "Add the second line's outlet." },
      reviewerCookie,
      params,
    );
    expect((await db("events").where({ id: event.id }).first()).status).toBe("returned");

    const refile = await post(
      editAction,
      `/events/${event.id}/edit`,
      {
        ...fields,
        "discharges[1].outlet": "Foam cart",
        version: "2",
        submissionKey: randomUUID(),
      },
      officerCookie,
      params,
    );
    expect(statusOf(refile.value)).toBe(302);
    await post(reviewAction, `/events/${event.id}`, { decision: "accept", version: "3" }, reviewerCookie, params);
    expect((await db("events").where({ id: event.id }).first()).status).toBe("accepted");

    const noReason = await post(
      editAction,
      `/events/${event.id}/edit`,
      { ...fields, version: "4", submissionKey: randomUUID() },
      officerCookie,
      params,
    );
    expect(replyErrors(noReason.value).revisionReason).toEqual(["Give the reason for changing an accepted report."]);
    await post(
      editAction,
      `/events/${event.id}/edit`,
      {
        ...fields,
        "discharges[0].minutes": "12",
        revisionReason: "Pump log shows 12 minutes",
        version: "4",
        submissionKey: randomUUID(),
      },
      officerCookie,
      params,
    );
    const revised = await db("events").where({ id: event.id }).first();
    expect(revised.revision).toBe(1);
    expect(revised.status).toBe("filed");
    const snapshot = await db("event_revisions").where({ event_id: event.id }).first();
    expect(snapshot.reason).toBe("Pump log shows 12 minutes");
    expect(JSON.parse(snapshot.snapshot_json).discharges[0].minutes).toMatch(/^10/);

    const page = (await reportLoader(
      routeArgs(getRequest(`/events/${event.id}`, { Cookie: reviewerCookie }), params),
    )) as {
      history: Array<{ action: string; summary: string | null }>;
    };
    expect(page.history.map((entry) => entry.action)).toEqual([
      "Filed the report",
      "Returned the report",
      "Filed the report",
      "Accepted the report",
      "Revised the accepted report",
    ]);
    expect(page.history[4].summary).toMatch(/Revision 1: Pump log/);
  });
});

describe("POST /api/totals", () => {
  it("computes the documented example without saving", async () => {
    const before = await db("events").count({ n: "*" });
    const response = (await totalsAction(
      routeArgs(
        jsonRequest(
          "/api/totals",
          { discharges: [{ flow: 200, flowUnit: "gpm", basis: "water", percent: 0.3, minutes: 10 }] },
          { Cookie: officerCookie },
        ),
      ),
    )) as Response;
    const body = await response.json();
    expect(body.totals).toMatchObject({
      water: { gal: 2000, L: 7570.82 },
      concentrate: { gal: 6, L: 22.71 },
      solution: { gal: 2006, L: 7593.54 },
    });
    // Without percentOf a water figure takes its percentage of the water (today's meaning; direct
    // injection, common practice, no source): 6 ÷ 2,006 of the solution.
    expect(body.discharges[0].percentOf).toBe("water");
    expect(body.discharges[0].effectivePercentOfSolution).toBeCloseTo((6 / 2006) * 100, 9);
    expect(body.totals.effectivePercentOfSolution).toBeCloseTo((6 / 2006) * 100, 9);
    expect(body.discharges[0].warnings).toEqual([]);
    expect(await db("events").count({ n: "*" })).toEqual(before);
  });

  it("takes percentOf: 97 gpm water × 10 min at 3 % of solution → 30 gal concentrate, 1,000 gal solution (computed from the definition, W ÷ (1 − p))", async () => {
    const response = (await totalsAction(
      routeArgs(
        jsonRequest(
          "/api/totals",
          {
            discharges: [{ flow: 97, flowUnit: "gpm", basis: "water", percent: 3, percentOf: "solution", minutes: 10 }],
          },
          { Cookie: officerCookie },
        ),
      ),
    )) as Response;
    const body = await response.json();
    expect(body.totals.concentrate.gal).toBe(30);
    expect(body.totals.solution.gal).toBe(1000);
    expect(body.discharges[0].effectivePercentOfSolution).toBeCloseTo(3, 9);
    const refused = (await totalsAction(
      routeArgs(
        jsonRequest(
          "/api/totals",
          {
            discharges: [
              { flow: 97, flowUnit: "gpm", basis: "water", percent: 3, percentOf: "concentrate", minutes: 10 },
            ],
          },
          { Cookie: officerCookie },
        ),
      ),
    )) as Response;
    expect(refused.status).toBe(400);
    expect(Object.keys((await refused.json()).errors)).toEqual(["discharges.0.percentOf"]);
  });

  it("warns about a line above the proportioner's maximum", async () => {
    const response = (await totalsAction(
      routeArgs(
        jsonRequest(
          "/api/totals",
          {
            discharges: [
              {
                flow: 400,
                flowUnit: "gpm",
                basis: "water",
                percent: 1,
                minutes: 10,
                apparatusId: engineId,
                productId: classAId,
              },
            ],
          },
          { Cookie: officerCookie },
        ),
      ),
    )) as Response;
    const body = await response.json();
    expect(body.discharges[0].warnings[0].code).toBe("proportioner_limit");
    expect(body.discharges[0].effectivePercent).toBeCloseTo(0.5, 9);
    expect(body.totals.concentrate.gal).toBe(20);
  });

  it("gives 400 with errors keyed by field path, and 401 without a session", async () => {
    const bad = await settle(() =>
      totalsAction(
        routeArgs(
          jsonRequest(
            "/api/totals",
            { discharges: [{ flow: "lots", flowUnit: "gal", basis: "water", percent: 100, minutes: 2000 }] },
            { Cookie: officerCookie },
          ),
        ),
      ),
    );
    expect((bad.value as Response).status).toBe(400);
    const { errors } = await (bad.value as Response).json();
    expect(Object.keys(errors).sort()).toEqual([
      "discharges.0.flow",
      "discharges.0.flowUnit",
      "discharges.0.minutes",
      "discharges.0.percent",
    ]);
    const anonymous = await settle(() => totalsAction(routeArgs(jsonRequest("/api/totals", { discharges: [] }))));
    expect((anonymous.value as Response).status).toBe(401);
  });
});
