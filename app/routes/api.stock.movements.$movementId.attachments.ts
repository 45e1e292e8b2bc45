import type { Route } from "./+types/api.stock.movements.$movementId.attachments";
import { can } from "~/lib/access";
import { requireCapability } from "~/lib/access.server";
import { apiError, requireRecordId } from "~/lib/http.server";
import { attachmentListResponse, attachmentUploadResponse } from "~/models/attachment-download.server";
import { disposedMovementExists } from "~/models/stock.server";

/** The hauler's manifest attached to a disposal of concentrate. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "stock.read");
  const id = requireRecordId(request, params.movementId, "Not found.");
  if (!(await disposedMovementExists(id))) apiError(404, "Not found.");
  return attachmentListResponse({ subject: "stock_movement", id }, can(user, "stock.manage"));
}

/** One manifest per request (kind `disposal_manifest`), by the same upload path as report files: 201. */
export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "stock.manage");
  const id = requireRecordId(request, params.movementId, "Not found.");
  if (!(await disposedMovementExists(id))) apiError(404, "Not found.");
  return attachmentUploadResponse(request, { subject: "stock_movement", id }, user);
}
