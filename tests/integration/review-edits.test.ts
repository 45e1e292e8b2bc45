// Who may change a filed report, and when a change must give its reason: every role against the
// edit page (GET and POST) and PUT /api/events/:id, on a report an officer filed.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { changeReasonFor, type Role } from "~/lib/access";
import { db } from "~/lib/db.server";
import { reportHistory } from "~/models/event-read.server";
import { action as apiUpdate } from "~/routes/api.events.$id";
import { action as editAction, loader as editLoader } from "~/routes/events.$id.edit";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeEvent, makeStation } from "../support/usage-fixtures";

type Person = { id: number; cookie: string };
let station: number;
const people: Record<string, Person> = {};

async function person(roles: Role[], stationId: number | null): Promise<Person> {
  const user = await makeUser(roles, `Review Edit ${roles.join(" ")}`, { stationId });
  return { id: user.id, cookie: await signIn(user.email, TEST_PASSWORD) };
}

beforeAll(async () => {
  await ensureAgency();
  station = (await makeStation()).id;
  people.author = await person(["officer"], station);
  people.crewmate = await person(["officer"], station);
  people.environmental = await person(["environmental"], null);
  people.chief = await person(["chief"], null);
  people.records = await person(["records"], null);
  people.admin = await person(["admin"], null);
});

async function filedReport() {
  const { id } = await makeEvent({
    createdBy: people.author.id,
    status: "filed",
    stationId: station,
    startedAt: new Date("2026-04-01T14:00:00Z"),
  });
  return (await db("events").where({ id }).first()) as { id: number; version: number };
}

function fields(version: number, overrides: Record<string, string> = {}): Record<string, string> {
  return {
    intent: "file",
    version: String(version),
    submissionKey: randomUUID(),
    number: `RE-${randomUUID().slice(0, 8)}`,
    kind: "training",
    startedAt: "2026-04-01T09:00",
    clearedAt: "2026-04-01T10:00",
    address: "Changed in review",
    latitude: "38.7",
    longitude: "-98.2",
    stationId: String(station),
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

async function open(who: string, eventId: number) {
  const request = getRequest(`/events/${eventId}/edit`, { Cookie: people[who].cookie });
  const { value } = await settle(() => editLoader(routeArgs(request, { id: String(eventId) })));
  return { status: statusOf(value), reasonRequired: (value as { reasonRequired?: boolean }).reasonRequired };
}

async function save(who: string, eventId: number, body: Record<string, string>) {
  const request = formRequest(`/events/${eventId}/edit`, body, { Cookie: people[who].cookie });
  const { value } = await settle(() => editAction(routeArgs(request, { id: String(eventId) })));
  const errors = (value as { data?: { result?: { error?: Record<string, string[]> } } }).data?.result?.error;
  return { status: statusOf(value), errors };
}

async function put(who: string, eventId: number, body: Record<string, unknown>) {
  const origin = new URL(getRequest("/").url).origin;
  const request = new Request(`${origin}/api/events/${eventId}`, {
    method: "PUT",
    body: JSON.stringify(body),
    headers: { "Content-Type": "application/json", Origin: origin, Cookie: people[who].cookie },
  });
  const { value } = await settle(() => apiUpdate(routeArgs(request, { id: String(eventId) })));
  const response = value as Response;
  return { status: response.status, body: (await response.json()) as { errors?: Record<string, string[]> } };
}

function apiReport(version: number, overrides: Record<string, unknown> = {}) {
  return {
    intent: "file",
    version,
    number: `RA-${randomUUID().slice(0, 8)}`,
    kind: "training",
    startedAt: "2026-04-01T09:00",
    clearedAt: "2026-04-01T10:00",
    address: "Changed through the API",
    latitude: 38.7,
    longitude: -98.2,
    stationId: station,
    discharges: [{ flow: 100, flowUnit: "gpm", basis: "water", minutes: 5 }],
    dispositions: [{ disposition: "soil", sharePercent: 100 }],
    ...overrides,
  };
}

/**
 * The table under test, role by role, for a report the author filed: what the edit page answers,
 * whether it asks for a reason, and what a save without a reason answers.
 */
const EXPECTED: Record<string, { open: number; reasonRequired?: boolean; saveWithoutReason: number }> = {
  author: { open: 200, reasonRequired: false, saveWithoutReason: 302 },
  crewmate: { open: 403, saveWithoutReason: 403 },
  environmental: { open: 200, reasonRequired: true, saveWithoutReason: 400 },
  chief: { open: 200, reasonRequired: true, saveWithoutReason: 400 },
  records: { open: 403, saveWithoutReason: 403 },
  admin: { open: 403, saveWithoutReason: 403 },
};

describe("changing a filed report: route × role", () => {
  it("follows the table for the edit page and its save", async () => {
    const seen: Record<string, unknown> = {};
    for (const who of Object.keys(EXPECTED)) {
      const report = await filedReport();
      const page = await open(who, report.id);
      const saved = await save(who, report.id, fields(report.version));
      seen[who] = {
        open: page.status,
        ...(page.status === 200 ? { reasonRequired: page.reasonRequired } : {}),
        saveWithoutReason: saved.status,
      };
      if (saved.status === 400) expect(saved.errors?.revisionReason?.[0]).toMatch(/reason/);
    }
    expect(seen).toEqual(EXPECTED);
  });

  it("follows the same rule as JSON: PUT /api/events/:id", async () => {
    for (const who of Object.keys(EXPECTED)) {
      const report = await filedReport();
      const answer = await put(who, report.id, apiReport(report.version));
      const want = EXPECTED[who].saveWithoutReason;
      expect(answer.status, who).toBe(want === 302 ? 200 : want);
      if (want === 400) expect(answer.body.errors?.revisionReason).toBeDefined();
    }
    const report = await filedReport();
    const answer = await put("chief", report.id, apiReport(report.version, { revisionReason: "Station was wrong" }));
    expect(answer.status).toBe(200);
  });

  it("keeps the reviewer's reason in the audit log and shows it in the report's history", async () => {
    const report = await filedReport();
    const reason = "Line 1 ran 5 minutes by the pump log";
    const saved = await save("environmental", report.id, fields(report.version, { revisionReason: reason }));
    expect(saved.status).toBe(302);
    const audit = await db("audit_events")
      .where({ entity_type: "event", entity_id: String(report.id), action: "report_changed_in_review" })
      .first();
    expect(audit).toMatchObject({ actor_user_id: people.environmental.id, summary: `Reason: ${reason}` });
    const history = await reportHistory(report.id);
    expect(history.at(-1)).toMatchObject({ action: "Changed the filed report", summary: `Reason: ${reason}` });
    const row = await db("events").where({ id: report.id }).first();
    expect(row).toMatchObject({ status: "filed", address: "Changed in review", revision: 0 });
  });

  it("asks the author for no reason, and a returned or accepted report keeps its own rules", () => {
    const filed = { status: "filed" as const, createdBy: 7, stationId: 1 };
    expect(changeReasonFor({ id: 7, roles: ["officer"], stationId: 1 }, filed)).toBeNull();
    expect(changeReasonFor({ id: 8, roles: ["environmental"], stationId: null }, filed)).toBe("review-edit");
    expect(changeReasonFor({ id: 8, roles: ["chief"], stationId: null }, { ...filed, status: "returned" })).toBeNull();
    expect(changeReasonFor({ id: 7, roles: ["officer"], stationId: 1 }, { ...filed, status: "accepted" })).toBe(
      "revision",
    );
  });
});
