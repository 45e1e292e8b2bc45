import { Link } from "react-router";
import type { Route } from "./+types/events.$id.revisions.$revision";
import { ReportSummary } from "~/components/report-summary";
import { authorize, requireCapability } from "~/lib/access.server";
import { invariantResponse, requireRecordId } from "~/lib/http.server";
import { getRevision, reportAccessRecord } from "~/models/event-read.server";
import { formatInstantInZone } from "~/lib/time-zone";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.report.number ?? "Report"} revision ${data?.report.revision ?? ""} (superseded) · Foamtally` },
];

/** An earlier state of an accepted report, read-only: whoever may read the report may read it. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "report.read");
  const eventId = requireRecordId(request, params.id, "No such report.");
  const revision = /^\d{1,9}$/.test(params.revision ?? "") ? Number(params.revision) : -1;
  const record = await reportAccessRecord(eventId);
  invariantResponse(record, "No such report.");
  authorize(request, user, "report.read", record);
  invariantResponse(Number.isInteger(revision) && revision >= 0, "No such revision.");
  const report = await getRevision(eventId, revision);
  invariantResponse(report, "No such revision.");
  return { report, eventId };
}

export default function EarlierRevision({ loaderData }: Route.ComponentProps) {
  const { report, eventId } = loaderData;
  return (
    <div className="space-y-6">
      <div role="note" className="caution" data-testid="superseded-banner">
        <p className="font-semibold">Earlier state, superseded</p>
        <p>
          This is revision {report.revision} of report {report.number} as it stood before {report.supersededBy} amended
          it on <time dateTime={report.supersededAt}>{formatInstantInZone(report.supersededAt, report.timeZone)}</time>.
          Reason given: “{report.reason}”. Its figures no longer count in totals or exports; the current report does.
          Station, apparatus and product names are shown as they are named today.
        </p>
        <p className="mt-2">
          <Link to={`/events/${eventId}`} className="text-pond-700 underline">
            Open the current report
          </Link>
        </p>
      </div>
      <div>
        <p className="text-sm text-slate-ft">Usage report, earlier state (read-only)</p>
        <h1 className="text-2xl font-bold">
          <span className="event-number">{report.number}</span>{" "}
          <span className="text-lg font-normal text-slate-ft">revision {report.revision}</span>
        </h1>
      </div>
      <ReportSummary report={report} />
    </div>
  );
}
