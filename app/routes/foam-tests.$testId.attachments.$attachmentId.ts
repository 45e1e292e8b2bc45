import { data } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/foam-tests.$testId.attachments.$attachmentId";
import { requireCapability } from "~/lib/access.server";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress, httpError, invariantResponse, requireRecordId } from "~/lib/http.server";
import { attachmentResponse } from "~/models/attachment-download.server";
import { findOwnedAttachment, removeAttachment } from "~/models/attachments.server";

async function found(request: Request, params: { testId: string; attachmentId: string }) {
  const testId = requireRecordId(request, params.testId, "There is no such test.");
  const attachment = await findOwnedAttachment(
    { subject: "foam_test", id: testId },
    requireRecordId(request, params.attachmentId, "No such attachment."),
  );
  invariantResponse(attachment, "No such attachment.");
  return attachment;
}

/** A printout attached to an accuracy test. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "systems.read");
  return attachmentResponse(request, user, await found(request, params), "file");
}

const RemoveSchema = z.object({ intent: z.literal("remove") });

/** Removes it from the test (audited; the file is kept until the retention setting). */
export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "systems.maintain");
  const attachment = await found(request, params);
  const form = await readFormData(request, RemoveSchema);
  if (!RemoveSchema.safeParse(Object.fromEntries(form)).success) httpError(400, "Send intent=remove.");
  await removeAttachment(attachment, user, clientAddress(request));
  return data({ removed: attachment.id });
}
