import { createHash } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { putObject } from "~/lib/storage.server";
import { action as pageAction } from "~/routes/environmental";
import { loader as submissionLoader } from "~/routes/environmental.submissions.$id";
import { loader as eventsCsvLoader } from "~/routes/events.csv";
import { loader as sheetLoader } from "~/routes/products.$productId.safety-sheet";
import { loader as csvLoader } from "~/routes/reports.environmental-csv";
import { loader as xlsxLoader } from "~/routes/reports.environmental-xlsx";
import { makeProductRow } from "../support/catalogue-factories";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { startFileStore } from "../support/file-store";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeEvent, makeProduct } from "../support/usage-fixtures";

// Every file that leaves Foamtally leaves an audit row: who took it, what, which period or record, its digest.
let enviro: Awaited<ReturnType<typeof makeUser>>;
let enviroCookie: string;
let closeFileStore: () => Promise<void>;

const sha256 = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");

async function latestAudit(action: string) {
  const row = await db("audit_events").where({ action, actor_user_id: enviro.id }).orderBy("id", "desc").first();
  expect(row, action).toBeTruthy();
  return { ...row, after: JSON.parse(row.after_json ?? "null") };
}

beforeAll(async () => {
  closeFileStore = await startFileStore("download-audit");
  await ensureAgency(db, { report_recipients: "quarterly-desk@test.example" });
  enviro = await makeUser(["environmental"], "Download Auditor");
  enviroCookie = await signIn(enviro.email, TEST_PASSWORD, "10.8.0.1");
  const officer = await makeUser(["officer"]);
  const classA = await makeProduct({ foamClass: "A" });
  await makeEvent({
    createdBy: officer.id,
    startedAt: new Date("2036-05-10T15:00:00Z"),
    discharges: [{ productId: classA.id, percent: 0.5, water: 400, concentrate: 2 }],
  });
});

afterAll(() => closeFileStore());

describe("audited downloads", () => {
  it("records the quarterly workbook's period, file name and digest, and who took it", async () => {
    const response = (await xlsxLoader(
      routeArgs(
        getRequest("/reports/environmental.xlsx?year=2036&quarter=2", {
          Cookie: enviroCookie,
          "x-foamtally-client-address": "10.8.0.1",
        }),
      ),
    )) as Response;
    const bytes = new Uint8Array(await response.arrayBuffer());
    const audit = await latestAudit("quarterly_workbook_downloaded");
    expect(audit).toMatchObject({
      entity_type: "quarterly_period",
      entity_id: "2036-04-01..2036-06-30",
      actor_label: enviro.email,
      client_address: "10.8.0.1",
    });
    expect(audit.after).toMatchObject({
      period: ["2036-04-01", "2036-06-30"],
      fileName: "foam-runoff-summary_2036-Q2.xlsx",
      sha256: sha256(bytes),
      byteSize: bytes.byteLength,
    });
  });

  it("records the zipped CSV download with its digest", async () => {
    const response = (await csvLoader(
      routeArgs(getRequest("/reports/environmental.csv?from=2036-05-01&to=2036-05-31", { Cookie: enviroCookie })),
    )) as Response;
    const bytes = new Uint8Array(await response.arrayBuffer());
    const audit = await latestAudit("quarterly_csv_downloaded");
    expect(audit.entity_id).toBe("2036-05-01..2036-05-31");
    expect(audit.after.sha256).toBe(sha256(bytes));
  });

  it("records a submitted file's download with the submission and its stored digest", async () => {
    await settle(() =>
      pageAction(
        routeArgs(
          formRequest("/environmental", { intent: "submit", year: "2036", quarter: "2" }, { Cookie: enviroCookie }),
        ),
      ),
    );
    const stored = await db("quarterly_submissions").where({ label: "2036 Q2" }).first();
    await submissionLoader(
      routeArgs(getRequest(`/environmental/submissions/${stored.id}`, { Cookie: enviroCookie }), {
        id: String(stored.id),
      }),
    );
    const audit = await latestAudit("submission_downloaded");
    expect(audit).toMatchObject({ entity_type: "quarterly_submission", entity_id: String(stored.id) });
    expect(audit.after).toMatchObject({ sha256: stored.sha256, fileName: stored.file_name });
  });

  it("records a safety sheet's download with the stored file and its digest", async () => {
    const pdf = new TextEncoder().encode("%PDF-1.4\n% audited sheet\n%%EOF\n");
    await putObject("safety-sheets/audited.pdf", pdf, "application/pdf");
    const product = await makeProductRow({
      safetySheetKey: "safety-sheets/audited.pdf",
      safetySheetName: "audited.pdf",
    });
    await sheetLoader(
      routeArgs(getRequest(`/products/${product.id}/safety-sheet`, { Cookie: enviroCookie }), {
        productId: String(product.id),
      }),
    );
    const audit = await latestAudit("safety_sheet_downloaded");
    expect(audit).toMatchObject({ entity_type: "foam_product", entity_id: String(product.id) });
    expect(audit.after).toMatchObject({ key: "safety-sheets/audited.pdf", sha256: sha256(pdf) });
  });

  it("records the events CSV with the filters it was asked for", async () => {
    const response = (await eventsCsvLoader(
      routeArgs(getRequest("/events.csv?kind=training&from=2036-01-01", { Cookie: enviroCookie })),
    )) as Response;
    await response.text();
    const audit = await latestAudit("events_csv_downloaded");
    expect(audit.entity_type).toBe("events");
    expect(audit.after.filters).toMatchObject({ kind: "training", from: "2036-01-01" });
  });
});
