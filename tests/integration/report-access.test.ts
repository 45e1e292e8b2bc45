// Who may open, change, revise and review which usage report, driven through the real pages.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { action as editAction, loader as editLoader } from "~/routes/events.$id.edit";
import { action as reviewAction } from "~/routes/events.$id";
import { action as newAction } from "~/routes/events.new";
import { loader as homeLoader } from "~/routes/home";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeEvent, makeStation } from "../support/usage-fixtures";

let ownStation: number;
let otherStation: number;
let author: { id: number; cookie: string };
let crewmate: { id: number; cookie: string };
let stranger: { id: number; cookie: string };
let reviewerCookie: string;

async function person(roles: Parameters<typeof makeUser>[0], stationId: number | null) {
  const user = await makeUser(roles, "Access Test", { stationId });
  return { id: user.id, cookie: await signIn(user.email, TEST_PASSWORD) };
}

beforeAll(async () => {
  await ensureAgency();
  ownStation = (await makeStation()).id;
  otherStation = (await makeStation()).id;
  author = await person(["officer"], ownStation);
  crewmate = await person(["officer"], ownStation);
  stranger = await person(["officer"], otherStation);
  reviewerCookie = (await person(["environmental"], null)).cookie;
});

function reportFields(overrides: Record<string, string> = {}): Record<string, string> {
  return {
    intent: "file",
    submissionKey: randomUUID(),
    number: `RA-${randomUUID().slice(0, 8)}`,
    kind: "training",
    startedAt: "2026-04-01T09:00",
    clearedAt: "2026-04-01T10:00",
    address: "12 Drill Yard",
    latitude: "38.7",
    longitude: "-98.2",
    stationId: String(ownStation),
    "discharges[0].flow": "100",
    "discharges[0].flowUnit": "gpm",
    "discharges[0].basis": "water",
    "discharges[0].minutes": "5",
    "dispositions[0].disposition": "soil",
    "dispositions[0].sharePercent": "100",
    ...overrides,
  };
}

function statusOf(value: unknown): number {
  if (value instanceof Response) return value.status;
  return (value as { init?: { status?: number } | null }).init?.status ?? 200;
}

async function saveEdit(cookie: string, eventId: number, fields: Record<string, string>) {
  const request = formRequest(`/events/${eventId}/edit`, fields, { Cookie: cookie });
  return statusOf((await settle(() => editAction(routeArgs(request, { id: String(eventId) })))).value);
}

async function openEdit(cookie: string, eventId: number) {
  const request = getRequest(`/events/${eventId}/edit`, { Cookie: cookie });
  return statusOf((await settle(() => editLoader(routeArgs(request, { id: String(eventId) })))).value);
}

async function report(status: "draft" | "filed" | "returned" | "accepted", createdBy: number, stationId: number) {
  const { id } = await makeEvent({ createdBy, status, stationId, startedAt: new Date("2026-04-01T14:00:00Z") });
  return (await db("events").where({ id }).first()) as { id: number; version: number; address: string };
}

describe("an officer and the reports of others", () => {
  it("opens and saves only their own draft; another officer's draft is not there for them, even with its version", async () => {
    const draft = await report("draft", author.id, ownStation);
    expect(await openEdit(author.cookie, draft.id)).toBe(200);
    expect(await openEdit(crewmate.cookie, draft.id)).toBe(404);
    const fields = reportFields({ intent: "save-draft", address: "Overwritten", version: String(draft.version) });
    expect(await saveEdit(crewmate.cookie, draft.id, fields)).toBe(404);
    // A stale version is no clue either: the answer is the same 404, not a 409.
    expect(await saveEdit(crewmate.cookie, draft.id, { ...fields, version: "99" })).toBe(404);
    expect((await db("events").where({ id: draft.id }).first()).address).toBe("100 Test Road");
    expect(await saveEdit(author.cookie, draft.id, { ...fields, submissionKey: randomUUID() })).toBe(302);
    expect((await db("events").where({ id: draft.id }).first()).address).toBe("Overwritten");
  });

  it("fixes a returned report of their own station; an officer of another station may not", async () => {
    const returned = await report("returned", author.id, ownStation);
    const fields = reportFields({ version: String(returned.version), address: "Fixed by the crew" });
    expect(await openEdit(stranger.cookie, returned.id)).toBe(403);
    expect(await saveEdit(stranger.cookie, returned.id, fields)).toBe(403);
    expect((await db("events").where({ id: returned.id }).first()).status).toBe("returned");
    expect(await openEdit(crewmate.cookie, returned.id)).toBe(200);
    expect(await saveEdit(crewmate.cookie, returned.id, fields)).toBe(302);
    const saved = await db("events").where({ id: returned.id }).first();
    expect(saved).toMatchObject({ status: "filed", address: "Fixed by the crew" });
  });

  it("revises an accepted report of their own station only", async () => {
    const accepted = await report("accepted", crewmate.id, ownStation);
    const fields = reportFields({ version: String(accepted.version), revisionReason: "Pump log says 6 minutes" });
    expect(await saveEdit(stranger.cookie, accepted.id, fields)).toBe(403);
    expect((await db("events").where({ id: accepted.id }).first()).revision).toBe(0);
    expect(await saveEdit(author.cookie, accepted.id, fields)).toBe(302);
    expect((await db("events").where({ id: accepted.id }).first()).revision).toBe(1);
  });

  it("sees on the home page the returned reports of their station as well as their own", async () => {
    const returned = await report("returned", author.id, ownStation);
    const home = (await homeLoader(routeArgs(getRequest("/", { Cookie: crewmate.cookie })))) as {
      returned: Array<{ id: number }>;
    };
    expect(home.returned.map((item) => item.id)).toContain(returned.id);
    const away = (await homeLoader(routeArgs(getRequest("/", { Cookie: stranger.cookie })))) as {
      returned: Array<{ id: number }>;
    };
    expect(away.returned.map((item) => item.id)).not.toContain(returned.id);
  });
});

describe("the report acted on is the one in the URL", () => {
  it("a new report never overwrites the report named by a body's eventId", async () => {
    const theirs = await report("draft", stranger.id, otherStation);
    const fields = reportFields({ eventId: String(theirs.id), version: String(theirs.version) });
    const outcome = await settle(() =>
      newAction(routeArgs(formRequest("/events/new", fields, { Cookie: author.cookie }))),
    );
    expect(statusOf(outcome.value)).toBe(302);
    expect((await db("events").where({ id: theirs.id }).first()).address).toBe("100 Test Road");
    expect(await db("events").where({ number: fields.number }).first()).toMatchObject({ created_by: author.id });
  });

  it("an edit changes the report of its URL, whatever eventId the body names", async () => {
    const mine = await report("draft", author.id, ownStation);
    const theirs = await report("draft", stranger.id, otherStation);
    const fields = reportFields({
      intent: "save-draft",
      address: "Mine, changed",
      eventId: String(theirs.id),
      version: String(mine.version),
    });
    expect(await saveEdit(author.cookie, mine.id, fields)).toBe(302);
    expect((await db("events").where({ id: mine.id }).first()).address).toBe("Mine, changed");
    expect((await db("events").where({ id: theirs.id }).first()).address).toBe("100 Test Road");
  });
});

describe("reviewing", () => {
  it("answers a review of someone's draft with 404, whatever the version, and never 409", async () => {
    const draft = await report("draft", author.id, ownStation);
    for (const version of [String(draft.version), "99"]) {
      const request = formRequest(`/events/${draft.id}`, { decision: "accept", version }, { Cookie: reviewerCookie });
      const outcome = await settle(() => reviewAction(routeArgs(request, { id: String(draft.id) })));
      expect(statusOf(outcome.value)).toBe(404);
    }
    expect((await db("events").where({ id: draft.id }).first()).status).toBe("draft");
  });

  it("still answers a stale review of a filed report with 409", async () => {
    const filed = await report("filed", author.id, ownStation);
    const request = formRequest(
      `/events/${filed.id}`,
      { decision: "accept", version: "99" },
      { Cookie: reviewerCookie },
    );
    const outcome = await settle(() => reviewAction(routeArgs(request, { id: String(filed.id) })));
    expect(statusOf(outcome.value)).toBe(409);
  });
});
