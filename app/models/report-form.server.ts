import { createHash, randomUUID } from "node:crypto";
import { parseWithZod } from "@conform-to/zod/v4";
import { z } from "zod";
import { data, redirect } from "react-router";
import { changeCapabilityFor } from "~/lib/access";
import { authorize } from "~/lib/access.server";
import { requireUser, type SessionUser } from "~/lib/auth.server";
import {
  DraftPayloadSchema,
  fieldErrors,
  FiledReportSchema,
  REPORT_FORM_SCHEMAS,
  ReportIntentSchema,
  type FiledReport,
} from "~/lib/foam/report-schema";
import { readFormData, readJsonBody } from "~/lib/form-data.server";
import {
  apiError,
  clientAddress,
  DATABASE_DOWN_MESSAGE,
  invariantResponse,
  isDatabaseDown,
  isDatabaseDownResponse,
} from "~/lib/http.server";
import { flashHeaders } from "~/lib/session.server";
import { refusalData, refusalStatus } from "~/lib/refusal";
import { localDateTime } from "~/lib/time-zone";
import { readAgencySettings } from "~/models/agency-settings.server";
import { reportSummary, saveReport } from "~/models/event.server";
import { notificationReason } from "./release-notification.server";
import { reportAccessRecord } from "~/models/event-read.server";
import { submittedPeriodOf } from "./quarterly-submission.server";

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
      const { timeZone } = await readAgencySettings();
      const reason =
        outcome.kind === "saved" && outcome.status === "filed" ? await notificationReason(outcome.eventId) : null;
      const notice = reason
        ? ` Notification needed: ${reason}. Notify immediately (CERCLA §103, EPCRA §304; state rules add their own) and record it on this page — this report is not a notification.`
        : "";
      const submitted =
        outcome.kind === "saved" && outcome.status === "filed" && eventId !== undefined
          ? await submittedPeriodOf(outcome.eventId)
          : null;
      const submittedNote = submitted
        ? ` This report falls in ${submitted.label}, already marked submitted: the change is listed under “Changed since submission” on the quarterly page.`
        : "";
      const message =
        outcome.kind === "repeat"
          ? "This form was already sent; here is the report it made."
          : outcome.status === "filed"
            ? `Report filed. The environmental officer will review it.${notice}${submittedNote}`
            : `Draft saved at ${localDateTime(new Date(), timeZone)} (${timeZone}). You can come back to it at any time.`;
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

// ---------------------------------------------------------------------------------------------
// The same save as JSON, for `POST /api/events` and `PUT /api/events/:id`

/** What the API adds to the report form's fields. `save` keeps a draft, `file` files it. */
const ApiReportIntentSchema = z.object({
  intent: z.enum(["save", "file"], { error: 'Send "intent": "save" or "file".' }),
  version: z.number({ error: "Send the version as a whole number." }).int().positive().optional(),
  revisionReason: z.string().trim().max(500, "A reason has at most 500 characters.").optional(),
});

/** Every key a JSON report may carry: the form's fields plus the intent; used to bound the body only. */
const ApiReportBodySchema = z.union([FiledReportSchema, ApiReportIntentSchema]);

const IDEMPOTENCY_KEY = /^[A-Za-z0-9-]{8,64}$/;

/**
 * The submission key stored for an `Idempotency-Key`. The form's keys are random and made by the
 * server; a script chooses its own, so the key is bound to its sender: the same key from someone
 * else is a new submission, never an answer naming their report.
 */
function apiSubmissionKey(user: SessionUser, key: string): string {
  return createHash("sha256").update(`api:${user.id}:${key}`).digest("hex");
}

/**
 * The guard of `PUT /api/events/:id`: as the edit page's, with JSON answers. A report one may not
 * read is a 404, one one may not change a 403.
 */
export async function requireReportChangeApi(request: Request, eventId: number): Promise<SessionUser> {
  const user = await requireUser(request);
  const record = await reportAccessRecord(eventId);
  if (!record) apiError(404, "No such event.");
  authorize(request, user, changeCapabilityFor(record.status), record);
  return user;
}

/**
 * Saves or files a report sent as JSON, through the same schema, status rules, version check and
 * submission keys as the report form. The caller has passed the route's guard already. An
 * `Idempotency-Key` header is the form's submission key: the same key again answers with the report
 * it made. Success is 201 (new) or 200 with `{ id, number, status, url }`.
 */
export async function handleReportApi(request: Request, user: SessionUser, eventId?: number): Promise<Response> {
  const body = await readJsonBody(request, ApiReportBodySchema);
  if (!body || typeof body !== "object" || Array.isArray(body)) apiError(400, "Send the report as a JSON object.");
  const keyHeader = request.headers.get("Idempotency-Key");
  if (keyHeader !== null && !IDEMPOTENCY_KEY.test(keyHeader)) {
    apiError(400, "An Idempotency-Key is 8 to 64 letters, digits or dashes.");
  }
  const { intent: intentValue, version, revisionReason, ...fields } = body as Record<string, unknown>;
  const intent = ApiReportIntentSchema.safeParse({ intent: intentValue, version, revisionReason });
  if (!intent.success) {
    return Response.json({ error: "Some values cannot be used.", errors: fieldErrors(intent.error) }, { status: 400 });
  }
  if (eventId !== undefined && intent.data.version === undefined) {
    return Response.json(
      { error: "Send the version of the report you read.", errors: { version: ["Send the version you read."] } },
      { status: 400 },
    );
  }
  const filing = intent.data.intent === "file";
  let report: FiledReport | undefined;
  if (filing) {
    const parsed = FiledReportSchema.safeParse(fields);
    if (!parsed.success) {
      return Response.json(
        { error: "The report was not filed. Fix the fields named in errors.", errors: fieldErrors(parsed.error) },
        { status: 400 },
      );
    }
    report = parsed.data;
  }
  let outcome: Awaited<ReturnType<typeof saveReport>>;
  try {
    outcome = await saveReport({
      user,
      intent: filing ? "file" : "save-draft",
      eventId,
      version: intent.data.version,
      submissionKey: keyHeader === null ? randomUUID() : apiSubmissionKey(user, keyHeader),
      payload: fields,
      report,
      revisionReason: intent.data.revisionReason,
      clientAddress: clientAddress(request),
    });
  } catch (error) {
    if (isDatabaseDown(error)) apiError(503, DATABASE_DOWN_MESSAGE);
    throw error;
  }
  if (outcome.kind !== "saved" && outcome.kind !== "repeat") {
    return Response.json(
      { error: outcome.message, ...(outcome.fieldErrors ? { errors: outcome.fieldErrors } : {}) },
      { status: refusalStatus(outcome) },
    );
  }
  const saved = await reportSummary(outcome.eventId);
  if (!saved) apiError(404, "No such event.");
  // A replayed key answers as the first request did.
  const created = eventId === undefined;
  return Response.json(
    { id: outcome.eventId, number: saved.number, status: saved.status, url: `/events/${outcome.eventId}` },
    { status: created ? 201 : 200 },
  );
}
