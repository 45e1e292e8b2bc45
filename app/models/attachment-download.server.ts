import { ATTACHMENT_TYPES, contentDisposition, isAttachmentType } from "~/lib/attachment-files";
import type { SessionUser } from "~/lib/auth.server";
import { BodyRefused } from "~/lib/form-data.server";
import { apiError, clientAddress, httpError } from "~/lib/http.server";
import { getObjectStream, StorageUnavailableError } from "~/lib/storage.server";
import { readAgencySettings } from "./agency-settings.server";
import {
  addAttachment,
  attachmentLimits,
  listAttachments,
  type AttachmentOwner,
  subjectTerms,
  type StoredAttachment,
} from "./attachments.server";
import { recordDownload } from "./download-audit.server";

/** The attachments API's list: the files, whether the caller may attach, and the agency's limits. */
export async function attachmentListResponse(owner: AttachmentOwner, canAttach: boolean): Promise<Response> {
  const limits = attachmentLimits(await readAgencySettings());
  return Response.json({
    attachments: await listAttachments(owner),
    kinds: subjectTerms(owner.subject).kinds,
    canAttach,
    maxFileBytes: limits.maxFileBytes,
    maxFiles: limits.perEvent,
  });
}

/** The attachments API's upload, for a caller the route has checked: 201, or the refusal as JSON. */
export async function attachmentUploadResponse(
  request: Request,
  owner: AttachmentOwner,
  user: SessionUser,
): Promise<Response> {
  if (request.method !== "POST") apiError(405, "Use POST with the file as multipart/form-data.");
  try {
    const attachment = await addAttachment(request, owner, user, { clientAddress: clientAddress(request) });
    return Response.json(attachment, { status: 201 });
  } catch (error) {
    if (error instanceof BodyRefused) apiError(error.status, error.message);
    if (error instanceof StorageUnavailableError) {
      apiError(
        503,
        `The file store is not answering, so this file was not attached. The ${subjectTerms(owner.subject).noun} is saved as it was; try the file again.`,
      );
    }
    throw error;
  }
}

/**
 * The bytes of an attachment (or its thumbnail) streamed from the object store, for a person the
 * route has already checked. Photos open in the browser, documents download; the name in
 * Content-Disposition is escaped so that it cannot add parameters or headers. A file download is audited.
 */
export async function attachmentResponse(
  request: Request,
  user: SessionUser,
  attachment: StoredAttachment,
  part: "file" | "thumbnail",
): Promise<Response> {
  const key = part === "file" ? attachment.storageKey : attachment.thumbnailKey!;
  let stored: Awaited<ReturnType<typeof getObjectStream>>;
  try {
    stored = await getObjectStream(key);
  } catch (error) {
    if (error instanceof StorageUnavailableError) {
      httpError(503, "The file store is not answering right now; please try again in a minute.");
    }
    throw error;
  }
  const contentType = part === "thumbnail" ? "image/webp" : attachment.contentType;
  const image = isAttachmentType(contentType) && ATTACHMENT_TYPES[contentType].image;
  if (part === "file") {
    await recordDownload(request, user, {
      action: "attachment_downloaded",
      entityType: subjectTerms(attachment.owner.subject).entityType,
      entityId: attachment.owner.id,
      summary: `Attachment ${attachment.name} downloaded`,
      details: { attachmentId: attachment.id, key, fileName: attachment.name, sha256: attachment.sha256 },
    });
  }
  const headers = new Headers({
    "Content-Type": contentType,
    "Content-Disposition": contentDisposition(
      image || part === "thumbnail" ? "inline" : "attachment",
      part === "thumbnail" ? `thumbnail-${attachment.id}.webp` : attachment.name,
    ),
    "Cache-Control": "private, no-store",
    "X-Content-Type-Options": "nosniff",
    // Nothing inside a stored file may run as a page of this site.
    "Content-Security-Policy": "default-src 'none'; img-src 'self'; style-src 'unsafe-inline'; sandbox",
  });
  if (stored.byteSize !== null) headers.set("Content-Length", String(stored.byteSize));
  return new Response(stored.body, { headers });
}
