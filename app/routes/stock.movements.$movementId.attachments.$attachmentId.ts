import { data } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/stock.movements.$movementId.attachments.$attachmentId";
import { requireCapability } from "~/lib/access.server";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress, httpError, invariantResponse, requireRecordId } from "~/lib/http.server";
import { attachmentResponse } from "~/models/attachment-download.server";
import { findOwnedAttachment, removeAttachment } from "~/models/attachments.server";

async function found(request: Request, params: { movementId: string; attachmentId: string }) {
  const movementId = requireRecordId(request, params.movementId, "There is no such disposal.");
  const attachment = await findOwnedAttachment(
    { subject: "stock_movement", id: movementId },
    requireRecordId(request, params.attachmentId, "No such attachment."),
  );
  invariantResponse(attachment, "No such attachment.");
  return attachment;
}

/** A disposal manifest attached to a stock movement. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "stock.read");
  return attachmentResponse(request, user, await found(request, params), "file");
}

const RemoveSchema = z.object({ intent: z.literal("remove") });

/** Removes it from the movement (audited; the file is kept until the retention setting). */
export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "stock.manage");
  const attachment = await found(request, params);
  const form = await readFormData(request, RemoveSchema);
  if (!RemoveSchema.safeParse(Object.fromEntries(form)).success) httpError(400, "Send intent=remove.");
  await removeAttachment(attachment, user, clientAddress(request));
  return data({ removed: attachment.id });
}
