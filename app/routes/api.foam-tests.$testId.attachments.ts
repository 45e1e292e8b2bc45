import type { Route } from "./+types/api.foam-tests.$testId.attachments";
import { can } from "~/lib/access";
import { requireCapability } from "~/lib/access.server";
import { apiError, requireRecordId } from "~/lib/http.server";
import { attachmentListResponse, attachmentUploadResponse } from "~/models/attachment-download.server";
import { accuracyTestExists } from "~/models/foam-system.server";

/** The printouts attached to a proportioner accuracy test. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "systems.read");
  const id = requireRecordId(request, params.testId, "Not found.");
  if (!(await accuracyTestExists(id))) apiError(404, "Not found.");
  return attachmentListResponse({ subject: "foam_test", id }, can(user, "systems.maintain"));
}

/** One printout per request (kind `test_printout`), by the same upload path as report files: 201. */
export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "systems.maintain");
  const id = requireRecordId(request, params.testId, "Not found.");
  if (!(await accuracyTestExists(id))) apiError(404, "Not found.");
  return attachmentUploadResponse(request, { subject: "foam_test", id }, user);
}
