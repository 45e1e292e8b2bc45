import type { Route } from "./+types/api.records-requests.$id.attachments";
import { requireCapability } from "~/lib/access.server";
import { apiError, requireRecordId } from "~/lib/http.server";
import { attachmentListResponse, attachmentUploadResponse } from "~/models/attachment-download.server";
import { recordsRequestExists } from "~/models/records-request.server";

/** The documents attached to a records request (a signed release, correspondence, a scanned reply). */
export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "records.manage");
  const id = requireRecordId(request, params.id, "Not found.");
  if (!(await recordsRequestExists(id))) apiError(404, "Not found.");
  return attachmentListResponse({ subject: "records_request", id }, true);
}

/** One file per request, as on events: 201 with the stored attachment. */
export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "records.manage");
  const id = requireRecordId(request, params.id, "Not found.");
  if (!(await recordsRequestExists(id))) apiError(404, "Not found.");
  return attachmentUploadResponse(request, { subject: "records_request", id }, user);
}
