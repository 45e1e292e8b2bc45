import type { Route } from "./+types/events.$id.report-pdf";
import { authorize, requireCapability } from "~/lib/access.server";
import { invariantResponse, requireRecordId } from "~/lib/http.server";
import { usageReportPdf } from "~/exports/report-pdf.server";
import { agencyNameForDocuments, readAgencySettings } from "~/models/agency-settings.server";
import { getReport } from "~/models/event-read.server";
import { listReleaseNotifications } from "~/models/release-notification.server";

/** The printable usage report, for everyone who may read the event. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "report.read");
  const report = await getReport(requireRecordId(request, params.id, "No such report."));
  invariantResponse(report, "No such report.");
  authorize(request, user, "report.read", report);
  const pdf = await usageReportPdf(
    report,
    agencyNameForDocuments(await readAgencySettings()),
    null,
    await listReleaseNotifications(report.id),
  );
  return new Response(Buffer.from(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `inline; filename="report-${report.number.replace(/[^A-Za-z0-9_-]/g, "_")}.pdf"`,
      "Cache-Control": "private, no-store",
    },
  });
}
