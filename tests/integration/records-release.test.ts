// Release packages: what goes out is read back (PDF text extraction, CSV) and must not carry
// personnel names, notes or unrounded coordinates; the files are kept with their digests and sent.
import { createHash } from "node:crypto";
import { PDFParse } from "pdf-parse";
import * as XLSX from "xlsx";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { DEFAULT_REDACTIONS } from "~/lib/records/redaction";
import { getObject } from "~/lib/storage.server";
import { buildReleasePackage, selectReleaseEvents, sendReleasePackage } from "~/exports/release-package.server";
import { usageReportPdf } from "~/exports/report-pdf.server";
import { getReport } from "~/models/event-read.server";
import { createRecordsRequest, publicStatusOf } from "~/models/records-request.server";
import { makeUser } from "../support/factories";
import { startFileStore } from "../support/file-store";
import { ensureAgency, makeApparatus, makeEvent } from "../support/usage-fixtures";

let closeFileStore: () => Promise<void>;
beforeAll(async () => {
  closeFileStore = await startFileStore("records");
});
afterAll(() => closeFileStore());

async function pdfText(bytes: Uint8Array): Promise<string> {
  const parser = new PDFParse({ data: Buffer.from(bytes) });
  try {
    return (await parser.getText()).text;
  } finally {
    await parser.destroy();
  }
}

const PERSON = "Quillon Marrowby";
const REVIEWER = "Ysolde Fenwright";
const NOTE = "Crew noted the homeowner's side gate code";
const EXACT = { lat: 38.712345, lon: -98.204567, address: "1234 Larkspur Lane" };

async function seededEvent(discharges: Parameters<typeof makeEvent>[0]["discharges"] = []) {
  await ensureAgency();
  const author = await makeUser(["officer"], PERSON);
  const reviewer = await makeUser(["chief"], REVIEWER);
  const event = await makeEvent({
    createdBy: author.id,
    status: "accepted",
    startedAt: new Date("2026-03-10T15:00:00Z"),
    drainageBasin: "Willow Creek",
    discharges,
  });
  await db("events").where({ id: event.id }).update({
    narrative: NOTE,
    review_comment: "Reviewer remark to stay inside",
    reviewed_by: reviewer.id,
    address: EXACT.address,
    latitude: EXACT.lat,
    longitude: EXACT.lon,
  });
  return event;
}

describe("redaction in what goes out", () => {
  it("prints the full report for readers and leaves names, notes and exact places out of the release copy", async () => {
    const event = await seededEvent();
    const report = (await getReport(event.id))!;
    const notifications = [
      {
        partyLabel: "State spill line",
        partyDetail: "",
        notifiedAt: "2026-03-04T10:15",
        notifiedBy: PERSON,
        caseNumber: "DEMO-CASE-77",
      },
    ];
    const full = await pdfText(await usageReportPdf(report, "Alder Bend (demo)", null, notifications));
    // The unredacted print is what a chief sees: it must carry the values (so the check below can fail).
    expect(full).toContain(PERSON);
    expect(full).toContain("State spill line · 2026-03-04 10:15 · by");
    expect(full).toContain("DEMO-CASE-77");
    expect(full).toContain(NOTE.slice(0, 20));
    expect(full).toContain("38.712345");

    const released = await pdfText(
      await usageReportPdf(report, "Alder Bend (demo)", DEFAULT_REDACTIONS, notifications),
    );
    expect(released).toContain(event.number);
    // Who was told and the case number are released; who made the call is a name, and is not.
    expect(released).toContain("State spill line · 2026-03-04 10:15 · case DEMO-CASE-77");
    for (const secret of [
      PERSON,
      REVIEWER,
      NOTE.slice(0, 20),
      "Reviewer remark",
      "38.712345",
      "-98.204567",
      "1234 Larkspur",
    ]) {
      expect(released, secret).not.toContain(secret);
    }
    expect(released).toContain("1200 block of Larkspur Lane");
    expect(released).toContain("38.712");
  });

  it("builds a package whose stored files match their digests, carry no secrets, and are e-mailed", async () => {
    const event = await seededEvent();
    const clerk = await makeUser(["records"], "Release Clerk");
    const request = await createRecordsRequest({
      name: "Demo Reporter",
      email: "reporter@example.org",
      description: "Foam use along Willow Creek in March 2026",
    });
    const selection = { from: "2026-03-10", to: "2026-03-10", basin: "Willow Creek", redactions: DEFAULT_REDACTIONS };
    const preview = await selectReleaseEvents(selection);
    const row = preview.find((candidate) => candidate.id === event.id)!;
    expect(row.latitude).toBe(38.712);
    expect(row.address).toBe("1200 block of Larkspur Lane");

    const packageId = await buildReleasePackage(request.id, clerk.id, selection);
    const files = await db("records_package_files").where({ package_id: packageId }).orderBy("id");
    expect(files.map((file) => file.file_name)).toEqual(
      expect.arrayContaining([
        "cover-letter.pdf",
        "events.csv",
        "events.xlsx",
        "manifest.json",
        `report-${event.number}.pdf`,
      ]),
    );
    const manifest = JSON.parse(
      new TextDecoder().decode((await getObject(files.find((f) => f.file_name === "manifest.json").storage_key)).body),
    );
    for (const file of files) {
      const { body } = await getObject(file.storage_key);
      const digest = createHash("sha256").update(body).digest("hex");
      expect(digest, file.file_name).toBe(file.sha256);
      if (file.file_name !== "manifest.json") {
        expect(manifest.files.find((entry: { name: string }) => entry.name === file.file_name).sha256).toBe(digest);
      }
      // The workbook is read back with SheetJS (our own output only), every sheet as CSV.
      const text =
        file.content_type === "application/pdf"
          ? await pdfText(body)
          : file.file_name.endsWith(".xlsx")
            ? (() => {
                const book = XLSX.read(body, { type: "array" });
                return book.SheetNames.map((name) => XLSX.utils.sheet_to_csv(book.Sheets[name])).join("\n");
              })()
            : new TextDecoder().decode(body);
      if (file.file_name.endsWith(".xlsx")) expect(text).toContain(event.number);
      for (const secret of [PERSON, REVIEWER, NOTE.slice(0, 20), "38.712345", "-98.204567", "1234 Larkspur"]) {
        expect(text, `${file.file_name}: ${secret}`).not.toContain(secret);
      }
    }
    const cover = await pdfText(
      (await getObject(files.find((f) => f.file_name === "cover-letter.pdf").storage_key)).body,
    );
    expect(cover).toContain("names and contact details of personnel");

    await sendReleasePackage(request.id, packageId, clerk.id, "fulfilled");
    const mail = await db("mail_outbox").where({ kind: "records_release" }).orderBy("id", "desc").first();
    expect(mail.to_addresses).toBe("reporter@example.org");
    expect(mail.attachment_name).toBe(`records-${request.trackingCode}.zip`);
    expect((await publicStatusOf(request.trackingCode))!.statusLabel).toBe("Fulfilled");
    const log = await db("records_request_log").where({ request_id: request.id }).orderBy("id").pluck("action");
    expect(log).toEqual(["received", "package-built", "package-sent"]);
    await expect(sendReleasePackage(request.id, packageId, clerk.id, "fulfilled")).rejects.toThrow("sent already");
  });
});

describe("discharge line numbers in what goes out", () => {
  async function twoLineEvent() {
    const first = await makeApparatus(null);
    const second = await makeApparatus(null);
    const event = await seededEvent([
      { apparatusId: first.id, water: 1000, concentrate: 0 },
      { apparatusId: second.id, water: 500, concentrate: 0 },
    ]);
    return { event, units: [first.unitId, second.unitId] };
  }

  /** The numbers that open the lines of the PDF's Discharges section. */
  function dischargeNumbers(text: string): string[] {
    const section = text.slice(text.indexOf("Discharges"), text.indexOf("Runoff"));
    return [...section.matchAll(/^(\d+)\. (\S+)/gm)].map((match) => `${match[1]} ${match[2]}`);
  }

  it("numbers the report PDF's lines from 1", async () => {
    const { event, units } = await twoLineEvent();
    const report = (await getReport(event.id))!;
    expect(report.discharges.map((line) => line.position)).toEqual([1, 2]);
    for (const redactions of [null, DEFAULT_REDACTIONS]) {
      const text = await pdfText(await usageReportPdf(report, "Alder Bend (demo)", redactions, []));
      expect(dischargeNumbers(text)).toEqual([`1 ${units[0]}`, `2 ${units[1]}`]);
    }
  });

  it("numbers the package's discharge rows and its report PDF's lines from 1", async () => {
    const { event, units } = await twoLineEvent();
    const clerk = await makeUser(["records"], "Release Clerk");
    const request = await createRecordsRequest({
      name: "Demo Reporter",
      email: "reporter@example.org",
      description: "Foam use along Willow Creek in March 2026",
    });
    const selection = { from: "2026-03-10", to: "2026-03-10", basin: "Willow Creek", redactions: DEFAULT_REDACTIONS };
    const packageId = await buildReleasePackage(request.id, clerk.id, selection);
    const files = await db("records_package_files").where({ package_id: packageId });
    const stored = async (name: string) =>
      (await getObject(files.find((file) => file.file_name === name).storage_key)).body;

    const book = XLSX.read(await stored("events.xlsx"), { type: "array" });
    const rows = XLSX.utils.sheet_to_json<Record<string, unknown>>(book.Sheets.Discharges);
    const lines = rows.filter((row) => row.Event === event.number).map((row) => [row.Line, row.Apparatus]);
    expect(lines).toEqual([
      [1, units[0]],
      [2, units[1]],
    ]);

    const text = await pdfText(await stored(`report-${event.number}.pdf`));
    expect(dischargeNumbers(text)).toEqual([`1 ${units[0]}`, `2 ${units[1]}`]);
  });
});
