import type { Route } from "./+types/reports.environmental-xlsx";
import { requireCapability } from "~/lib/access.server";
import { auditedPeriodDownload, periodFrom } from "~/exports/environmental-files.server";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "exports.quarterly");
  const period = await periodFrom(new URL(request.url).searchParams);
  return auditedPeriodDownload("xlsx", period, user, request);
}
