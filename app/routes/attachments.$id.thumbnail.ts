import type { Route } from "./+types/attachments.$id.thumbnail";
import { authorize, requireCapability } from "~/lib/access.server";
import { invariantResponse, requireRecordId } from "~/lib/http.server";
import { attachmentResponse } from "~/models/attachment-download.server";
import { findEventAttachment } from "~/models/attachments.server";

/** The small WebP of an attached image, after the role check on its event. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "report.read");
  const found = await findEventAttachment(requireRecordId(request, params.id, "No such attachment."));
  invariantResponse(found && found.attachment.thumbnailKey, "No such thumbnail.");
  authorize(request, user, "report.read", found.report);
  return attachmentResponse(request, user, found.attachment, "thumbnail");
}
