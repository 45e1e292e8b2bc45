import type { Route } from "./+types/api.events.$id";
import { requireUser } from "~/lib/auth.server";
import { apiError } from "~/lib/http.server";
import { REPORT_READERS } from "~/lib/report-access";
import { canSeeReport, getReport, reportForApi } from "~/models/event-read.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, REPORT_READERS);
  const id = Number(params.id);
  if (!Number.isInteger(id) || id < 1) apiError(404, "No such event.");
  const report = await getReport(id);
  if (!report || !canSeeReport(user, { status: report.status, created_by: report.createdBy }))
    apiError(404, "No such event.");
  return Response.json(reportForApi(report));
}
