import { createReadStream } from "node:fs";
import { mkdtemp, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { createReadableStreamFromReadable } from "@react-router/node";
import type { SessionUser } from "~/lib/auth.server";
import { httpError } from "~/lib/http.server";
import { XLSX_TYPE, ZIP_TYPE } from "~/lib/reporting/files";
import { parseReportPeriod, type ReportPeriod } from "~/lib/reporting/period";
import { readAgencySettings } from "~/models/agency-settings.server";
import { latestSubmissionFor } from "~/models/quarterly-submission.server";
import { writeEnvironmentalCsvZip } from "~/exports/environmental-csv.server";
import {
  workbookFileName,
  writeEnvironmentalWorkbook,
  type WorkbookRequest,
  type WrittenFile,
} from "~/exports/environmental-workbook.server";

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

export type Format = "xlsx" | "zip";

/** Writes the file into a private temporary directory and hands it to `handle`; the directory goes afterwards. */
export async function withGeneratedFile<T>(
  format: Format,
  request: WorkbookRequest,
  handle: (file: WrittenFile & { fileName: string; contentType: string }) => Promise<T>,
): Promise<T> {
  const directory = await mkdtemp(path.join(tmpdir(), "foamtally-export-"));
  try {
    const fileName = workbookFileName(request.period, format);
    const target = path.join(directory, fileName);
    const written =
      format === "xlsx"
        ? await writeEnvironmentalWorkbook(request, target)
        : await writeEnvironmentalCsvZip(request, target);
    return await handle({ ...written, fileName, contentType: format === "xlsx" ? XLSX_TYPE : ZIP_TYPE });
  } finally {
    await rm(directory, { recursive: true, force: true });
  }
}

/** A download response that streams the generated file from disk and removes it once sent. */
export async function generatedDownload(format: Format, request: WorkbookRequest): Promise<Response> {
  const directory = await mkdtemp(path.join(tmpdir(), "foamtally-export-"));
  const fileName = workbookFileName(request.period, format);
  const target = path.join(directory, fileName);
  try {
    const written =
      format === "xlsx"
        ? await writeEnvironmentalWorkbook(request, target)
        : await writeEnvironmentalCsvZip(request, target);
    const stream = createReadStream(target);
    const cleanup = () => void rm(directory, { recursive: true, force: true });
    stream.once("close", cleanup);
    return new Response(createReadableStreamFromReadable(stream), {
      headers: {
        "Content-Type": format === "xlsx" ? XLSX_TYPE : ZIP_TYPE,
        "Content-Disposition": `attachment; filename="${fileName}"`,
        "Content-Length": String(written.byteSize),
        "Cache-Control": "no-store",
        "X-Content-SHA256": written.sha256,
      },
    });
  } catch (error) {
    await rm(directory, { recursive: true, force: true });
    throw error;
  }
}

export function generatedContent(filePath: string): Promise<Buffer> {
  return readFile(filePath);
}
