import type { Route } from "./+types/foam-tests.$testId.attachments.$attachmentId.thumbnail";
import { requireCapability } from "~/lib/access.server";
import { invariantResponse, requireRecordId } from "~/lib/http.server";
import { attachmentResponse } from "~/models/attachment-download.server";
import { findOwnedAttachment } from "~/models/attachments.server";

/** The small WebP of a photographed printout attached to an accuracy test. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "systems.read");
  const attachment = await findOwnedAttachment(
    { subject: "foam_test", id: requireRecordId(request, params.testId, "There is no such test.") },
    requireRecordId(request, params.attachmentId, "No such attachment."),
  );
  invariantResponse(attachment?.thumbnailKey, "No such thumbnail.");
  return attachmentResponse(request, user, attachment, "thumbnail");
}
