import type { SessionUser } from "~/lib/auth.server";
import { httpError, invariantResponse } from "~/lib/http.server";
import { getObject, StorageUnavailableError } from "~/lib/storage.server";
import { recordDownload, sha256Hex, type DownloadAction } from "./download-audit.server";
import { findVersion, type FileSubject } from "./file-versions.server";

/** One kept version of a stored file as an attachment, audited with its key and digest. */
export async function storedFileDownload(
  request: Request,
  user: SessionUser,
  target: { subject: FileSubject; subjectId: string; versionId: number; action: DownloadAction; entityType: string },
): Promise<Response> {
  const version = await findVersion(target.subject, target.subjectId, target.versionId);
  invariantResponse(version, "No such file.", 404);
  let body: Uint8Array;
  try {
    body = (await getObject(version.key)).body;
  } catch (error) {
    if (error instanceof StorageUnavailableError) {
      httpError(503, "The file store is not answering right now; please try again in a minute.");
    }
    throw error;
  }
  await recordDownload(request, user, {
    action: target.action,
    entityType: target.entityType,
    entityId: target.subjectId,
    summary: `${version.replacedAt ? "Earlier file" : "File"} ${version.fileName} downloaded`,
    details: { versionId: version.id, key: version.key, fileName: version.fileName, sha256: sha256Hex(body) },
  });
  return new Response(new Uint8Array(body), {
    headers: {
      "Content-Type": version.contentType,
      "Content-Disposition": `attachment; filename="${version.fileName.replace(/[^\w.-]+/g, "_")}"`,
      "Cache-Control": "private, no-store",
      "X-Content-Type-Options": "nosniff",
    },
  });
}
