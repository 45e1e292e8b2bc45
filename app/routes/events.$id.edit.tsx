import { randomUUID } from "node:crypto";
import type { Route } from "./+types/events.$id.edit";
import { ReportForm } from "~/components/report-form";
import { SubmittedPeriodNote } from "~/components/submitted-period-note";
import { changeReasonFor } from "~/lib/access";
import { invariantResponse, requireRecordId } from "~/lib/http.server";
import { listAttachments } from "~/models/attachments.server";
import { getReport } from "~/models/event-read.server";
import { formValuesOf, reportFormOptions } from "~/models/report-options.server";
import { submittedPeriodOf } from "~/models/quarterly-submission.server";
import { handleReportSubmission, requireReportChange } from "~/models/report-form.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Edit ${data?.number ?? "report"} · Foamtally` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const eventId = requireRecordId(request, params.id, "No such report.");
  const user = await requireReportChange(request, eventId);
  const report = await getReport(eventId);
  invariantResponse(report, "No such report.");
  const attachments = await listAttachments({ subject: "event", id: eventId });
  return {
    reasonRequired: changeReasonFor(user, report) === "review-edit",
    submittedPeriod: await submittedPeriodOf(eventId),
    ...(await reportFormOptions()),
    number: report.number,
    version: report.version,
    status: report.status,
    reviewComment: report.status === "returned" ? report.reviewComment : null,
    submissionKey: randomUUID(),
    savedAt: report.updatedAt,
    defaultValue: report.draft ?? formValuesOf(report),
    // Only photos whose position the officer chose to keep carry one.
    photoPositions: attachments.flatMap((attachment) =>
      attachment.position ? [{ id: attachment.id, name: attachment.name, ...attachment.position }] : [],
    ),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const eventId = requireRecordId(request, params.id, "No such report.");
  return handleReportSubmission(request, () => requireReportChange(request, eventId), eventId);
}

export default function EditReport({ loaderData, actionData }: Route.ComponentProps) {
  const { reviewComment, number, submittedPeriod, ...form } = loaderData;
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">
        {loaderData.status === "accepted" ? "Revise" : "Edit"} report <span className="event-number">{number}</span>
      </h1>
      {reviewComment ? (
        <div role="note" className="caution">
          <p className="font-semibold">Returned for changes:</p>
          <p className="whitespace-pre-line">{reviewComment}</p>
        </div>
      ) : null}
      {submittedPeriod ? <SubmittedPeriodNote period={submittedPeriod} changing /> : null}
      <ReportForm {...form} lastResult={actionData?.result} />
    </div>
  );
}
