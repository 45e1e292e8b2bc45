import type { SessionUser } from "~/lib/auth.server";
import { db } from "~/lib/db.server";
import type { ReportPeriod } from "~/lib/reporting/period";
import { periodAggregates } from "~/models/environmental-report.server";
import { deliverPendingMailSoon } from "~/models/mail-outbox.server";
import { latestSubmissionFor, recordSubmission, submissionFile } from "~/models/quarterly-submission.server";
import { NoRecipientsError, queueQuarterlyWorkbookMail } from "~/models/report-notifications.server";
import { generatedContent, withGeneratedFile, workbookRequestFor } from "./environmental-files.server";

/**
 * What happens to a quarter's workbook once the environmental officer is done with it: marked
 * submitted (the exact file stored with its digest) or e-mailed to the agency's report recipients.
 */

export type DeliveryActor = { user: SessionUser; clientAddress: string };

/**
 * Makes a fresh workbook of the period (one that does not yet speak of a submission) and stores it,
 * byte for byte with its SHA-256, as the period's submitted file. Answers the stored file's digest.
 */
export async function submitQuarter(
  period: ReportPeriod,
  note: string | null,
  actor: DeliveryActor,
): Promise<{ sha256: string }> {
  const workbookRequest = { ...(await workbookRequestFor(period, actor.user)), submission: null };
  const aggregates = await periodAggregates(period);
  return withGeneratedFile("xlsx", workbookRequest, async (written) => {
    await recordSubmission({
      period,
      filePath: written.path,
      fileName: written.fileName,
      contentType: written.contentType,
      sha256: written.sha256,
      byteSize: written.byteSize,
      acceptedReports: aggregates.eventCount,
      note,
      actor: actor.user,
      clientAddress: actor.clientAddress,
    });
    return { sha256: written.sha256 };
  });
}

export type SendResult = { ok: true } | { ok: false; reason: "no-recipients" };

/**
 * Queues the period's workbook to the report recipients: the submitted file if there is one, else a
 * fresh copy. Delivery starts right after the queue commits; a failed send is retried by the outbox.
 */
export async function sendQuarterWorkbook(period: ReportPeriod, actor: DeliveryActor): Promise<SendResult> {
  const submission = await latestSubmissionFor(period);
  const stored = submission ? await submissionFile(submission.id) : null;
  const queue = (fileName: string, content: Buffer, sha256: string) =>
    db.transaction((trx) =>
      queueQuarterlyWorkbookMail(
        {
          periodLabel: period.label,
          fileName,
          content,
          sha256,
          submissionId: submission?.id ?? null,
          sentBy: actor.user,
          clientAddress: actor.clientAddress,
        },
        trx,
      ),
    );
  try {
    if (stored) {
      await queue(stored.fileName, stored.content, stored.sha256);
    } else {
      await withGeneratedFile("xlsx", await workbookRequestFor(period, actor.user), async (written) =>
        queue(written.fileName, await generatedContent(written.path), written.sha256),
      );
    }
  } catch (error) {
    if (error instanceof NoRecipientsError) return { ok: false, reason: "no-recipients" };
    throw error;
  }
  deliverPendingMailSoon();
  return { ok: true };
}
