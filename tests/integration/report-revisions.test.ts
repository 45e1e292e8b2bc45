// An accepted report's earlier states: listed on the event page and readable, read-only, by those who may read it.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { loader as reportLoader } from "~/routes/events.$id";
import { action as editAction } from "~/routes/events.$id.edit";
import { loader as revisionLoader } from "~/routes/events.$id.revisions.$revision";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeEvent, makeProduct, makeStation } from "../support/usage-fixtures";

let station: number;
let officer: { id: number; cookie: string };
let stranger: { cookie: string };
let reviewerCookie: string;
let eventId: number;

const statusOf = (value: unknown) =>
  value instanceof Response ? value.status : ((value as { init?: { status?: number } | null }).init?.status ?? 200);

function revisionRequest(cookie: string, revision: string) {
  return revisionLoader(
    routeArgs(getRequest(`/events/${eventId}/revisions/${revision}`, { Cookie: cookie }), {
      id: String(eventId),
      revision,
    }),
  );
}

beforeAll(async () => {
  await ensureAgency();
  station = (await makeStation()).id;
  const author = await makeUser(["officer"], "Revising Officer", { stationId: station });
  officer = { id: author.id, cookie: await signIn(author.email, TEST_PASSWORD, "10.11.0.1") };
  // An administrator holds no reading role (README, roles): the earlier states are closed to them as the report is.
  const outsider = await makeUser(["admin"], "Account Keeper");
  stranger = { cookie: await signIn(outsider.email, TEST_PASSWORD, "10.11.0.2") };
  const reviewer = await makeUser(["environmental"], "Revision Reader");
  reviewerCookie = await signIn(reviewer.email, TEST_PASSWORD, "10.11.0.3");
  const classA = await makeProduct({ foamClass: "A" });
  const created = await makeEvent({
    createdBy: author.id,
    status: "accepted",
    stationId: station,
    startedAt: new Date("2026-05-04T14:00:00Z"),
    discharges: [{ productId: classA.id, percent: 0.5, water: 500, concentrate: 2.5 }],
  });
  eventId = created.id;
  const version = (await db("events").where({ id: eventId }).first()).version;
  const outcome = await settle(() =>
    editAction(
      routeArgs(
        formRequest(
          `/events/${eventId}/edit`,
          {
            intent: "file",
            submissionKey: randomUUID(),
            number: `RV-${randomUUID().slice(0, 8)}`,
            kind: "training",
            startedAt: "2026-05-04T09:00",
            clearedAt: "2026-05-04T10:00",
            address: "Amended Drill Yard",
            latitude: "38.7",
            longitude: "-98.2",
            stationId: String(station),
            "discharges[0].flow": "100",
            "discharges[0].flowUnit": "gpm",
            "discharges[0].basis": "water",
            "discharges[0].minutes": "5",
            "dispositions[0].disposition": "soil",
            "dispositions[0].sharePercent": "100",
            version: String(version),
            revisionReason: "Hose log shows a shorter flow",
          },
          { Cookie: officer.cookie },
        ),
        { id: String(eventId) },
      ),
    ),
  );
  expect(statusOf(outcome.value)).toBe(302);
});

describe("earlier states of an amended report", () => {
  it("are listed on the event page with who replaced them, when and why", async () => {
    const page = await reportLoader(
      routeArgs(getRequest(`/events/${eventId}`, { Cookie: reviewerCookie }), { id: String(eventId) }),
    );
    expect(page.report.revision).toBe(1);
    expect(page.revisions).toEqual([
      {
        revision: 0,
        reason: "Hose log shows a shorter flow",
        changedBy: "Revising Officer",
        changedAt: expect.stringMatching(/^\d{4}-\d{2}-\d{2}T/),
      },
    ]);
  });

  it("open read-only with the earlier figures, not today's", async () => {
    const earlier = await revisionRequest(reviewerCookie, "0");
    expect(earlier.report).toMatchObject({
      revision: 0,
      address: "100 Test Road",
      reason: "Hose log shows a shorter flow",
      supersededBy: "Revising Officer",
    });
    expect(earlier.report.totals).toEqual({ water: 500, concentrate: 2.5, solution: 502.5 });
    expect(earlier.report.discharges).toHaveLength(1);
    expect(earlier.report.discharges[0]).toMatchObject({ percent: 0.5, water: 500, foamClass: "A" });
    const current = await db("events").where({ id: eventId }).first();
    expect(current.address).toBe("Amended Drill Yard");
  });

  it("are refused to those who may not read the report, and a revision that does not exist is a 404", async () => {
    expect(statusOf((await settle(() => revisionRequest(officer.cookie, "0"))).value)).toBe(200);
    expect(statusOf((await settle(() => revisionRequest(stranger.cookie, "0"))).value)).toBe(403);
    for (const revision of ["1", "7", "abc", "-1"]) {
      expect(statusOf((await settle(() => revisionRequest(reviewerCookie, revision))).value), revision).toBe(404);
    }
  });
});
