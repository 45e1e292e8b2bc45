import type { Route } from "./+types/api.events.$id";
import { authorize, requireCapability } from "~/lib/access.server";
import { apiError, requireRecordId } from "~/lib/http.server";
import { getReport, reportForApi } from "~/models/event-read.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "report.read");
  const id = requireRecordId(request, params.id, "No such event.");
  const report = await getReport(id);
  if (!report) apiError(404, "No such event.");
  authorize(request, user, "report.read", report);
  return Response.json(reportForApi(report));
}
