import type { Route } from "./+types/api.events.$id";
import { authorize, requireCapability } from "~/lib/access.server";
import { apiError, requireRecordId } from "~/lib/http.server";
import { getReport, reportForApi } from "~/models/event-read.server";
import { handleReportApi, requireReportChangeApi } from "~/models/report-form.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "report.read");
  const id = requireRecordId(request, params.id, "No such event.");
  const report = await getReport(id);
  if (!report) apiError(404, "No such event.");
  authorize(request, user, "report.read", report);
  return Response.json(reportForApi(report));
}

/** Saves or files a report from JSON, as the edit page does; the report is the one in the URL. */
export async function action({ request, params }: Route.ActionArgs) {
  const id = requireRecordId(request, params.id, "No such event.");
  const user = await requireReportChangeApi(request, id);
  if (request.method !== "PUT") apiError(405, "Use PUT with the report as JSON.");
  return handleReportApi(request, user, id);
}
