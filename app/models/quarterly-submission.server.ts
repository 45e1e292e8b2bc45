import { randomUUID } from "node:crypto";
import { recordAudit } from "~/lib/audit.server";
import { db, type Db } from "~/lib/db.server";
import { deleteObjectQuietly, getObject, putObjectFile } from "~/lib/storage.server";
import type { ReportPeriod } from "~/lib/reporting/period";
import { instantToWallClock, localDateTime } from "~/lib/time-zone";
import { readAgencySettings } from "./agency-settings.server";

export type SubmissionSummary = {
  id: number;
  periodFrom: string;
  periodTo: string;
  label: string;
  fileName: string;
  sha256: string;
  byteSize: number;
  acceptedReports: number;
  submittedAt: Date;
  submittedBy: string;
  note: string | null;
};

const toDay = (value: unknown) =>
  value instanceof Date ? value.toISOString().slice(0, 10) : String(value).slice(0, 10);

function summaryQuery(connection: Db) {
  return connection("quarterly_submissions as q")
    .join("users as u", "u.id", "q.submitted_by")
    .select(
      "q.id",
      "q.period_from",
      "q.period_to",
      "q.label",
      "q.file_name",
      "q.sha256",
      "q.byte_size",
      "q.accepted_reports",
      "q.submitted_at",
      "q.note",
      "u.name as submitted_by_name",
      "u.email as submitted_by_email",
    );
}

function toSummary(row: Record<string, unknown>): SubmissionSummary {
  return {
    id: Number(row.id),
    periodFrom: toDay(row.period_from),
    periodTo: toDay(row.period_to),
    label: String(row.label),
    fileName: String(row.file_name),
    sha256: String(row.sha256),
    byteSize: Number(row.byte_size),
    acceptedReports: Number(row.accepted_reports),
    submittedAt: row.submitted_at as Date,
    submittedBy: `${row.submitted_by_name} <${row.submitted_by_email}>`,
    note: (row.note as string | null) ?? null,
  };
}

export async function latestSubmissionFor(
  period: Pick<ReportPeriod, "from" | "to">,
  connection: Db = db,
): Promise<SubmissionSummary | null> {
  const row = await summaryQuery(connection)
    .where({ "q.period_from": period.from, "q.period_to": period.to })
    .orderBy("q.submitted_at", "desc")
    .orderBy("q.id", "desc")
    .first();
  return row ? toSummary(row) : null;
}

export type SubmittedPeriod = { label: string; submittedAt: string; submittedBy: string };

/**
 * The period already marked submitted that holds this report's start (the agency's calendar day),
 * the latest submission of it; null when no submitted period holds it.
 */
export async function submittedPeriodOf(eventId: number, connection: Db = db): Promise<SubmittedPeriod | null> {
  const event = await connection("events").where({ id: eventId }).first("started_at");
  if (!event?.started_at) return null;
  const { timeZone } = await readAgencySettings(connection);
  const day = instantToWallClock(event.started_at as Date, timeZone).slice(0, 10);
  const row = await summaryQuery(connection)
    .where("q.period_from", "<=", day)
    .where("q.period_to", ">=", day)
    .orderBy("q.submitted_at", "desc")
    .orderBy("q.id", "desc")
    .first();
  if (!row) return null;
  const summary = toSummary(row);
  return {
    label: summary.label,
    submittedAt: localDateTime(summary.submittedAt, timeZone),
    submittedBy: String(row.submitted_by_name),
  };
}

export async function listSubmissions(limit = 50): Promise<SubmissionSummary[]> {
  const rows = await summaryQuery(db).orderBy("q.submitted_at", "desc").orderBy("q.id", "desc").limit(limit);
  return rows.map(toSummary);
}

/**
 * The submitted file, read from the object store (throws `StorageUnavailableError` when it is down).
 * A row the move to the object store has not reached still answers from its own column.
 */
export async function submissionFile(
  id: number,
): Promise<{ fileName: string; contentType: string; content: Buffer; sha256: string } | null> {
  const row = await db("quarterly_submissions")
    .where({ id })
    .first("file_name", "content_type", "storage_key", "content", "sha256");
  if (!row) return null;
  const content = row.storage_key ? Buffer.from((await getObject(row.storage_key)).body) : (row.content as Buffer);
  return { fileName: row.file_name, contentType: row.content_type, content, sha256: row.sha256 };
}

export type NewSubmission = {
  period: ReportPeriod;
  filePath: string;
  fileName: string;
  contentType: string;
  sha256: string;
  byteSize: number;
  acceptedReports: number;
  note?: string | null;
  actor: { id: number; email: string };
  clientAddress?: string | null;
};

/**
 * Stores the exact file that was submitted in the object store first, then its row with the digest
 * and its audit row in one transaction; a failed save removes the stored file again.
 */
export async function recordSubmission(submission: NewSubmission): Promise<number> {
  const key = `quarterly-submissions/${randomUUID()}`;
  await putObjectFile(key, submission.filePath, submission.byteSize, submission.contentType);
  try {
    return await saveSubmissionRow(submission, key);
  } catch (error) {
    await deleteObjectQuietly(key);
    throw error;
  }
}

function saveSubmissionRow(submission: NewSubmission, key: string): Promise<number> {
  return db.transaction(async (trx) => {
    const [id] = await trx("quarterly_submissions").insert({
      period_from: submission.period.from,
      period_to: submission.period.to,
      label: submission.period.label,
      file_name: submission.fileName,
      content_type: submission.contentType,
      storage_key: key,
      sha256: submission.sha256,
      byte_size: submission.byteSize,
      accepted_reports: submission.acceptedReports,
      submitted_by: submission.actor.id,
      note: submission.note ?? null,
    });
    await recordAudit(
      {
        actorUserId: submission.actor.id,
        actorLabel: submission.actor.email,
        action: "quarter_submitted",
        entityType: "quarterly_submission",
        entityId: id,
        summary: `${submission.period.label} marked submitted`,
        after: {
          period: [submission.period.from, submission.period.to],
          fileName: submission.fileName,
          sha256: submission.sha256,
          byteSize: submission.byteSize,
          acceptedReports: submission.acceptedReports,
        },
        clientAddress: submission.clientAddress ?? null,
      },
      trx,
    );
    return id;
  });
}
