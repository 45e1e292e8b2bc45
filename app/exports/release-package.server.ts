import { createHash } from "node:crypto";
import { PassThrough } from "node:stream";
import { distance, point } from "@turf/turf";
import { ZipArchive } from "archiver";
import ExcelJS from "exceljs";
import { csvLine } from "~/lib/csv";
import { db } from "~/lib/db.server";
import {
  dischargeUnitLabel,
  EVENT_KIND_LABELS,
  incidentTypeLabel,
  type EventKind,
  type FoamClass,
  type RecordsRequestStatus,
} from "~/lib/foam/vocabulary";
import {
  DEFAULT_REDACTIONS,
  hundredBlock,
  type RedactionChoices,
  roundCoordinate,
  WITHHELD,
} from "~/lib/records/redaction";
import { getObject, putObject } from "~/lib/storage.server";
import { agencyNameForDocuments, readAgencySettings } from "~/models/agency-settings.server";
import { getReport, type ReportDetail } from "~/models/event-read.server";
import { queueMail } from "~/models/mail-outbox.server";
import { logStep } from "~/models/records-request.server";
import { listReleaseNotifications } from "~/models/release-notification.server";
import { PdfWriter, usageReportPdf } from "./report-pdf.server";

/** Which records answer a request: the event list's filters, a basin, a radius around a point. */
export type ReleaseSelection = {
  from?: string;
  to?: string;
  kind?: EventKind;
  stationId?: number;
  foamClass?: FoamClass;
  basin?: string;
  radiusM?: number;
  center?: { lat: number; lon: number };
  redactions: RedactionChoices;
};

export type ReleasePreviewRow = {
  id: number;
  number: string;
  kind: string;
  incidentType: string;
  dispatchNumber: string;
  startedAt: string;
  address: string;
  latitude: number | null;
  longitude: number | null;
  basin: string | null;
  waterGal: number;
  concentrateGal: number;
  solutionGal: number;
};

/** Only accepted reports are released: drafts and reports under review are not yet records. */
export async function selectReleaseEvents(selection: ReleaseSelection): Promise<ReleasePreviewRow[]> {
  const query = db("events")
    .leftJoin("discharges", "discharges.event_id", "events.id")
    .leftJoin("foam_products", "foam_products.id", "discharges.product_id")
    .where("events.status", "accepted")
    .distinct(
      "events.id",
      "events.number",
      "events.kind",
      "events.incident_type",
      "events.dispatch_number",
      "events.started_at",
      "events.address",
      "events.latitude",
      "events.longitude",
      "events.drainage_basin",
      "events.water_gal",
      "events.concentrate_gal",
      "events.solution_gal",
    )
    .orderBy("events.started_at")
    .limit(500);
  if (selection.from) query.where("events.started_at", ">=", `${selection.from} 00:00:00`);
  if (selection.to) query.where("events.started_at", "<=", `${selection.to} 23:59:59`);
  if (selection.kind) query.where("events.kind", selection.kind);
  if (selection.stationId) query.where("events.station_id", selection.stationId);
  if (selection.foamClass) query.where("foam_products.foam_class", selection.foamClass);
  if (selection.basin) query.where("events.drainage_basin", selection.basin);
  const rows = await query;
  const redact = selection.redactions.locations;
  return rows
    .filter((row) => {
      if (!selection.radiusM || !selection.center) return true;
      if (row.latitude === null || row.longitude === null) return false;
      const metres =
        distance(
          point([selection.center.lon, selection.center.lat]),
          point([Number(row.longitude), Number(row.latitude)]),
          {
            units: "kilometers",
          },
        ) * 1000;
      return metres <= selection.radiusM;
    })
    .map((row) => {
      const latitude = row.latitude === null ? null : Number(row.latitude);
      const longitude = row.longitude === null ? null : Number(row.longitude);
      return {
        id: row.id,
        number: row.number,
        kind: EVENT_KIND_LABELS[row.kind as EventKind],
        incidentType: incidentTypeLabel(row.incident_type),
        dispatchNumber: (row.dispatch_number as string | null) ?? "",
        startedAt: row.started_at ? new Date(row.started_at).toISOString().slice(0, 16).replace("T", " ") : "",
        address: redact ? hundredBlock(row.address ?? "") : (row.address ?? ""),
        latitude: redact ? roundCoordinate(latitude) : latitude,
        longitude: redact ? roundCoordinate(longitude) : longitude,
        basin: row.drainage_basin ?? null,
        waterGal: Number(row.water_gal ?? 0),
        concentrateGal: Number(row.concentrate_gal ?? 0),
        solutionGal: Number(row.solution_gal ?? 0),
      };
    });
}

type PackageFile = { fileName: string; contentType: string; body: Uint8Array };

function sha256(body: Uint8Array): string {
  return createHash("sha256").update(body).digest("hex");
}

/** The released events' columns, shared by the CSV (its header) and the workbook's Events sheet (its title). */
const RELEASED_EVENT_COLUMNS: Array<{
  csv: string;
  sheet: string;
  value: (row: ReleasePreviewRow) => string | number | null;
}> = [
  { csv: "number", sheet: "Number", value: (row) => row.number },
  { csv: "kind", sheet: "Kind", value: (row) => row.kind },
  { csv: "incident type", sheet: "Incident type", value: (row) => row.incidentType },
  { csv: "dispatch number", sheet: "Dispatch (CAD) number", value: (row) => row.dispatchNumber },
  { csv: "started", sheet: "Started", value: (row) => row.startedAt },
  { csv: "location", sheet: "Location", value: (row) => row.address },
  { csv: "latitude", sheet: "Latitude", value: (row) => row.latitude },
  { csv: "longitude", sheet: "Longitude", value: (row) => row.longitude },
  { csv: "drainage basin", sheet: "Drainage basin", value: (row) => row.basin },
  { csv: "water gal", sheet: "Water (gal)", value: (row) => row.waterGal },
  { csv: "concentrate gal", sheet: "Concentrate (gal)", value: (row) => row.concentrateGal },
  { csv: "solution gal", sheet: "Solution (gal)", value: (row) => row.solutionGal },
];

function eventsCsv(rows: ReleasePreviewRow[]): Uint8Array {
  const header = csvLine(RELEASED_EVENT_COLUMNS.map((column) => column.csv));
  const lines = rows.map((row) => csvLine(RELEASED_EVENT_COLUMNS.map((column) => column.value(row))));
  return new TextEncoder().encode("\uFEFF" + header + lines.join(""));
}

/** The same events with their discharges and runoff, as a workbook of three sheets. */
async function eventsWorkbook(
  rows: ReleasePreviewRow[],
  reports: Array<NonNullable<ReportDetail>>,
): Promise<Uint8Array> {
  const workbook = new ExcelJS.Workbook();
  workbook.creator = "Foamtally";
  workbook.created = new Date(0);
  const events = workbook.addWorksheet("Events");
  events.addRow(RELEASED_EVENT_COLUMNS.map((column) => column.sheet));
  for (const row of rows) events.addRow(RELEASED_EVENT_COLUMNS.map((column) => column.value(row)));
  const discharges = workbook.addWorksheet("Discharges");
  discharges.addRow([
    "Event",
    "Line",
    "Apparatus",
    "Outlet",
    "Product",
    "Percent",
    "Flow",
    "Unit",
    "Basis",
    "Minutes",
    "Water (gal)",
    "Concentrate (gal)",
    "Solution (gal)",
  ]);
  const runoff = workbook.addWorksheet("Runoff");
  runoff.addRow(["Event", "Disposition", "Share (%)", "Released (gal)", "Receiving water"]);
  for (const report of reports) {
    for (const line of report.discharges) {
      discharges.addRow([
        report.number,
        line.position,
        dischargeUnitLabel(line),
        line.outlet,
        line.product,
        line.percent,
        line.flow,
        line.flowUnit,
        line.basis,
        line.minutes,
        line.water,
        line.concentrate,
        line.solution,
      ]);
    }
    for (const line of report.dispositions) {
      runoff.addRow([report.number, line.disposition, line.sharePercent, line.releasedGal, line.receivingWater]);
    }
  }
  return new Uint8Array(await workbook.xlsx.writeBuffer());
}

function withheldList(redactions: RedactionChoices): string[] {
  const withheld: string[] = [];
  if (redactions.personnel) withheld.push("names and contact details of personnel");
  if (redactions.notes) withheld.push("narratives, internal notes and review comments");
  if (redactions.locations)
    withheld.push("exact addresses and coordinates (given to the hundred block and about 100 m)");
  withheld.push("attachments");
  return withheld;
}

async function coverLetter(
  agencyName: string,
  request: { tracking_code: string; requester_name: string; description: string },
  rows: ReleasePreviewRow[],
  redactions: RedactionChoices,
  rule: string,
): Promise<Uint8Array> {
  const writer = await PdfWriter.create(`Records release ${request.tracking_code}`);
  writer.text(agencyName, { size: 12, bold: true, gap: 8 });
  writer.text(`Public-records request ${request.tracking_code}`, { size: 15, bold: true, gap: 6 });
  writer.text(`To ${request.requester_name}.`, { gap: 6 });
  writer.text(`You asked for: ${request.description}`, { gap: 8 });
  writer.heading("Released");
  writer.text(
    `${rows.length} foam-usage report${rows.length === 1 ? "" : "s"}: ${rows.map((row) => row.number).join(", ") || "none"}.`,
  );
  writer.text(
    "A table of the same events (events.csv) and one printable report per event are enclosed, with a manifest of SHA-256 digests.",
    { gap: 8 },
  );
  writer.heading("Withheld");
  for (const line of withheldList(redactions)) writer.text(`· ${line}`);
  writer.text(`Under: ${rule}.`, { gap: 8 });
  writer.text(
    "This letter was generated by Foamtally; the agency's answer is governed by the state's public-records law.",
    { size: 9 },
  );
  return writer.bytes();
}

export class PackageRefused extends Error {}

/** Builds the release package, stores every file with its digest, and logs the step. */
export async function buildReleasePackage(
  requestId: number,
  actorId: number,
  selection: ReleaseSelection,
): Promise<number> {
  const request = await db("records_requests").where({ id: requestId }).first();
  if (!request) throw new PackageRefused("There is no such request.");
  const settings = await readAgencySettings();
  const agencyName = agencyNameForDocuments(settings);
  const rows = await selectReleaseEvents(selection);
  if (rows.length === 0) throw new PackageRefused("No accepted reports match the selection; nothing to release.");
  const files: PackageFile[] = [
    {
      fileName: "cover-letter.pdf",
      contentType: "application/pdf",
      body: await coverLetter(agencyName, request, rows, selection.redactions, settings.recordsWithholdingRule),
    },
    { fileName: "events.csv", contentType: "text/csv; charset=utf-8", body: eventsCsv(rows) },
  ];
  const reports: Array<NonNullable<ReportDetail>> = [];
  for (const row of rows) {
    const report = (await getReport(row.id)) as NonNullable<ReportDetail>;
    reports.push(report);
    files.push({
      fileName: `report-${row.number.replace(/[^A-Za-z0-9_-]/g, "_")}.pdf`,
      contentType: "application/pdf",
      body: await usageReportPdf(report, agencyName, selection.redactions, await listReleaseNotifications(row.id)),
    });
  }
  files.splice(2, 0, {
    fileName: "events.xlsx",
    contentType: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
    body: await eventsWorkbook(rows, reports),
  });
  const manifest = {
    trackingCode: request.tracking_code,
    builtAt: new Date().toISOString(),
    redactions: selection.redactions,
    withheld: withheldList(selection.redactions),
    events: rows.map((row) => row.number),
    files: files.map((file) => ({ name: file.fileName, bytes: file.body.byteLength, sha256: sha256(file.body) })),
  };
  const manifestBody = new TextEncoder().encode(JSON.stringify(manifest, null, 2) + "\n");
  files.push({ fileName: "manifest.json", contentType: "application/json", body: manifestBody });
  const storedSelection = { ...selection };

  return db.transaction(async (trx) => {
    const [packageId] = await trx("records_packages").insert({
      request_id: requestId,
      built_by: actorId,
      selection: JSON.stringify(storedSelection),
      manifest_sha256: sha256(manifestBody),
    });
    for (const file of files) {
      const key = `records-requests/${requestId}/packages/${packageId}/${file.fileName}`;
      await putObject(key, file.body, file.contentType);
      await trx("records_package_files").insert({
        package_id: packageId,
        file_name: file.fileName,
        content_type: file.contentType,
        byte_size: file.body.byteLength,
        sha256: sha256(file.body),
        storage_key: key,
      });
    }
    await logStep(
      trx,
      requestId,
      actorId,
      "package-built",
      `Built package ${packageId}: ${rows.length} reports, ${files.length} files; manifest SHA-256 ${sha256(manifestBody)}.`,
    );
    if (request.status === "received")
      await trx("records_requests").where({ id: requestId }).update({ status: "in_progress" });
    return packageId;
  });
}

/** One stored file of a package, read back from object storage. */
export async function packageFile(requestId: number, fileId: number) {
  const file = await db("records_package_files as f")
    .join("records_packages as p", "p.id", "f.package_id")
    .where({ "f.id": fileId, "p.request_id": requestId })
    .first("f.*");
  if (!file) return null;
  const { body } = await getObject(file.storage_key);
  return { fileName: file.file_name as string, contentType: file.content_type as string, body };
}

async function zipOf(files: Array<{ name: string; body: Uint8Array }>): Promise<Buffer> {
  const zip = new ZipArchive({ zlib: { level: 6 } });
  const output = new PassThrough();
  const chunks: Buffer[] = [];
  output.on("data", (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<void>((resolve, reject) => {
    output.on("end", resolve);
    zip.on("error", reject);
  });
  zip.pipe(output);
  for (const file of files) zip.append(Buffer.from(file.body), { name: file.name });
  await zip.finalize();
  await done;
  return Buffer.concat(chunks);
}

/** E-mails the stored package (the exact files, read back) to the requester and closes the request. */
export async function sendReleasePackage(
  requestId: number,
  packageId: number,
  actorId: number,
  status: Extract<RecordsRequestStatus, "fulfilled" | "partly_withheld">,
): Promise<void> {
  const request = await db("records_requests").where({ id: requestId }).first();
  const pack = await db("records_packages").where({ id: packageId, request_id: requestId }).first();
  if (!request || !pack) throw new PackageRefused("There is no such package.");
  if (pack.sent_at) throw new PackageRefused("This package was sent already.");
  const files = await db("records_package_files").where({ package_id: packageId }).orderBy("id");
  const stored = [];
  for (const file of files) {
    const { body } = await getObject(file.storage_key);
    if (sha256(body) !== file.sha256)
      throw new PackageRefused(`The stored ${file.file_name} no longer matches its digest.`);
    stored.push({ name: file.file_name as string, body });
  }
  const zip = await zipOf(stored);
  const settings = await readAgencySettings();
  await db.transaction(async (trx) => {
    const mailId = await queueMail(
      {
        kind: "records_release",
        to: [request.requester_email],
        subject: `Records released for your request ${request.tracking_code}`,
        text: [
          `${agencyNameForDocuments(settings)} answers your public-records request ${request.tracking_code}.`,
          "",
          "The enclosed archive holds a cover letter, the released reports and a manifest with the SHA-256 digest of each file.",
          "",
          ...files.map((file) => `${file.file_name}  ${file.sha256}`),
        ].join("\n"),
        attachment: { filename: `records-${request.tracking_code}.zip`, contentType: "application/zip", content: zip },
      },
      trx,
    );
    await trx("records_packages")
      .where({ id: packageId })
      .update({ sent_at: trx.fn.now(3), mail_id: mailId });
    await trx("records_requests")
      .where({ id: requestId })
      .update({ status, closed_at: trx.fn.now(3) });
    await logStep(
      trx,
      requestId,
      actorId,
      "package-sent",
      `Package ${packageId} e-mailed to the requester (${files.length} files); status ${status.replace("_", " ")}.`,
    );
  });
}

export { DEFAULT_REDACTIONS, WITHHELD };
