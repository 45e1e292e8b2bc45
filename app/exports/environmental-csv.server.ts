import { createWriteStream } from "node:fs";
import { Readable } from "node:stream";
import { finished } from "node:stream/promises";
import { ZipArchive } from "archiver";
import { csvLine } from "~/lib/csv";
import { db, type Db } from "~/lib/db.server";
import { gallonsToLitres } from "~/lib/foam/units";
import { localDateTime } from "~/lib/time-zone";
import {
  DISPOSITION_LABELS,
  DISPOSITIONS,
  EVENT_KIND_LABELS,
  EVENT_KINDS,
  EVENT_STATUS_LABELS,
  HELD_BACK_LABEL,
  RELEASED_TO_ENVIRONMENT_LABEL,
  UNACCOUNTED_LABEL,
} from "~/lib/foam/vocabulary";
import { periodFacts } from "~/models/environmental-report.server";
import {
  dischargeTable,
  eventTable,
  LITRES,
  nonIncidentTable,
  pfasColumns,
  releaseTable,
  type CellValue,
  type Column,
  type DetailTable,
} from "./environmental-tables.server";
import {
  appVersion,
  heaviestWindowPounds,
  methodLines,
  writeOnOneSnapshot,
  type WorkbookRequest,
  type WrittenFile,
} from "./environmental-common.server";

// A UTF-8 byte-order mark, so that spreadsheet programs read "–", "°" and "³" as written.
const BOM = "\uFEFF";

/**
 * A cell as the CSV writes it. Litres are rounded to the tenth the workbook shows: flow meters and
 * tank gauges read no finer than that (common practice, no source), and a converted 3.785411784 L
 * per gallon would otherwise claim nine decimals the meter never gave.
 */
function csvCell(value: CellValue, numFmt?: string): string | number | null {
  if (value instanceof Date) return value.toISOString().slice(0, 16).replace("T", " ");
  if (typeof value === "number" && numFmt === LITRES) return roundLitres(value);
  return value;
}

const roundLitres = (litres: number) => Math.round(litres * 10) / 10;

// Rows go to the zip in batches of about this many characters: each chunk written is one call into
// the compressor, and one call per row made the compression, not the rows, the cost of the export.
const BATCH_CHARACTERS = 64 * 1024;

export async function* csvRows<Row>(
  columns: Column<Row>[],
  rows: AsyncIterable<Row> | Iterable<Row>,
): AsyncGenerator<string> {
  let batch = BOM + csvLine(columns.map((column) => column.header));
  for await (const row of rows) {
    batch += csvLine(columns.map((column) => csvCell(column.value(row), column.numFmt)));
    if (batch.length >= BATCH_CHARACTERS) {
      yield batch;
      batch = "";
    }
  }
  yield batch;
}

/**
 * The same tables as the workbook, one CSV file each, in a zip written to `path`. Rows stream from
 * MariaDB through archiver one at a time; one read-only transaction keeps every file on one snapshot.
 */
export async function writeEnvironmentalCsvZip(
  request: WorkbookRequest,
  path: string,
  connection: Db = db,
): Promise<WrittenFile> {
  return writeOnOneSnapshot(path, connection, async (trx) => {
    const { agency, wall, aggregates, pfas } = await periodFacts(request.period, trx);
    const output = createWriteStream(path);
    const zip = new ZipArchive({ zlib: { level: 6 } });
    const failed = new Promise<never>((_, reject) => zip.on("error", reject));
    failed.catch(() => {});
    zip.pipe(output);

    const now = request.now ?? new Date();
    const summary: (string | number | null)[][] = [
      ["Topic", "Item", "Value", "Unit"],
      ["Agency", "", agency.name, ""],
      ["Period", request.period.label, `${request.period.from} to ${request.period.to}`, agency.timeZone],
      ["Reports counted", EVENT_STATUS_LABELS.accepted, aggregates.eventCount, "reports"],
      ["Reports not counted", "filed, awaiting review", aggregates.awaitingReview, "reports"],
      ["Reports not counted", "returned to the officer", aggregates.returned, "reports"],
      [
        "Generated",
        `${request.generatedBy.name} <${request.generatedBy.email}>`,
        localDateTime(now, agency.timeZone),
        agency.timeZone,
      ],
      ["Foamtally version", "", appVersion(), ""],
      [
        "Submission",
        "",
        request.submission
          ? `marked submitted ${localDateTime(request.submission.submittedAt, agency.timeZone)} by ${request.submission.submittedBy}, SHA-256 ${request.submission.sha256}`
          : "not marked as submitted",
        "",
      ],
    ];
    for (const row of aggregates.byClass) {
      const use = row.incident ? "incidents" : "training, tests, flushes";
      summary.push([`${row.foamClass}, ${use}`, "water", row.water, "US gal"]);
      summary.push([`${row.foamClass}, ${use}`, "concentrate", row.concentrate, "US gal"]);
      summary.push([`${row.foamClass}, ${use}`, "foam solution", row.solution, "US gal"]);
      summary.push([`${row.foamClass}, ${use}`, "foam solution", roundLitres(gallonsToLitres(row.solution)), "L"]);
    }
    for (const disposition of DISPOSITIONS) {
      summary.push([
        "Released foam solution",
        DISPOSITION_LABELS[disposition],
        aggregates.byDisposition[disposition],
        "US gal",
      ]);
    }
    summary.push(["Released foam solution", RELEASED_TO_ENVIRONMENT_LABEL, aggregates.environmentGallons, "US gal"]);
    summary.push(["Released foam solution", HELD_BACK_LABEL, aggregates.heldBackGallons, "US gal"]);
    summary.push(["Released foam solution", UNACCOUNTED_LABEL, aggregates.unaccountedGallons, "US gal"]);
    for (const group of aggregates.byBasinAndWater) {
      summary.push(["Released by drainage basin", `${group.basin} / ${group.receivingWater}`, group.gallons, "US gal"]);
    }
    for (const kind of EVENT_KINDS)
      summary.push(["Events", EVENT_KIND_LABELS[kind], aggregates.eventsByKind[kind], "events"]);
    summary.push(["PFAS", "heaviest 24-hour period", heaviestWindowPounds(pfas), "lb"]);
    summary.push(["PFAS", "reportable threshold", agency.pfasReportableLb, "lb in 24 h"]);
    zip.append(BOM + summary.map((row) => csvLine(row)).join(""), { name: "summary.csv" });

    const appendTable = async <Row>(table: DetailTable<Row>) => {
      const entry = Readable.from(csvRows(table.columns, table.rows(request.period, trx)));
      zip.append(entry, { name: table.csvName });
      // archiver reads entries one after another: wait for this one so only one query streams at a time.
      await Promise.race([finished(entry), failed]);
    };
    await appendTable(eventTable(wall));
    await appendTable(dischargeTable);
    await appendTable(releaseTable(wall));
    await appendTable(nonIncidentTable(wall));
    zip.append(Readable.from(csvRows(pfasColumns(wall, agency.pfasReportableLb), pfas)), { name: "pfas.csv" });
    zip.append(
      methodLines(agency)
        .map(([topic, text]) => (text ? `${topic}\n${text}\n` : `${topic}\n`))
        .join("\n"),
      { name: "method-and-cautions.txt" },
    );
    await Promise.race([zip.finalize(), failed]);
    await finished(output);
  });
}
