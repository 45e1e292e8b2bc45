import type { Route } from "./+types/stock.movements.$movementId.attachments.$attachmentId.thumbnail";
import { requireCapability } from "~/lib/access.server";
import { invariantResponse, requireRecordId } from "~/lib/http.server";
import { attachmentResponse } from "~/models/attachment-download.server";
import { findOwnedAttachment } from "~/models/attachments.server";

/** The small WebP of a photographed manifest attached to a disposal. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "stock.read");
  const attachment = await findOwnedAttachment(
    { subject: "stock_movement", id: requireRecordId(request, params.movementId, "There is no such disposal.") },
    requireRecordId(request, params.attachmentId, "No such attachment."),
  );
  invariantResponse(attachment?.thumbnailKey, "No such thumbnail.");
  return attachmentResponse(request, user, attachment, "thumbnail");
}
