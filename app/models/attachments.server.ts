import { randomUUID } from "node:crypto";
import type { ReportRecord } from "~/lib/access";
import { prepareFile, RefusedFileError, type PhotoPosition, type PreparedFile } from "~/lib/attachment-content.server";
import { displayFileName, megabytes } from "~/lib/attachment-files";
import { recordAudit } from "~/lib/audit.server";
import type { SessionUser } from "~/lib/auth.server";
import { decimalOrNull } from "~/lib/decimal";
import { db } from "~/lib/db.server";
import { ATTACHMENT_KINDS, type AttachmentKind } from "~/lib/foam/vocabulary";
import { BodyRefused } from "~/lib/form-data.server";
import { receiveUpload, refuseEarly, type UploadLimits } from "~/lib/multipart-upload.server";
import { deleteObject, deleteObjectQuietly, listObjects, putObject, putObjectFile } from "~/lib/storage.server";
import { readAgencySettings, type AgencySettings } from "./agency-settings.server";
import { reportAccessRecord } from "./event-read.server";

/**
 * Files attached to events and to public-records requests: received as a stream, checked by content, photos stored without their
 * metadata and with a thumbnail, the object written before the row that names it, removal audited
 * and the object kept until the retention setting lets it go.
 */

/**
 * What a file is attached to: a usage report (event), a public-records request, a proportioner
 * accuracy test (its printouts) or a stock movement of kind `disposed` (the hauler's manifest).
 */
export const ATTACHMENT_SUBJECTS = ["event", "records_request", "foam_test", "stock_movement"] as const;
export type AttachmentSubject = (typeof ATTACHMENT_SUBJECTS)[number];
export type AttachmentOwner = { subject: AttachmentSubject; id: number };

/**
 * Per subject: the start of its objects' keys, the audit entity, where a file is served, the word
 * for the owner in messages, and the kinds of file it takes (the first is the default when the
 * subject takes one kind only).
 */
const SUBJECTS: Record<
  AttachmentSubject,
  {
    keyPrefix: string;
    entityType: string;
    noun: string;
    kinds: readonly AttachmentKind[];
    url: (ownerId: number, attachmentId: number) => string;
  }
> = {
  event: {
    keyPrefix: "event",
    entityType: "event",
    noun: "report",
    kinds: ATTACHMENT_KINDS,
    url: (_owner, id) => `/attachments/${id}`,
  },
  records_request: {
    keyPrefix: "records-request",
    entityType: "records_request",
    noun: "request",
    kinds: ATTACHMENT_KINDS,
    url: (owner, id) => `/records/${owner}/attachments/${id}`,
  },
  foam_test: {
    keyPrefix: "foam-test",
    entityType: "foam_accuracy_test",
    noun: "test",
    kinds: ["test_printout"],
    url: (owner, id) => `/foam-tests/${owner}/attachments/${id}`,
  },
  stock_movement: {
    keyPrefix: "stock-movement",
    entityType: "stock_movement",
    noun: "movement",
    kinds: ["disposal_manifest"],
    url: (owner, id) => `/stock/movements/${owner}/attachments/${id}`,
  },
};

/** The kinds of file an owner takes, and the word for it in messages. */
export function subjectTerms(subject: AttachmentSubject): {
  noun: string;
  kinds: readonly AttachmentKind[];
  entityType: string;
} {
  const { noun, kinds, entityType } = SUBJECTS[subject];
  return { noun, kinds, entityType };
}

export type AttachmentView = {
  id: number;
  kind: AttachmentKind;
  name: string;
  contentType: string;
  size: number;
  url: string;
  thumbnailUrl: string | null;
  /** Where `intent=remove` is posted (the file's own address). */
  removeUrl: string;
  uploadedAt: string;
  uploadedBy: string | null;
  /** The photo's own position, kept only when the officer chose to use it. */
  position: PhotoPosition | null;
};

export type StoredAttachment = AttachmentView & {
  owner: AttachmentOwner;
  storageKey: string;
  thumbnailKey: string | null;
  sha256: string;
  removedAt: string | null;
};

function storedOf(row: Record<string, unknown>): StoredAttachment {
  const id = Number(row.id);
  const owner = { subject: row.subject as AttachmentSubject, id: Number(row.subject_id) };
  const url = SUBJECTS[owner.subject].url(owner.id, id);
  const latitude = decimalOrNull(row.photo_latitude);
  const longitude = decimalOrNull(row.photo_longitude);
  return {
    id,
    kind: row.kind as AttachmentKind,
    name: row.file_name as string,
    contentType: row.content_type as string,
    size: Number(row.byte_size),
    url,
    thumbnailUrl: row.thumbnail_key ? `${url}/thumbnail` : null,
    removeUrl: url,
    uploadedAt: new Date(row.uploaded_at as string).toISOString(),
    uploadedBy: (row.uploader as string | null) ?? null,
    position: latitude !== null && longitude !== null ? { latitude, longitude } : null,
    owner,
    storageKey: row.storage_key as string,
    thumbnailKey: (row.thumbnail_key as string | null) ?? null,
    sha256: row.sha256 as string,
    removedAt: row.removed_at ? new Date(row.removed_at as string).toISOString() : null,
  };
}

export function viewOf(attachment: StoredAttachment): AttachmentView {
  const { id, kind, name, contentType, size, url, thumbnailUrl, removeUrl, uploadedAt, uploadedBy, position } =
    attachment;
  return { id, kind, name, contentType, size, url, thumbnailUrl, removeUrl, uploadedAt, uploadedBy, position };
}

function attachmentsQuery() {
  return db("attachments")
    .leftJoin("users", "users.id", "attachments.uploaded_by")
    .select("attachments.*", "users.name as uploader");
}

/** The attachments an event or request shows, oldest first; removed ones are left out. */
export async function listAttachments(owner: AttachmentOwner): Promise<AttachmentView[]> {
  const rows = await attachmentsQuery()
    .where({ "attachments.subject": owner.subject, "attachments.subject_id": owner.id })
    .whereNull("attachments.removed_at")
    .orderBy("attachments.id");
  return rows.map((row) => viewOf(storedOf(row)));
}

/** The attachments of several owners of one subject at once (for a list page), by owner id. */
export async function listAttachmentsOf(
  subject: AttachmentSubject,
  ids: number[],
): Promise<Map<number, AttachmentView[]>> {
  const byOwner = new Map<number, AttachmentView[]>();
  if (ids.length === 0) return byOwner;
  const rows = await attachmentsQuery()
    .where("attachments.subject", subject)
    .whereIn("attachments.subject_id", ids)
    .whereNull("attachments.removed_at")
    .orderBy("attachments.id");
  for (const row of rows) {
    const stored = storedOf(row);
    byOwner.set(stored.owner.id, [...(byOwner.get(stored.owner.id) ?? []), viewOf(stored)]);
  }
  return byOwner;
}

async function findOf(owner: Partial<AttachmentOwner> & { subject: AttachmentSubject }, id: number) {
  const row = await attachmentsQuery()
    .where({ "attachments.id": id, "attachments.subject": owner.subject })
    .modify((query) => {
      if (owner.id !== undefined) query.where("attachments.subject_id", owner.id);
    })
    .whereNull("attachments.removed_at")
    .first();
  return row ? storedOf(row) : null;
}

/** One event's attachment that is not removed, with its event's access record; null when there is none. */
export async function findEventAttachment(
  id: number,
): Promise<{ attachment: StoredAttachment; report: ReportRecord } | null> {
  const attachment = await findOf({ subject: "event" }, id);
  const report = attachment ? await reportAccessRecord(attachment.owner.id) : null;
  return attachment && report ? { attachment, report } : null;
}

/** One attachment of the given records request that is not removed, or null. */
export function findRequestAttachment(requestId: number, id: number): Promise<StoredAttachment | null> {
  return findOf({ subject: "records_request", id: requestId }, id);
}

/** One attachment of the given owner that is not removed, or null. */
export function findOwnedAttachment(owner: AttachmentOwner, id: number): Promise<StoredAttachment | null> {
  return findOf(owner, id);
}

export type AttachmentLimits = {
  maxFileBytes: number;
  limitLabel: string;
  perEvent: number;
};

export function attachmentLimits(settings: Pick<AgencySettings, "attachmentMaxMb" | "attachmentsPerEvent">) {
  return {
    maxFileBytes: megabytes(settings.attachmentMaxMb),
    limitLabel: `${settings.attachmentMaxMb} MB`,
    perEvent: settings.attachmentsPerEvent,
  } satisfies AttachmentLimits;
}

async function activeCount(owner: AttachmentOwner): Promise<number> {
  const [row] = await db("attachments")
    .where({ subject: owner.subject, subject_id: owner.id })
    .whereNull("removed_at")
    .count({ n: "*" });
  return Number(row.n);
}

/** The keys of a stored attachment and its thumbnail: made here, from its owner and a random id. */
export function attachmentKeys(owner: AttachmentOwner, file: Pick<PreparedFile, "extension" | "thumbnail">) {
  const prefix = `attachments/${SUBJECTS[owner.subject].keyPrefix}-${owner.id}/${randomUUID()}`;
  return {
    storageKey: `${prefix}.${file.extension}`,
    thumbnailKey: file.thumbnail ? `${prefix}-thumbnail.webp` : null,
  };
}

function kindOf(subject: AttachmentSubject, value: string | undefined, image: boolean): AttachmentKind {
  const { kinds } = SUBJECTS[subject];
  if (value === undefined || value === "") {
    if (kinds.length === 1) return kinds[0];
    return image ? "photo" : "other";
  }
  if ((kinds as readonly string[]).includes(value)) return value as AttachmentKind;
  throw new BodyRefused(400, `The kind must be one of: ${kinds.join(", ")}.`);
}

export type AddAttachmentOptions = { clientAddress?: string | null };

/**
 * Receives one file (field `file`, optional `kind` and `usePosition`) for an event: refused early
 * with the limit when it is too large or the event is full (413), refused by its content when it is
 * none of the allowed types (400). The stored object (and thumbnail) is written first; the row and
 * its audit entry follow in one transaction, and a failed save removes the objects again. Throws
 * `BodyRefused` for a refused file and `StorageUnavailableError` when the object store is down.
 */
export async function addAttachment(
  request: Request,
  owner: AttachmentOwner,
  actor: SessionUser,
  options: AddAttachmentOptions = {},
): Promise<AttachmentView> {
  const limits = attachmentLimits(await readAgencySettings());
  const uploadLimits: UploadLimits = {
    fileField: "file",
    maxFileBytes: limits.maxFileBytes,
    limitLabel: limits.limitLabel,
    fields: ["kind", "usePosition"],
  };
  refuseEarly(request, uploadLimits);
  if ((await activeCount(owner)) >= limits.perEvent) {
    throw new BodyRefused(
      413,
      `This ${SUBJECTS[owner.subject].noun} already has ${limits.perEvent} files, the most the agency settings allow. Remove one first.`,
    );
  }
  const upload = await receiveUpload(request, uploadLimits);
  const stored: string[] = [];
  let prepared: PreparedFile | null = null;
  try {
    try {
      prepared = await prepareFile(upload.file.path, {
        usePosition: upload.fields.usePosition === "true" || upload.fields.usePosition === "on",
      });
    } catch (error) {
      if (error instanceof RefusedFileError) throw new BodyRefused(400, error.message);
      throw error;
    }
    const { contentType, byteSize, sha256, thumbnail, position } = prepared;
    const kind = kindOf(owner.subject, upload.fields.kind, prepared.image);
    const { storageKey, thumbnailKey } = attachmentKeys(owner, prepared);
    const name = displayFileName(upload.file.name, `attachment.${prepared.extension}`);

    await putObjectFile(storageKey, prepared.path, byteSize, contentType);
    stored.push(storageKey);
    if (thumbnail && thumbnailKey) {
      await putObject(thumbnailKey, thumbnail, "image/webp");
      stored.push(thumbnailKey);
    }
    const rowId = await db.transaction(async (trx) => {
      const [insertedId] = await trx("attachments").insert({
        subject: owner.subject,
        subject_id: owner.id,
        kind,
        file_name: name,
        content_type: contentType,
        byte_size: byteSize,
        sha256,
        storage_key: storageKey,
        thumbnail_key: thumbnailKey,
        photo_latitude: position?.latitude ?? null,
        photo_longitude: position?.longitude ?? null,
        uploaded_by: actor.id,
      });
      await recordAudit(
        {
          actorUserId: actor.id,
          actorLabel: actor.email,
          action: "attachment_added",
          entityType: SUBJECTS[owner.subject].entityType,
          entityId: owner.id,
          summary: `Attached ${name}`,
          after: { attachmentId: insertedId, kind, name, contentType, byteSize, sha256, storageKey, position },
          clientAddress: options.clientAddress ?? null,
        },
        trx,
      );
      return insertedId as number;
    });
    stored.length = 0;
    const row = await attachmentsQuery().where("attachments.id", rowId).first();
    return viewOf(storedOf(row));
  } finally {
    await Promise.all(stored.map((key) => deleteObjectQuietly(key)));
    await upload.discard();
    await prepared?.discard();
  }
}

/**
 * Removes an attachment from its event, audited: the row is marked removed and the object stays in
 * the store until the retention setting allows `purgeRemovedAttachments` to delete it.
 */
export async function removeAttachment(
  attachment: StoredAttachment,
  actor: SessionUser,
  clientAddress: string | null = null,
): Promise<boolean> {
  return db.transaction(async (trx) => {
    const changed = await trx("attachments")
      .where({ id: attachment.id })
      .whereNull("removed_at")
      .update({ removed_at: trx.fn.now(3), removed_by: actor.id });
    if (changed === 0) return false;
    await recordAudit(
      {
        actorUserId: actor.id,
        actorLabel: actor.email,
        action: "attachment_removed",
        entityType: SUBJECTS[attachment.owner.subject].entityType,
        entityId: attachment.owner.id,
        summary: `Removed ${attachment.name}`,
        before: {
          attachmentId: attachment.id,
          kind: attachment.kind,
          name: attachment.name,
          sha256: attachment.sha256,
          storageKey: attachment.storageKey,
        },
        clientAddress,
      },
      trx,
    );
    return true;
  });
}

/**
 * Deletes the objects of attachments removed longer ago than the retention setting, and marks them
 * purged. An object the store will not delete keeps its row unpurged for the next run.
 */
export async function purgeRemovedAttachments(now = new Date()): Promise<{ purged: number; failed: number }> {
  const { attachmentRetentionDays } = await readAgencySettings();
  const before = new Date(now.getTime() - attachmentRetentionDays * 86_400_000);
  const rows = await db("attachments")
    .whereNotNull("removed_at")
    .whereNull("purged_at")
    .where("removed_at", "<", before);
  let purged = 0;
  let failed = 0;
  for (const row of rows) {
    try {
      await deleteObject(row.storage_key);
      if (row.thumbnail_key) await deleteObject(row.thumbnail_key);
    } catch {
      failed += 1;
      continue;
    }
    await db.transaction(async (trx) => {
      await trx("attachments")
        .where({ id: row.id })
        .update({ purged_at: trx.fn.now(3) });
      await recordAudit(
        {
          action: "attachment_purged",
          entityType: SUBJECTS[row.subject as AttachmentSubject].entityType,
          entityId: row.subject_id,
          summary: `File of removed attachment ${row.file_name} deleted after ${attachmentRetentionDays} days`,
          before: { attachmentId: row.id, storageKey: row.storage_key, sha256: row.sha256 },
        },
        trx,
      );
    });
    purged += 1;
  }
  return { purged, failed };
}

/** Every object key a row names: attachments (and thumbnails), safety sheets, layers, submissions, packages. */
export async function referencedObjectKeys(): Promise<Set<string>> {
  const keys = new Set<string>();
  const add = (values: unknown[]) => values.forEach((value) => typeof value === "string" && keys.add(value));
  add(await db("attachments").whereNull("purged_at").pluck("storage_key"));
  add(await db("attachments").whereNull("purged_at").whereNotNull("thumbnail_key").pluck("thumbnail_key"));
  add(await db("file_versions").pluck("storage_key"));
  add(await db("foam_products").whereNotNull("safety_sheet_key").pluck("safety_sheet_key"));
  add(await db("quarterly_submissions").whereNotNull("storage_key").pluck("storage_key"));
  add(await db("records_package_files").pluck("storage_key"));
  return keys;
}

/**
 * Objects in the store that no row names and that were stored before `storedBefore`: left by a save
 * that failed after its object was written (objects are written before their rows, so a young object
 * may belong to a save still running).
 */
export async function findOrphanObjects(storedBefore: Date): Promise<{ key: string; storedAt: Date | null }[]> {
  const referenced = await referencedObjectKeys();
  const orphans: { key: string; storedAt: Date | null }[] = [];
  for await (const object of listObjects("")) {
    if (referenced.has(object.key)) continue;
    if (object.storedAt && object.storedAt >= storedBefore) continue;
    orphans.push(object);
  }
  return orphans;
}
