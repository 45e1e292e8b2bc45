import type { Route } from "./+types/api.events.$id.attachments";
import { can } from "~/lib/access";
import { authorize, requireCapability } from "~/lib/access.server";
import { apiError, requireRecordId } from "~/lib/http.server";
import { attachmentListResponse, attachmentUploadResponse } from "~/models/attachment-download.server";
import { reportAccessRecord } from "~/models/event-read.server";

/** An event's attachments, with what the signed-in person may do and the agency's limits. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "report.read");
  const eventId = requireRecordId(request, params.id, "No such event.");
  const report = await reportAccessRecord(eventId);
  if (!report) apiError(404, "No such event.");
  authorize(request, user, "report.read", report);
  return attachmentListResponse({ subject: "event", id: eventId }, can(user, "report.attach", report));
}

/** One file per request (multipart, field `file`, optional `kind`): 201 with the stored attachment. */
export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "report.attach");
  const eventId = requireRecordId(request, params.id, "No such event.");
  const report = await reportAccessRecord(eventId);
  if (!report) apiError(404, "No such event.");
  authorize(request, user, "report.attach", report);
  return attachmentUploadResponse(request, { subject: "event", id: eventId }, user);
}
