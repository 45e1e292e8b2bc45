import type { Route } from "./+types/records.$id.attachments.$attachmentId.thumbnail";
import { requireCapability } from "~/lib/access.server";
import { invariantResponse, requireRecordId } from "~/lib/http.server";
import { attachmentResponse } from "~/models/attachment-download.server";
import { findRequestAttachment } from "~/models/attachments.server";

/** The small WebP of an image attached to a records request. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "records.manage");
  const attachment = await findRequestAttachment(
    requireRecordId(request, params.id, "There is no such request."),
    requireRecordId(request, params.attachmentId, "No such attachment."),
  );
  invariantResponse(attachment?.thumbnailKey, "No such thumbnail.");
  return attachmentResponse(request, user, attachment, "thumbnail");
}
