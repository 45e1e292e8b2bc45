import { getFormProps, getTextareaProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect } from "react-router";
import type { z } from "zod";
import type { Route } from "./+types/events.$id";
import { EventAttachments } from "~/components/attachments-panel";
import { ErrorList, FormErrors } from "~/components/form-fields";
import { ReleaseNotifications } from "~/components/release-notifications";
import { ReportSummary } from "~/components/report-summary";
import { SubmittedPeriodNote } from "~/components/submitted-period-note";
import { can, changeCapabilityFor } from "~/lib/access";
import { authorize, requireCapability } from "~/lib/access.server";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress, invariantResponse, requireRecordId } from "~/lib/http.server";
import { ReviewSchema } from "~/lib/foam/report-schema";
import { EVENT_STATUS_LABELS, RQ_ANSWER_LABELS, type RqAnswer } from "~/lib/foam/vocabulary";
import { refusalData } from "~/lib/refusal";
import { flashHeaders } from "~/lib/session.server";
import { reviewReport } from "~/models/event.server";
import { getReport, listRevisions, reportAccessRecord, reportHistory } from "~/models/event-read.server";
import { eventConcentrateCost } from "~/models/stock.server";
import { readAgencySettings } from "~/models/agency-settings.server";
import { listReleaseNotifications } from "~/models/release-notification.server";
import { eventReportableQuantity } from "~/models/environmental-report.server";
import { submittedPeriodOf } from "~/models/quarterly-submission.server";
import { formatInstantInZone } from "~/lib/time-zone";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.report.number ?? "Report"} · Foamtally` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "report.read");
  const report = await getReport(requireRecordId(request, params.id, "No such report."));
  invariantResponse(report, "No such report.");
  authorize(request, user, "report.read", report);
  const { draft: _draft, ...visible } = report;
  const settings = await readAgencySettings();
  return {
    report: { ...visible, concentrateCostUsd: await eventConcentrateCost(report.id) },
    history: await reportHistory(report.id),
    revisions: await listRevisions(report.id),
    canReview: report.status === "filed" && can(user, "report.review", report),
    canEdit: can(user, changeCapabilityFor(report.status), report),
    notifications: (await listReleaseNotifications(report.id)).map(
      ({ notifiedAtInstant: _instant, party: _party, ...entry }) => entry,
    ),
    canNotify: report.status !== "draft" && can(user, "report.notify", report),
    timeZone: settings.timeZone,
    submittedPeriod: report.status === "draft" ? null : await submittedPeriodOf(report.id),
    reportableQuantity:
      report.pfasContaining && report.status !== "draft"
        ? {
            thresholdLb: settings.pfasReportableLb,
            ...(await eventReportableQuantity(report.id, settings.pfasReportableLb)),
          }
        : null,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "report.review");
  const eventId = requireRecordId(request, params.id, "No such report.");
  const record = await reportAccessRecord(eventId);
  invariantResponse(record, "No such report.");
  authorize(request, user, "report.review", record);
  const submission = parseWithZod(await readFormData(request, ReviewSchema), { schema: ReviewSchema });
  if (submission.status !== "success") return data({ result: submission.reply() }, { status: 400 });
  const outcome = await reviewReport({
    user,
    eventId,
    version: submission.value.version,
    decision: submission.value.decision,
    comment: submission.value.comment,
    clientAddress: clientAddress(request),
  });
  if (outcome.kind !== "done") return refusalData(submission, outcome);
  const message =
    outcome.status === "accepted" ? "Report accepted." : "Report returned to its officer with your comment.";
  throw redirect(`/events/${eventId}`, { headers: await flashHeaders(request, message) });
}

export default function EventReport({ loaderData, actionData }: Route.ComponentProps) {
  const {
    report,
    history,
    revisions,
    canReview,
    canEdit,
    notifications,
    canNotify,
    timeZone,
    reportableQuantity,
    submittedPeriod,
  } = loaderData;
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-sm text-slate-ft">Usage report</p>
          <h1 className="event-number text-2xl font-bold">{report.number}</h1>
          <p className="mt-1">
            <span className="rounded bg-stone-200 px-2 py-0.5 text-sm font-semibold" data-testid="report-status">
              {EVENT_STATUS_LABELS[report.status]}
            </span>
            {report.revision > 0 ? (
              <span className="ml-2 text-sm text-slate-ft">revision {report.revision}</span>
            ) : null}
          </p>
        </div>
        <div className="flex flex-wrap gap-2 print:hidden">
          <a href={`/events/${report.id}/report.pdf`} className="btn-secondary" download>
            Download PDF
          </a>
          {canEdit ? (
            <Link to={`/events/${report.id}/edit`} className="btn-secondary">
              {report.status === "accepted" ? "Revise this report" : "Edit report"}
            </Link>
          ) : null}
        </div>
      </div>
      {report.status === "returned" && report.reviewComment ? (
        <div role="note" className="caution">
          <p className="font-semibold">Returned by {report.reviewerName ?? "the reviewer"}:</p>
          <p className="whitespace-pre-line">{report.reviewComment}</p>
        </div>
      ) : null}
      {submittedPeriod ? <SubmittedPeriodNote period={submittedPeriod} /> : null}
      <ReportSummary report={report} />
      {reportableQuantity?.pfoa ? <ReportableQuantity answer={reportableQuantity} /> : null}
      {canReview ? (
        <ReviewPanel version={report.version} lastResult={actionData?.result} pfas={report.pfasContaining} />
      ) : null}
      {revisions.length > 0 ? (
        <section className="card" aria-labelledby="revisions-title">
          <h2 id="revisions-title" className="text-lg font-semibold">
            Earlier revisions
          </h2>
          <p className="text-sm text-slate-ft">
            Each amendment of the accepted report kept the state it replaced. Open one to read it as it stood.
          </p>
          <ul className="mt-3 space-y-2" data-testid="revisions">
            {revisions.map((entry) => (
              <li key={entry.revision} className="border-l-4 border-stone-300 pl-3">
                <p className="font-medium">
                  <Link to={`/events/${report.id}/revisions/${entry.revision}`} className="text-pond-700 underline">
                    Revision {entry.revision}
                  </Link>{" "}
                  — superseded by {entry.changedBy}
                </p>
                <p className="text-sm text-slate-ft">
                  <time dateTime={entry.changedAt}>{formatInstantInZone(entry.changedAt, timeZone)}</time> · reason:{" "}
                  {entry.reason}
                </p>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      {report.status !== "draft" ? (
        <ReleaseNotifications
          eventId={report.id}
          notifications={notifications}
          canRecord={canNotify}
          timeZone={timeZone}
        />
      ) : null}
      <EventAttachments eventId={report.id} />
      <section className="card" aria-labelledby="history-title">
        <h2 id="history-title" className="text-lg font-semibold">
          History
        </h2>
        <ol className="mt-3 space-y-2" data-testid="history">
          {history.map((entry, index) => (
            <li key={index} className="border-l-4 border-pond-600 pl-3">
              <p className="font-medium">
                {entry.action} — {entry.actor}
              </p>
              <p className="text-sm text-slate-ft">
                <time dateTime={entry.at}>{formatInstantInZone(entry.at, timeZone)}</time>
                {entry.summary ? ` · ${entry.summary}` : ""}
              </p>
            </li>
          ))}
        </ol>
      </section>
    </div>
  );
}

function ReviewPanel({
  version,
  lastResult,
  pfas,
}: {
  version: number;
  lastResult?: SubmissionResult<string[]>;
  pfas: boolean;
}) {
  const [form, fields] = useForm<z.input<typeof ReviewSchema>>({
    id: "review",
    lastResult,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ReviewSchema }),
    shouldValidate: "onSubmit",
  });
  return (
    <section className="card" aria-labelledby="review-title">
      <h2 id="review-title" className="text-lg font-semibold">
        Review
      </h2>
      {pfas ? (
        <p className="caution mt-2">
          This report includes PFAS-containing foam. Check the release-reporting deadlines that apply to your agency
          before accepting; local law governs.
        </p>
      ) : null}
      <Form method="post" {...getFormProps(form)} className="mt-3 space-y-3">
        <FormErrors id={form.errorId} errors={form.errors} />
        <input type="hidden" name="version" value={version} />
        <div>
          <label htmlFor={fields.comment.id} className="field-label">
            Comment for the officer
          </label>
          <textarea {...getTextareaProps(fields.comment)} key={fields.comment.key} rows={3} className="field-input" />
          <ErrorList id={fields.comment.errorId} errors={fields.comment.errors} />
        </div>
        <div className="flex flex-wrap gap-3">
          <button type="submit" name="decision" value="accept" className="btn-primary">
            Accept report
          </button>
          <button type="submit" name="decision" value="return" className="btn-secondary">
            Return with comment
          </button>
        </div>
      </Form>
    </section>
  );
}

function ReportableQuantity({
  answer,
}: {
  answer: { thresholdLb: number; pfoa?: RqAnswer; pfos?: RqAnswer; windowPounds?: number; unacceptedInWindow?: string };
}) {
  return (
    <section className="card" aria-labelledby="rq-title" data-testid="reportable-quantity">
      <h2 id="rq-title" className="text-lg font-semibold">
        Reportable quantity (PFOA, PFOS)
      </h2>
      <dl className="mt-2 grid gap-2 sm:grid-cols-3">
        {(["pfoa", "pfos"] as const).map((substance) => (
          <div key={substance}>
            <dt className="text-sm text-slate-ft">
              {substance.toUpperCase()} reached {answer.thresholdLb} lb in 24 hours
            </dt>
            <dd className="font-semibold">{RQ_ANSWER_LABELS[answer[substance] ?? "unknown"]}</dd>
          </div>
        ))}
        <div>
          <dt className="text-sm text-slate-ft">Heaviest known 24 hours (either substance, never added)</dt>
          <dd className="font-semibold">{(answer.windowPounds ?? 0).toFixed(3)} lb</dd>
        </div>
      </dl>
      <p className="caution mt-3" role="note">
        Each substance is compared with its own reportable quantity (40 CFR 302.4); a PFAS-containing product of unknown
        content makes the answer Unknown (mixture rule, 40 CFR 302.6(b)(1)(ii)). Reports filed or returned within 24
        hours count too{answer.unacceptedInWindow ? `: ${answer.unacceptedInWindow}` : ""}. This is not a notification:
        a release at or above a reportable quantity must be reported immediately (CERCLA §103, EPCRA §304), and state
        rules add their own.
      </p>
    </section>
  );
}
