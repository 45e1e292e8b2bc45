import { randomUUID } from "node:crypto";
import type { Route } from "./+types/events.$id.edit";
import { ReportForm } from "~/components/report-form";
import { requireUser } from "~/lib/auth.server";
import { httpError, invariantResponse } from "~/lib/http.server";
import { REPORT_AUTHORS, REPORT_REVISERS } from "~/lib/report-access";
import { canEditReport } from "~/models/event.server";
import { canSeeReport, getReport } from "~/models/event-read.server";
import { formValuesOf, reportFormOptions } from "~/models/report-options.server";
import { handleReportSubmission } from "./report-form.server";

const EDITORS = [...new Set([...REPORT_AUTHORS, ...REPORT_REVISERS])];

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Edit ${data?.number ?? "report"} · Foamtally` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, EDITORS);
  const report = await getReport(Number(params.id));
  invariantResponse(
    report && canSeeReport(user, { status: report.status, created_by: report.createdBy }),
    "No such report.",
  );
  if (!canEditReport(user, { status: report.status, created_by: report.createdBy })) {
    httpError(403, "Your roles do not allow you to change this report.");
  }
  return {
    ...(await reportFormOptions()),
    number: report.number,
    eventId: report.id,
    version: report.version,
    status: report.status,
    reviewComment: report.status === "returned" ? report.reviewComment : null,
    submissionKey: randomUUID(),
    defaultValue: report.draft ?? formValuesOf(report),
  };
}

export async function action({ request }: Route.ActionArgs) {
  return handleReportSubmission(request, () => requireUser(request, EDITORS));
}

export default function EditReport({ loaderData, actionData }: Route.ComponentProps) {
  const { reviewComment, number, ...form } = loaderData;
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">
        {loaderData.status === "accepted" ? "Revise" : "Edit"} report {number}
      </h1>
      {reviewComment ? (
        <div role="note" className="caution">
          <p className="font-semibold">Returned for changes:</p>
          <p className="whitespace-pre-line">{reviewComment}</p>
        </div>
      ) : null}
      <ReportForm {...form} lastResult={actionData?.result} />
    </div>
  );
}
