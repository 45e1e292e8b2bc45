import { createReadStream } from "node:fs";
import { readFile } from "node:fs/promises";
import { createReadableStreamFromReadable } from "@react-router/node";
import type { SessionUser } from "~/lib/auth.server";
import { httpError } from "~/lib/http.server";
import { XLSX_TYPE, ZIP_TYPE } from "~/lib/reporting/files";
import { parseReportPeriod, type ReportPeriod } from "~/lib/reporting/period";
import { readAgencySettings } from "~/models/agency-settings.server";
import { recordDownload } from "~/models/download-audit.server";
import { latestSubmissionFor } from "~/models/quarterly-submission.server";
import {
  privateTempFile,
  workbookFileName,
  type ExportFormat,
  type WorkbookRequest,
  type WrittenFile,
} from "./environmental-common.server";
import { writeEnvironmentalCsvZip } from "./environmental-csv.server";
import { writeEnvironmentalWorkbook } from "./environmental-workbook.server";

export async function periodFrom(params: URLSearchParams): Promise<ReportPeriod> {
  const agency = await readAgencySettings();
  const result = parseReportPeriod(params, agency.timeZone);
  if (!result.ok) httpError(400, result.message);
  return result.period;
}

export async function workbookRequestFor(period: ReportPeriod, user: SessionUser): Promise<WorkbookRequest> {
  const submission = await latestSubmissionFor(period);
  return {
    period,
    generatedBy: { name: user.name, email: user.email },
    submission: submission && {
      submittedAt: submission.submittedAt,
      submittedBy: submission.submittedBy,
      sha256: submission.sha256,
      fileName: submission.fileName,
    },
  };
}

export type GeneratedFile = WrittenFile & { fileName: string; contentType: string };

/** Writes the file into a private temporary directory; the caller calls `remove` when done with it. */
async function generate(
  format: ExportFormat,
  request: WorkbookRequest,
): Promise<GeneratedFile & { remove: () => Promise<void> }> {
  const fileName = workbookFileName(request.period, format);
  const target = await privateTempFile(fileName);
  try {
    const written =
      format === "xlsx"
        ? await writeEnvironmentalWorkbook(request, target.path)
        : await writeEnvironmentalCsvZip(request, target.path);
    return { ...written, fileName, contentType: format === "xlsx" ? XLSX_TYPE : ZIP_TYPE, remove: target.remove };
  } catch (error) {
    await target.remove();
    throw error;
  }
}

/** Writes the file into a private temporary directory and hands it to `handle`; the directory goes afterwards. */
export async function withGeneratedFile<T>(
  format: ExportFormat,
  request: WorkbookRequest,
  handle: (file: GeneratedFile) => Promise<T>,
): Promise<T> {
  const { remove, ...file } = await generate(format, request);
  try {
    return await handle(file);
  } finally {
    await remove();
  }
}

/** A download response that streams the generated file from disk and removes it once sent. */
export async function generatedDownload(
  format: ExportFormat,
  request: WorkbookRequest,
  onWritten?: (file: GeneratedFile) => Promise<void>,
): Promise<Response> {
  const { remove, ...file } = await generate(format, request);
  try {
    await onWritten?.(file);
    const stream = createReadStream(file.path);
    stream.once("close", () => void remove());
    return new Response(createReadableStreamFromReadable(stream), {
      headers: {
        "Content-Type": file.contentType,
        "Content-Disposition": `attachment; filename="${file.fileName}"`,
        "Content-Length": String(file.byteSize),
        "Cache-Control": "no-store",
        "X-Content-SHA256": file.sha256,
      },
    });
  } catch (error) {
    await remove();
    throw error;
  }
}

export function generatedContent(filePath: string): Promise<Buffer> {
  return readFile(filePath);
}

/** The period's workbook or zipped CSV as a download, with an audit row naming who took it, the period and the digest. */
export async function auditedPeriodDownload(
  format: ExportFormat,
  period: ReportPeriod,
  user: SessionUser,
  httpRequest: Request,
): Promise<Response> {
  return generatedDownload(format, await workbookRequestFor(period, user), (file) =>
    recordDownload(httpRequest, user, {
      action: format === "xlsx" ? "quarterly_workbook_downloaded" : "quarterly_csv_downloaded",
      entityType: "quarterly_period",
      entityId: `${period.from}..${period.to}`,
      summary: `${period.label} ${format === "xlsx" ? "workbook" : "CSV files"} downloaded`,
      details: {
        period: [period.from, period.to],
        fileName: file.fileName,
        sha256: file.sha256,
        byteSize: file.byteSize,
      },
    }),
  );
}
