import { createHash } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as XLSX from "xlsx";
import { db } from "~/lib/db.server";
import { getObject } from "~/lib/storage.server";
import { action as pageAction, loader as pageLoader } from "~/routes/environmental";
import { loader as submissionLoader } from "~/routes/environmental.submissions.$id";
import { loader as csvLoader } from "~/routes/reports.environmental-csv";
import { loader as xlsxLoader } from "~/routes/reports.environmental-xlsx";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { startFileStore } from "../support/file-store";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeEvent, makeProduct } from "../support/usage-fixtures";

let enviroCookie: string;
let chiefCookie: string;
let officerCookie: string;

let closeFileStore: () => Promise<void>;

afterAll(async () => {
  await closeFileStore();
});

beforeAll(async () => {
  closeFileStore = await startFileStore("environmental-routes");
  await ensureAgency(db, { report_recipients: "quarterly-desk@test.example" });
  const enviro = await makeUser(["environmental"], "Route Reviewer");
  const chief = await makeUser(["chief"]);
  const officer = await makeUser(["officer"]);
  enviroCookie = await signIn(enviro.email, TEST_PASSWORD, "10.5.0.1");
  chiefCookie = await signIn(chief.email, TEST_PASSWORD, "10.5.0.2");
  officerCookie = await signIn(officer.email, TEST_PASSWORD, "10.5.0.3");
  const classA = await makeProduct({ foamClass: "A" });
  await makeEvent({
    createdBy: officer.id,
    startedAt: new Date("2034-08-10T15:00:00Z"),
    discharges: [{ productId: classA.id, percent: 0.5, water: 400, concentrate: 2 }],
  });
});

const statusOf = (value: unknown) =>
  value instanceof Response ? value.status : (value as { init?: { status?: number } }).init?.status;

describe("environmental downloads and submission", () => {
  it("gives the environmental officer and the chief the workbook; others get 403", async () => {
    for (const cookie of [enviroCookie, chiefCookie]) {
      const response = (await xlsxLoader(
        routeArgs(getRequest("/reports/environmental.xlsx?year=2034&quarter=3", { Cookie: cookie })),
      )) as Response;
      expect(response.status).toBe(200);
      expect(response.headers.get("Content-Disposition")).toBe(
        'attachment; filename="foam-runoff-summary_2034-Q3.xlsx"',
      );
      const bytes = Buffer.from(await response.arrayBuffer());
      expect(createHash("sha256").update(bytes).digest("hex")).toBe(response.headers.get("X-Content-SHA256"));
      const book = XLSX.read(bytes);
      expect(XLSX.utils.sheet_to_json(book.Sheets.Discharges)).toHaveLength(1);
    }
    const refused = await settle(() =>
      xlsxLoader(routeArgs(getRequest("/reports/environmental.xlsx?year=2034&quarter=3", { Cookie: officerCookie }))),
    );
    expect(refused.thrown).toBe(true);
    expect(statusOf(refused.value)).toBe(403);
  });

  it.each([
    ["year=2034&quarter=5", /quarter must be 1, 2, 3 or 4/],
    ["from=2034-09-01&to=2034-08-01", /on or after/],
    ["", /Choose a year and quarter/],
  ])("answers ?%s with a clear 400", async (query, message) => {
    const outcome = await settle(() =>
      csvLoader(routeArgs(getRequest(`/reports/environmental.csv?${query}`, { Cookie: enviroCookie }))),
    );
    expect(outcome.thrown).toBe(true);
    expect(statusOf(outcome.value)).toBe(400);
    expect((outcome.value as { data: { message: string } }).data.message).toMatch(message);
  });

  it("zips one CSV per table", async () => {
    const response = (await csvLoader(
      routeArgs(getRequest("/reports/environmental.csv?from=2034-08-01&to=2034-08-31", { Cookie: chiefCookie })),
    )) as Response;
    expect(response.headers.get("Content-Type")).toBe("application/zip");
    const bytes = Buffer.from(await response.arrayBuffer());
    // Each entry's name appears in its local file header of the zip.
    const text = bytes.toString("latin1");
    for (const name of [
      "summary.csv",
      "events.csv",
      "discharges.csv",
      "releases.csv",
      "non_incident_use.csv",
      "pfas.csv",
      "method-and-cautions.txt",
    ]) {
      expect(text).toContain(name);
    }
    expect(bytes.subarray(0, 4).toString("latin1")).toBe("PK\u0003\u0004");
    // SheetJS reads zip containers too (XLSX.CFB); the discharge table holds the one accepted line of August.
    const zip = XLSX.CFB.read(bytes, { type: "buffer" });
    const csv = Buffer.from(XLSX.CFB.find(zip, "discharges.csv")?.content as Uint8Array).toString("utf8");
    expect(csv.startsWith("\uFEFFEvent number,Kind,Line,")).toBe(true);
    const lines = XLSX.utils.sheet_to_json<Record<string, unknown>>(
      XLSX.read(csv.slice(1), { type: "string" }).Sheets.Sheet1,
    );
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatchObject({ "Water (US gal)": 400, "Concentrate (US gal)": 2, "Foam solution (US gal)": 402 });
  });

  it("stores the exact submitted file with its digest, and later downloads say so", async () => {
    const outcome = await settle(() =>
      pageAction(
        routeArgs(
          formRequest(
            "/environmental",
            { intent: "submit", year: "2034", quarter: "3", note: "Sent to the county desk" },
            { Cookie: enviroCookie },
          ),
        ),
      ),
    );
    expect(statusOf(outcome.value)).toBe(302);
    const stored = await db("quarterly_submissions").where({ label: "2034 Q3" }).first();
    // The file lives in the object store, under a key the server made; the row keeps no copy.
    expect(stored.content).toBeNull();
    expect(stored.storage_key).toMatch(/^quarterly-submissions\/[0-9a-f-]{36}$/);
    const kept = (await getObject(stored.storage_key)).body;
    expect(createHash("sha256").update(kept).digest("hex")).toBe(stored.sha256);
    expect(stored).toMatchObject({ accepted_reports: 1, note: "Sent to the county desk" });
    const audit = await db("audit_events")
      .where({ action: "quarter_submitted", entity_id: String(stored.id) })
      .first();
    expect(audit).toBeTruthy();

    const file = (await submissionLoader(
      routeArgs(getRequest(`/environmental/submissions/${stored.id}`, { Cookie: chiefCookie }), {
        id: String(stored.id),
      }),
    )) as Response;
    expect(
      createHash("sha256")
        .update(Buffer.from(await file.arrayBuffer()))
        .digest("hex"),
    ).toBe(stored.sha256);

    const later = (await xlsxLoader(
      routeArgs(getRequest("/reports/environmental.xlsx?year=2034&quarter=3", { Cookie: enviroCookie })),
    )) as Response;
    const summary = XLSX.utils.sheet_to_json<string[]>(
      XLSX.read(Buffer.from(await later.arrayBuffer())).Sheets.Summary,
      {
        header: 1,
      },
    );
    const submissionLine = summary.find((row) => row[0] === "Submission");
    expect(submissionLine?.[1]).toContain(stored.sha256);

    const page = (await pageLoader(
      routeArgs(getRequest("/environmental?year=2034&quarter=3", { Cookie: enviroCookie })),
    )) as unknown as { data: { submission: { sha256: string } } };
    expect(page.data.submission.sha256).toBe(stored.sha256);
  });

  it("lists events amended after the submission on the Summary sheet", async () => {
    const event = await db("events")
      .where("started_at", ">=", new Date("2034-08-01"))
      .where("started_at", "<", new Date("2034-09-01"))
      .first();
    const later = new Date(Date.now() + 5_000);
    await db("events").where({ id: event.id }).update({ revision: 1, updated_at: later });
    // As a save stores it: the revision row keeps revision 0, the state that revision 1 replaced.
    await db("event_revisions").insert({
      event_id: event.id,
      revision: 0,
      reason: "Corrected the duration of line 1",
      snapshot_json: "{}",
      created_by: event.created_by,
      created_at: later,
    });
    const response = (await xlsxLoader(
      routeArgs(getRequest("/reports/environmental.xlsx?year=2034&quarter=3", { Cookie: enviroCookie })),
    )) as Response;
    const summary = XLSX.utils.sheet_to_json<unknown[]>(
      XLSX.read(Buffer.from(await response.arrayBuffer())).Sheets.Summary,
      {
        header: 1,
      },
    );
    const heading = summary.findIndex((row) => row[0] === "Changes since submission");
    expect(summary[heading + 1]).toEqual(["Event number", "Revision", "Changed at (local)", "What changed"]);
    expect(summary[heading + 2]).toEqual([
      event.number,
      1,
      expect.any(String),
      "Revision 1 filed in place of revision 0: Corrected the duration of line 1",
    ]);
    expect(summary).toHaveLength(heading + 3);
  });

  it("refuses submission by the chief (download only) and an invalid period with 400", async () => {
    const chief = await settle(() =>
      pageAction(
        routeArgs(
          formRequest("/environmental", { intent: "submit", year: "2034", quarter: "3" }, { Cookie: chiefCookie }),
        ),
      ),
    );
    expect(statusOf(chief.value)).toBe(403);
    const bad = await settle(() =>
      pageAction(
        routeArgs(
          formRequest("/environmental", { intent: "submit", year: "2034", quarter: "9" }, { Cookie: enviroCookie }),
        ),
      ),
    );
    expect(statusOf(bad.value)).toBe(400);
  });

  it("queues the submitted file to the report recipients", async () => {
    const outcome = await settle(() =>
      pageAction(
        routeArgs(
          formRequest("/environmental", { intent: "send", year: "2034", quarter: "3" }, { Cookie: enviroCookie }),
        ),
      ),
    );
    expect(statusOf(outcome.value)).toBe(302);
    const submission = await db("quarterly_submissions").where({ label: "2034 Q3" }).first();
    const queued = await db("mail_outbox").where({ kind: "quarterly_workbook", submission_id: submission.id }).first();
    expect(queued.to_addresses).toBe("quarterly-desk@test.example");
    expect(createHash("sha256").update(queued.attachment_content).digest("hex")).toBe(submission.sha256);
  });
});
