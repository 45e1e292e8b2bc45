// The "To review" queue's flags and order, and reports in a period already marked submitted.
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { reviewQueue } from "~/models/review-queue.server";
import { action as environmentalAction, loader as environmentalLoader } from "~/routes/environmental";
import { loader as eventLoader } from "~/routes/events.$id";
import { loader as queueLoader } from "~/routes/review";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeEvent, makeProduct } from "../support/usage-fixtures";

let reviewerCookie: string;
let officerId: number;
const ids: Record<string, number> = {};

beforeAll(async () => {
  await ensureAgency();
  const reviewer = await makeUser(["environmental"], "Queue Reviewer");
  reviewerCookie = await signIn(reviewer.email, TEST_PASSWORD);
  officerId = (await makeUser(["officer"], "Queue Officer")).id;
  const legacy = await makeProduct({ foamClass: "B", foamType: "afff", pfasContaining: true });
  // Filed (makeEvent files at the start) in this order: the PFAS one first, the plain one last.
  ids.pfas = (
    await makeEvent({
      createdBy: officerId,
      status: "filed",
      startedAt: new Date("2043-01-05T15:00:00Z"),
      discharges: [{ productId: legacy.id, percent: 3, water: 97, concentrate: 3 }],
      pfasContaining: true,
    })
  ).id;
  ids.storm = (
    await makeEvent({
      createdBy: officerId,
      status: "filed",
      startedAt: new Date("2043-01-06T15:00:00Z"),
      dispositions: [{ disposition: "storm_drain", sharePercent: 100, receivingWater: "Test Run" }],
    })
  ).id;
  ids.warned = (
    await makeEvent({ createdBy: officerId, status: "filed", startedAt: new Date("2043-01-07T15:00:00Z") })
  ).id;
  ids.plain = (
    await makeEvent({ createdBy: officerId, status: "filed", startedAt: new Date("2043-01-08T15:00:00Z") })
  ).id;
  ids.accepted = (await makeEvent({ createdBy: officerId, startedAt: new Date("2043-01-04T15:00:00Z") })).id;
  await db("events")
    .whereIn("id", [ids.pfas, ids.storm, ids.warned, ids.plain])
    .update({ latitude: 38.7, longitude: -98.2 });
  await db("events").where({ id: ids.warned }).update({ has_warnings: true });
  await db("events").where({ id: ids.plain }).update({ latitude: null, longitude: null });
});

describe("the To review queue", () => {
  it("lists filed reports only, the longest waiting first, with their flags and age", async () => {
    const now = new Date("2043-01-08T17:30:00Z");
    const mine = (await reviewQueue(now)).filter((item) => Object.values(ids).includes(item.id));
    expect(mine.map((item) => item.id)).toEqual([ids.pfas, ids.storm, ids.warned, ids.plain]);
    expect(mine.map((item) => item.flags)).toEqual([["pfas"], ["to-water"], ["warnings"], ["no-location"]]);
    // Filed 2043-01-05 15:00Z, read 2043-01-08 17:30Z: 3 days 2 h 30 min.
    expect(mine[0].minutesWaiting).toBe(3 * 1440 + 150);
    expect(mine[3].minutesWaiting).toBe(150);
  });

  it("is the reviewer's page", async () => {
    const page = (await queueLoader(routeArgs(getRequest("/review", { Cookie: reviewerCookie })))) as {
      items: Array<{ id: number }>;
    };
    expect(page.items.map((item) => item.id)).toContain(ids.storm);
    expect(page.items.map((item) => item.id)).not.toContain(ids.accepted);
  });
});

describe("a report in a period already marked submitted", () => {
  let eventId: number;

  beforeAll(async () => {
    eventId = (await makeEvent({ createdBy: officerId, startedAt: new Date("2042-05-05T15:00:00Z") })).id;
    await db("quarterly_submissions").insert({
      period_from: "2042-04-01",
      period_to: "2042-06-30",
      label: "2042 Q2",
      file_name: "2042-q2.xlsx",
      content_type: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
      content: Buffer.from("stored"),
      sha256: "1".repeat(64),
      byte_size: 6,
      submitted_by: officerId,
    });
  });

  it("says so on its page", async () => {
    const page = (await eventLoader(
      routeArgs(getRequest(`/events/${eventId}`, { Cookie: reviewerCookie }), { id: String(eventId) }),
    )) as { submittedPeriod: { label: string; submittedBy: string } | null };
    expect(page.submittedPeriod).toMatchObject({ label: "2042 Q2", submittedBy: "Queue Officer" });
    const other = (await makeEvent({ createdBy: officerId, startedAt: new Date("2042-07-05T15:00:00Z") })).id;
    const outside = (await eventLoader(
      routeArgs(getRequest(`/events/${other}`, { Cookie: reviewerCookie }), { id: String(other) }),
    )) as { submittedPeriod: unknown };
    expect(outside.submittedPeriod).toBeNull();
  });

  it("cannot be marked submitted again: the page disables it and the action refuses with 409", async () => {
    const page = (await environmentalLoader(
      routeArgs(getRequest("/environmental?year=2042&quarter=2", { Cookie: reviewerCookie })),
    )) as unknown as { data: { submission: { id: number } | null } };
    expect(page.data.submission).not.toBeNull();
    const outcome = await settle(() =>
      environmentalAction(
        routeArgs(
          formRequest("/environmental", { intent: "submit", year: "2042", quarter: "2" }, { Cookie: reviewerCookie }),
        ),
      ),
    );
    const value = outcome.value as { init?: { status?: number }; data?: { error?: string } };
    expect(value.init?.status).toBe(409);
    expect(value.data?.error).toMatch(/already marked submitted/);
    expect(await db("quarterly_submissions").where({ label: "2042 Q2" }).count({ n: "*" })).toEqual([{ n: 1 }]);
  });
});
