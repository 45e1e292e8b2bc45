import type { Route } from "./+types/api.events.$id.attachments";
import { can } from "~/lib/access";
import { authorize, requireCapability } from "~/lib/access.server";
import { BodyRefused } from "~/lib/form-data.server";
import { apiError, clientAddress, requireRecordId } from "~/lib/http.server";
import { StorageUnavailableError } from "~/lib/storage.server";
import { readAgencySettings } from "~/models/agency-settings.server";
import { addEventAttachment, attachmentLimits, listEventAttachments } from "~/models/attachments.server";
import { reportAccessRecord } from "~/models/event-read.server";

/** An event's attachments, with what the signed-in person may do and the agency's limits. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "report.read");
  const eventId = requireRecordId(request, params.id, "No such event.");
  const report = await reportAccessRecord(eventId);
  if (!report) apiError(404, "No such event.");
  authorize(request, user, "report.read", report);
  const limits = attachmentLimits(await readAgencySettings());
  return Response.json({
    attachments: await listEventAttachments(eventId),
    canAttach: can(user, "report.attach", report),
    maxFileBytes: limits.maxFileBytes,
    maxFiles: limits.perEvent,
  });
}

/** One file per request (multipart, field `file`, optional `kind`): 201 with the stored attachment. */
export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "report.attach");
  const eventId = requireRecordId(request, params.id, "No such event.");
  if (request.method !== "POST") apiError(405, "Use POST with the file as multipart/form-data.");
  const report = await reportAccessRecord(eventId);
  if (!report) apiError(404, "No such event.");
  authorize(request, user, "report.attach", report);
  try {
    const attachment = await addEventAttachment(request, eventId, user, { clientAddress: clientAddress(request) });
    return Response.json(attachment, { status: 201 });
  } catch (error) {
    if (error instanceof BodyRefused) apiError(error.status, error.message);
    if (error instanceof StorageUnavailableError) {
      apiError(
        503,
        "The file store is not answering, so this file was not attached. The report is saved; try the file again.",
      );
    }
    throw error;
  }
}
