import { data } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/attachments.$id";
import { authorize, requireCapability } from "~/lib/access.server";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress, httpError, invariantResponse, requireRecordId } from "~/lib/http.server";
import { attachmentResponse } from "~/models/attachment-download.server";
import { findEventAttachment, removeAttachment } from "~/models/attachments.server";

/** The stored file, after the role check on its event. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "report.read");
  const found = await findEventAttachment(requireRecordId(request, params.id, "No such attachment."));
  invariantResponse(found, "No such attachment.");
  authorize(request, user, "report.read", found.report);
  return attachmentResponse(request, user, found.attachment, "file");
}

const RemoveSchema = z.object({ intent: z.literal("remove") });

/** Removes the attachment from its event (audited; the file is kept until the retention setting). */
export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "report.attach");
  const found = await findEventAttachment(requireRecordId(request, params.id, "No such attachment."));
  invariantResponse(found, "No such attachment.");
  authorize(request, user, "report.attach", found.report);
  const form = await readFormData(request, RemoveSchema);
  if (!RemoveSchema.safeParse(Object.fromEntries(form)).success) httpError(400, "Send intent=remove.");
  await removeAttachment(found.attachment, user, clientAddress(request));
  return data({ removed: found.attachment.id });
}
