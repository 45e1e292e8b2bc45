// The public records-request path: intake, acknowledgement mail, public status, the clerk's queue
// and its API, extensions and the request's log.
import { describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { RECORDS_REQUESTS_PER_HOUR } from "~/lib/rate-limit.server";
import { action as intake } from "~/routes/records-requests";
import { loader as statusPage } from "~/routes/records-requests.$trackingCode";
import { loader as apiList } from "~/routes/api.records-requests";
import { loader as apiOne } from "~/routes/api.records-requests.$id";
import { action as changeRequest } from "~/routes/records.$id";
import {
  changeRecordsRequest,
  createRecordsRequest,
  listRecordsRequests,
  scheduleFor,
} from "~/models/records-request.server";
import { readAgencySettings } from "~/models/agency-settings.server";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency } from "../support/usage-fixtures";

let addressCounter = 0;
const freshAddress = () => ({ "x-foamtally-client-address": `203.0.113.${++addressCounter}` });

const VALID = {
  name: "Demo Requester",
  email: "requester@example.org",
  description: "Foam use reports near Willow Creek in March 2026.",
  from: "2026-03-01",
  to: "2026-03-31",
};

function statusOf(value: unknown): number {
  if (value instanceof Response) return value.status;
  return (value as { init?: { status?: number } | null })?.init?.status ?? 200;
}

describe("public intake", () => {
  it("answers JSON with a tracking code, queues the acknowledgement and shows status and due date only", async () => {
    await ensureAgency();
    const response = (await intake(
      routeArgs(formRequest("/records-requests", VALID, { Accept: "application/json", ...freshAddress() })),
    )) as Response;
    expect(response.status).toBe(201);
    const { trackingCode } = (await response.json()) as { trackingCode: string };
    expect(trackingCode).toMatch(/^RR-[0-9A-Z]{5}-[0-9A-Z]{5}$/);

    const mail = await db("mail_outbox").where({ kind: "records_acknowledgement" }).orderBy("id", "desc").first();
    expect(mail.to_addresses).toBe("requester@example.org");
    expect(mail.text_body).toContain(trackingCode);

    const page = (await statusPage(
      routeArgs(getRequest(`/records-requests/${trackingCode}`), { trackingCode }),
    )) as Record<string, unknown>;
    expect(page.statusLabel).toBe("Received");
    expect(page.dueOn).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    expect(JSON.stringify(page)).not.toContain("requester@example.org");
    expect(JSON.stringify(page)).not.toContain("Demo Requester");
  });

  it("redirects a form post to the acknowledgement page", async () => {
    const outcome = await settle(() => intake(routeArgs(formRequest("/records-requests", VALID, freshAddress()))));
    const response = outcome.value as Response;
    expect(response.status).toBe(302);
    expect(response.headers.get("Location")).toMatch(/^\/records-requests\/RR-[0-9A-Z-]+\?received=1$/);
  });

  it("refuses bad input with errors by field, and an oversized description with its limit", async () => {
    const before = await db("records_requests").count({ n: "*" }).first();
    const response = (await intake(
      routeArgs(
        formRequest(
          "/records-requests",
          { name: "", email: "not-an-address", description: "x".repeat(4_001), from: "2026-04-01", to: "2026-03-01" },
          { Accept: "application/json", ...freshAddress() },
        ),
      ),
    )) as Response;
    expect(response.status).toBe(400);
    const { errors } = (await response.json()) as { errors: Record<string, string[]> };
    expect(errors.name).toEqual(["Give your name."]);
    expect(errors.email).toEqual(["Not an e-mail address."]);
    expect(errors.description).toEqual(["At most 4,000 characters."]);
    const after = await db("records_requests").count({ n: "*" }).first();
    expect(after!.n).toBe(before!.n);
  });

  it("refuses a date range that ends before it starts, at the end field", async () => {
    const response = (await intake(
      routeArgs(
        formRequest(
          "/records-requests",
          { ...VALID, from: "2026-04-01", to: "2026-03-01" },
          { Accept: "application/json", ...freshAddress() },
        ),
      ),
    )) as Response;
    expect(response.status).toBe(400);
    const { errors } = (await response.json()) as { errors: Record<string, string[]> };
    expect(errors.to).toEqual(["The end of the range is before its start."]);
  });

  it("stores nothing when the hidden field is filled", async () => {
    const before = await db("records_requests").count({ n: "*" }).first();
    const outcome = await settle(() =>
      intake(routeArgs(formRequest("/records-requests", { ...VALID, website: "http://spam.example" }, freshAddress()))),
    );
    expect(statusOf(outcome.value)).toBe(400);
    const after = await db("records_requests").count({ n: "*" }).first();
    expect(after!.n).toBe(before!.n);
  });

  it("slows a flood from one address with 429 and Retry-After", async () => {
    const address = freshAddress();
    const headers = { Accept: "application/json", ...address };
    for (let index = 0; index < RECORDS_REQUESTS_PER_HOUR; index += 1) {
      const response = (await intake(routeArgs(formRequest("/records-requests", VALID, headers)))) as Response;
      expect(response.status).toBe(201);
    }
    const refused = (await intake(routeArgs(formRequest("/records-requests", VALID, headers)))) as Response;
    expect(refused.status).toBe(429);
    expect(Number(refused.headers.get("Retry-After"))).toBeGreaterThan(0);
    // The count is kept in MariaDB, where every app server reads it.
    const stored = await db("rate_limits")
      .where("key", `records-request:${address["x-foamtally-client-address"]}`)
      .first();
    expect(stored.points).toBeGreaterThan(RECORDS_REQUESTS_PER_HOUR);
  });
});

describe("due dates on intake", () => {
  it("counts from the next business day after office hours, by the agency's zone", async () => {
    await ensureAgency();
    const settings = { ...(await readAgencySettings()), timeZone: "America/Chicago", recordsDueRule: "illinois" };
    // Friday 2024-11-22 16:30 Chicago (22:30 UTC): within hours; 5 ILCS 140/3, 5 business days → 2024-12-02
    // (vector in shared/docs/reference-values.md).
    expect(scheduleFor(new Date("2024-11-22T22:30:00Z"), settings)).toEqual({
      countedFrom: "2024-11-22",
      dueOn: "2024-12-02",
    });
    // The same Friday at 17:30 Chicago: day 0 is Monday 2024-11-25; Thanksgiving 11-28 is skipped.
    expect(scheduleFor(new Date("2024-11-22T23:30:00Z"), settings)).toEqual({
      countedFrom: "2024-11-25",
      dueOn: "2024-12-03",
    });
  });
});

describe("the clerk's queue", () => {
  it("lists requests for clerks and administrators only; others 403, nobody 401", async () => {
    await ensureAgency();
    const clerk = await makeUser(["records"], "Queue Clerk");
    const admin = await makeUser(["admin"], "Queue Administrator");
    const officer = await makeUser(["officer"], "Queue Officer");
    const created = await createRecordsRequest({ ...VALID, description: "Queue test request description" });
    for (const [user, expected] of [
      [clerk, 200],
      [admin, 200],
      [officer, 403],
    ] as const) {
      const cookie = await signIn(user.email, TEST_PASSWORD);
      const outcome = await settle(() =>
        apiList(routeArgs(getRequest("/api/records-requests?status=all", { Cookie: cookie }))),
      );
      expect(statusOf(outcome.value), user.name).toBe(expected);
      if (expected === 200) {
        const body = (await (outcome.value as Response).json()) as { items: Array<Record<string, unknown>> };
        const item = body.items.find((entry) => entry.id === created.id)!;
        expect(Object.keys(item)).toEqual(
          expect.arrayContaining(["id", "trackingCode", "status", "receivedAt", "dueOn", "assignee"]),
        );
        const one = await settle(() =>
          apiOne(
            routeArgs(getRequest(`/api/records-requests/${created.id}`, { Cookie: cookie }), {
              id: String(created.id),
            }),
          ),
        );
        expect(((await (one.value as Response).json()) as { requester: { email: string } }).requester.email).toBe(
          VALID.email,
        );
      }
    }
    const anonymous = await settle(() => apiList(routeArgs(getRequest("/api/records-requests"))));
    expect(statusOf(anonymous.value)).toBe(401);
  });

  it("marks overdue and due-soon requests and sorts on the server", async () => {
    await ensureAgency();
    const overdue = await createRecordsRequest(
      { ...VALID, description: "Overdue request description" },
      new Date("2026-10-01T15:00:00Z"),
    );
    const soon = await createRecordsRequest({ ...VALID, description: "Due soon request description" });
    await db("records_requests").where({ id: soon.id }).update({ due_on: "2026-12-03" });
    const items = await listRecordsRequests(
      { status: "open", sort: "due", dir: "asc" },
      new Date("2026-12-02T15:00:00Z"),
    );
    const byId = new Map(items.map((item) => [item.id, item]));
    expect(byId.get(overdue.id)!.urgency).toBe("overdue");
    expect(byId.get(soon.id)!.urgency).toBe("due-soon");
    expect(byId.get(soon.id)!.daysLeft).toBe(1);
    const dues = items.map((item) => item.dueOn);
    expect(dues).toEqual([...dues].sort());
    const descending = await listRecordsRequests({ status: "open", sort: "due", dir: "desc" });
    expect(descending.map((item) => item.dueOn)).toEqual([...dues].sort().reverse());
  });

  it("moves the due date on an extension with its reason and logs every step", async () => {
    await ensureAgency();
    const clerk = await makeUser(["records"], "Extension Clerk");
    const created = await createRecordsRequest({ ...VALID, description: "Extension request description" });
    const before = await db("records_requests").where({ id: created.id }).first();
    const cookie = await signIn(clerk.email, TEST_PASSWORD);
    const missingReason = await settle(() =>
      changeRequest(
        routeArgs(formRequest(`/records/${created.id}`, { intent: "extend", days: "5" }, { Cookie: cookie }), {
          id: String(created.id),
        }),
      ),
    );
    expect(statusOf(missingReason.value)).toBe(400);
    await changeRequest(
      routeArgs(
        formRequest(
          `/records/${created.id}`,
          { intent: "extend", days: "5", reason: "Records held at two stations" },
          { Cookie: cookie },
        ),
        { id: String(created.id) },
      ),
    );
    await changeRecordsRequest(created.id, clerk.id, { intent: "status", status: "in_progress" });
    const after = await db("records_requests").where({ id: created.id }).first();
    expect(new Date(after.due_on).getTime()).toBeGreaterThan(new Date(before.due_on).getTime());
    const log = await db("records_request_log").where({ request_id: created.id }).orderBy("id").pluck("action");
    expect(log).toEqual(["received", "extended", "status"]);
    const reason = await db("records_request_log").where({ request_id: created.id, action: "extended" }).first();
    expect(reason.detail).toContain("Records held at two stations");
  });
});
