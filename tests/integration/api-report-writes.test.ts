// Creating, saving and filing reports as JSON through /api/events: the report form's schema,
// status rules, version check and submission keys, answered as JSON.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import type { Role } from "~/lib/access";
import type { SessionUser } from "~/lib/auth.server";
import { db } from "~/lib/db.server";
import { createApiToken } from "~/models/api-token.server";
import { action as updateAction } from "~/routes/api.events.$id";
import { action as createAction } from "~/routes/api.events";
import { makeUser } from "../support/factories";
import { jsonRequest, routeArgs, settle } from "../support/requests";
import { ensureAgency, makeApparatus, makeEvent, makeProduct, makeStation } from "../support/usage-fixtures";

const ORIGIN = new URL(jsonRequest("/", {}).url).origin;

let stationId: number;
let otherStationId: number;
let engineId: number;
let productId: number;
let officerId: number;
let officerAuth: Record<string, string>;
let clerkAuth: Record<string, string>;

async function bearerFor(roles: Role[], name: string, stationId: number | null) {
  const user = await makeUser(roles, name, { stationId });
  const session = { id: user.id, roles, stationId, email: user.email, name: user.name, epoch: 0 } as SessionUser;
  const { token } = await createApiToken(session, "api writes");
  return { id: user.id, headers: { Authorization: `Bearer ${token}` } };
}

beforeAll(async () => {
  await ensureAgency();
  stationId = (await makeStation()).id;
  otherStationId = (await makeStation()).id;
  engineId = (await makeApparatus(stationId)).id;
  productId = (await makeProduct({ foamClass: "A" })).id;
  const officer = await bearerFor(["officer"], "Officer Api Writer", stationId);
  officerId = officer.id;
  officerAuth = officer.headers;
  clerkAuth = (await bearerFor(["records"], "Clerk Api Writer", null)).headers;
});

function report(overrides: Record<string, unknown> = {}) {
  return {
    intent: "file",
    number: `API-${randomUUID().slice(0, 8)}`,
    kind: "incident",
    startedAt: "2026-03-01T09:00",
    clearedAt: "2026-03-01T11:00",
    address: "100 Test Street",
    latitude: 38.7,
    longitude: -98.2,
    stationId,
    discharges: [
      { apparatusId: engineId, productId, percent: 0.3, flow: 200, flowUnit: "gpm", basis: "water", minutes: 10 },
    ],
    dispositions: [{ disposition: "evaporated_unknown", sharePercent: 100 }],
    ...overrides,
  };
}

function put(id: number, body: unknown, headers: Record<string, string>) {
  return new Request(`${ORIGIN}/api/events/${id}`, {
    method: "PUT",
    body: JSON.stringify(body),
    headers: { "Content-Type": "application/json", Origin: ORIGIN, ...headers },
  });
}

async function answer(run: () => Promise<unknown>) {
  const { value } = await settle(run);
  const response = value as Response;
  return { status: response.status, body: (await response.json()) as Record<string, unknown> };
}

const create = (body: unknown, headers: Record<string, string> = officerAuth) =>
  answer(() => createAction(routeArgs(jsonRequest("/api/events", body, headers))));
const update = (id: number, body: unknown, headers: Record<string, string> = officerAuth) =>
  answer(() => updateAction(routeArgs(put(id, body, headers), { id: String(id) })));

describe("POST /api/events and PUT /api/events/:id", () => {
  it("creates a draft, then files it with the version read", async () => {
    const draft = await create({ intent: "save", kind: "incident", address: "Half typed", discharges: [{ flow: 50 }] });
    expect(draft.status).toBe(201);
    expect(draft.body).toMatchObject({ status: "draft", url: `/events/${String(draft.body.id)}` });
    expect(typeof draft.body.number).toBe("string");
    const id = draft.body.id as number;
    const row = await db("events").where({ id }).first("version", "status");
    expect(row.status).toBe("draft");

    const filed = await update(id, report({ version: row.version }));
    expect(filed.status).toBe(200);
    expect(filed.body).toMatchObject({ id, status: "filed", url: `/events/${id}` });
    expect((await db("events").where({ id }).first("status")).status).toBe("filed");
  });

  it("files a new report in one request", async () => {
    const filed = await create(report());
    expect(filed.status).toBe(201);
    expect(filed.body.status).toBe("filed");
    expect(await db("discharges").where({ event_id: filed.body.id }).count({ n: "*" })).toEqual([{ n: 1 }]);
  });

  it("refuses a report that does not pass the form's schema, with errors keyed by field", async () => {
    const before = await db("events").count({ n: "*" });
    const refused = await create(report({ discharges: [{ flowUnit: "gpm", basis: "water", minutes: 10, flow: -5 }] }));
    expect(refused.status).toBe(400);
    expect((refused.body.errors as Record<string, string[]>)["discharges.0.flow"]).toEqual([
      "The flow must be more than 0.",
    ]);
    expect(await db("events").count({ n: "*" })).toEqual(before);
  });

  it("refuses an unknown intent", async () => {
    const refused = await create(report({ intent: "publish" }));
    expect(refused.status).toBe(400);
    expect(refused.body.errors).toHaveProperty("intent");
  });

  it("answers a replayed Idempotency-Key with the same report, and 20 at once make one", async () => {
    const key = randomUUID();
    const first = await create(report(), { ...officerAuth, "Idempotency-Key": key });
    const again = await create(report(), { ...officerAuth, "Idempotency-Key": key });
    expect(first.status).toBe(201);
    expect(again.body.id).toBe(first.body.id);

    const raced = randomUUID();
    const body = report();
    const answers = await Promise.all(
      Array.from({ length: 20 }, () => create(body, { ...officerAuth, "Idempotency-Key": raced })),
    );
    const ids = new Set(answers.map((reply) => reply.body.id));
    expect(answers.every((reply) => reply.status === 201)).toBe(true);
    expect(ids.size).toBe(1);
    expect(await db("events").where({ number: body.number }).count({ n: "*" })).toEqual([{ n: 1 }]);
  });

  it("keeps one sender's Idempotency-Key from answering with another's report", async () => {
    const key = `shared-${randomUUID()}`;
    const mine = await create(report(), { ...officerAuth, "Idempotency-Key": key });
    const colleague = await bearerFor(["officer"], "Colleague Api Writer", stationId);
    const theirs = await create(report(), { ...colleague.headers, "Idempotency-Key": key });
    expect(mine.status).toBe(201);
    expect(theirs.status).toBe(201);
    expect(theirs.body.id).not.toBe(mine.body.id);
  });

  it("refuses a malformed Idempotency-Key", async () => {
    const refused = await create(report(), { ...officerAuth, "Idempotency-Key": "no spaces allowed" });
    expect(refused.status).toBe(400);
  });

  it("is 403 for a role that may not start reports", async () => {
    const refused = await create(report(), clerkAuth);
    expect(refused.status).toBe(403);
  });

  it("is 404 for a report one may not see", async () => {
    const stranger = await makeUser(["officer"], "Other Station Officer", { stationId: otherStationId });
    const hidden = await makeEvent({
      createdBy: stranger.id,
      status: "draft",
      stationId: otherStationId,
      startedAt: new Date("2026-02-01T12:00:00Z"),
    });
    const refused = await update(hidden.id, report({ version: 1 }));
    expect(refused.status).toBe(404);
    expect(await update(999_999_999, report({ version: 1 }))).toMatchObject({ status: 404 });
  });

  it("is 409 on a stale version and keeps the newer save", async () => {
    const draft = await create({ intent: "save", kind: "incident", address: "First" });
    const id = draft.body.id as number;
    const { version } = await db("events").where({ id }).first("version");
    expect((await update(id, { intent: "save", version, address: "Second" })).status).toBe(200);
    const stale = await update(id, { intent: "save", version, address: "Third" });
    expect(stale.status).toBe(409);
    expect((await db("events").where({ id }).first("version")).version).toBe(version + 1);
  });

  it("asks for the version on a change", async () => {
    const draft = await create({ intent: "save", kind: "incident" });
    const refused = await update(draft.body.id as number, { intent: "save" });
    expect(refused.status).toBe(400);
    expect(refused.body.errors).toHaveProperty("version");
  });

  it("revises an accepted report only when filed with a reason", async () => {
    const accepted = await makeEvent({
      createdBy: officerId,
      status: "accepted",
      stationId,
      startedAt: new Date("2026-02-01T12:00:00Z"),
    });
    const { version } = await db("events").where({ id: accepted.id }).first("version");
    const asDraft = await update(accepted.id, report({ intent: "save", version }));
    expect(asDraft.status).toBe(400);
    const unexplained = await update(accepted.id, report({ version }));
    expect(unexplained.status).toBe(400);
    expect(unexplained.body.errors).toHaveProperty("revisionReason");
    const revised = await update(accepted.id, report({ version, revisionReason: "Corrected the flow" }));
    expect(revised.status).toBe(200);
    expect(revised.body.id).toBe(accepted.id);
    expect((await db("events").where({ id: accepted.id }).first("version")).version).toBe(version + 1);
  });

  it("is 415 for a body that is not JSON", async () => {
    const request = new Request(`${ORIGIN}/api/events`, {
      method: "POST",
      body: "intent=file",
      headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: ORIGIN, ...officerAuth },
    });
    const refused = await answer(() => createAction(routeArgs(request)));
    expect(refused.status).toBe(415);
  });
});
