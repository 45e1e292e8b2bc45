import type { Route } from "./+types/reports.environmental-csv";
import { requireCapability } from "~/lib/access.server";
import { auditedPeriodDownload, periodFrom } from "~/exports/environmental-files.server";

/** The workbook's tables as one CSV file each, zipped. */
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "exports.quarterly");
  const period = await periodFrom(new URL(request.url).searchParams);
  return auditedPeriodDownload("zip", period, user, request);
}
