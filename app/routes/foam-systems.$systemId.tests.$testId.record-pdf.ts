import type { Route } from "./+types/foam-systems.$systemId.tests.$testId.record-pdf";
import { requireCapability } from "~/lib/access.server";
import { accuracyTestPdf } from "~/exports/test-record-pdf.server";
import { invariantResponse, requireRecordId } from "~/lib/http.server";
import { localDateTime } from "~/lib/time-zone";
import { agencyNameForDocuments } from "~/models/agency-settings.server";
import { listAttachments } from "~/models/attachments.server";
import { getAccuracyTest } from "~/models/foam-system.server";

/** The printable record of one accuracy test. */
export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "systems.read");
  const systemId = requireRecordId(request, params.systemId, "No such foam system.");
  const testId = requireRecordId(request, params.testId, "No such test.");
  const test = await getAccuracyTest(systemId, testId);
  invariantResponse(test, "No such test.");
  const printouts = await listAttachments({ subject: "foam_test", id: testId });
  const pdf = await accuracyTestPdf({
    ...test,
    agencyName: agencyNameForDocuments({ name: test.agencyName }),
    printouts: printouts.map(({ name, uploadedAt }) => ({
      name,
      uploadedAt: localDateTime(new Date(uploadedAt), test.timeZone),
    })),
  });
  return new Response(Buffer.from(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `inline; filename="accuracy-test-${testId}.pdf"`,
      "Cache-Control": "private, no-store",
    },
  });
}
