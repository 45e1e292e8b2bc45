import { parseWithZod } from "@conform-to/zod/v4";
import { data, redirect } from "react-router";
import { changeCapabilityFor } from "~/lib/access";
import { authorize } from "~/lib/access.server";
import { requireUser, type SessionUser } from "~/lib/auth.server";
import {
  DraftPayloadSchema,
  FiledReportSchema,
  REPORT_FORM_SCHEMAS,
  ReportIntentSchema,
  type FiledReport,
} from "~/lib/foam/report-schema";
import { readFormData } from "~/lib/form-data.server";
import {
  clientAddress,
  DATABASE_DOWN_MESSAGE,
  invariantResponse,
  isDatabaseDown,
  isDatabaseDownResponse,
} from "~/lib/http.server";
import { flashHeaders } from "~/lib/session.server";
import { refusalData } from "~/lib/refusal";
import { saveReport } from "~/models/event.server";
import { notificationReason } from "./release-notification.server";
import { reportAccessRecord } from "~/models/event-read.server";

/**
 * The guard of the edit page: the report named in the URL, if this person may change it (edit it,
 * or revise it once accepted). A report they may not read is a 404, one they may not change a 403.
 */
export async function requireReportChange(request: Request, eventId: number): Promise<SessionUser> {
  const user = await requireUser(request);
  const record = await reportAccessRecord(eventId);
  invariantResponse(record, "No such report.");
  authorize(request, user, changeCapabilityFor(record.status), record);
  return user;
}

/**
 * The action behind the new-report and edit-report pages. The report acted on is the one in the URL
 * (`eventId`, none for a new report), never one named in the body. Drafts are saved exactly as
 * typed; filing validates every field. Failures come back with every value kept, so nothing typed is lost.
 */
export async function handleReportSubmission(request: Request, guard: () => Promise<SessionUser>, eventId?: number) {
  const formData = await readFormData(request, REPORT_FORM_SCHEMAS);
  let user: SessionUser;
  try {
    user = await guard();
  } catch (error) {
    // The session check needs the database too; when it is down, the typing still comes back.
    if (!(error instanceof Response) && isDatabaseDownResponse(error)) {
      const submission = parseWithZod(formData, { schema: DraftPayloadSchema });
      return data({ result: submission.reply({ formErrors: [DATABASE_DOWN_MESSAGE] }) }, { status: 503 });
    }
    throw error;
  }
  const intent = ReportIntentSchema.safeParse({
    intent: formData.get("intent"),
    version: formData.get("version") ? Number(formData.get("version")) : undefined,
    submissionKey: formData.get("submissionKey"),
    revisionReason: formData.get("revisionReason") || undefined,
  });
  const filing = intent.success && intent.data.intent === "file";
  const submission = parseWithZod(formData, { schema: filing ? FiledReportSchema : DraftPayloadSchema });
  if (!intent.success) {
    return data(
      { result: submission.reply({ formErrors: intent.error.issues.map((issue) => issue.message) }) },
      { status: 400 },
    );
  }
  if (filing && submission.status !== "success") {
    return data(
      {
        result: submission.reply({
          formErrors: ["The report was not filed. Fix the fields marked below; everything you typed is kept."],
        }),
      },
      { status: 400 },
    );
  }
  try {
    const outcome = await saveReport({
      user,
      intent: intent.data.intent,
      eventId,
      version: intent.data.version,
      submissionKey: intent.data.submissionKey,
      payload: submission.payload,
      report: filing && submission.status === "success" ? (submission.value as FiledReport) : undefined,
      revisionReason: intent.data.revisionReason,
      clientAddress: clientAddress(request),
    });
    if (outcome.kind === "saved" || outcome.kind === "repeat") {
      const reason =
        outcome.kind === "saved" && outcome.status === "filed" ? await notificationReason(outcome.eventId) : null;
      const notice = reason
        ? ` Notification needed: ${reason}. Notify immediately (CERCLA §103, EPCRA §304; state rules add their own) and record it on this page — this report is not a notification.`
        : "";
      const message =
        outcome.kind === "repeat"
          ? "This form was already sent; here is the report it made."
          : outcome.status === "filed"
            ? `Report filed. The environmental officer will review it.${notice}`
            : "Draft saved. You can come back to it at any time.";
      const target =
        outcome.kind === "saved" && outcome.status !== "filed"
          ? `/events/${outcome.eventId}/edit`
          : `/events/${outcome.eventId}`;
      throw redirect(target, { headers: await flashHeaders(request, message) });
    }
    return refusalData(submission, outcome);
  } catch (error) {
    if (!isDatabaseDown(error)) throw error;
    return data({ result: submission.reply({ formErrors: [DATABASE_DOWN_MESSAGE] }) }, { status: 503 });
  }
}
