import type { Route } from "./+types/environmental.submissions.$id";
import { requireCapability } from "~/lib/access.server";
import { httpError, invariantResponse, requireRecordId } from "~/lib/http.server";
import { StorageUnavailableError } from "~/lib/storage.server";
import { recordDownload } from "~/models/download-audit.server";
import { submissionFile } from "~/models/quarterly-submission.server";

/** The exact file recorded when a period was marked submitted. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "exports.quarterly");
  const id = requireRecordId(request, params.id, "No such submission.");
  const file = await submissionFile(id).catch((error: unknown) => {
    if (error instanceof StorageUnavailableError) {
      httpError(503, "The file store is not answering right now; please try again in a minute.");
    }
    throw error;
  });
  invariantResponse(file, "No such submission.", 404);
  await recordDownload(request, user, {
    action: "submission_downloaded",
    entityType: "quarterly_submission",
    entityId: id,
    summary: `Submitted file ${file.fileName} downloaded`,
    details: { fileName: file.fileName, sha256: file.sha256, byteSize: file.content.length },
  });
  return new Response(new Uint8Array(file.content), {
    headers: {
      "Content-Type": file.contentType,
      "Content-Disposition": `attachment; filename="${file.fileName}"`,
      "Content-Length": String(file.content.length),
      "Cache-Control": "no-store",
      "X-Content-SHA256": file.sha256,
    },
  });
}
