import { createHash } from "node:crypto";
import { db, type Db } from "~/lib/db.server";

/** Files kept in every version: a GeoJSON layer (by kind) and a product's safety sheet (by product id). */
export type FileSubject = "geo_layer" | "safety_sheet";

export type StoredFile = {
  key: string;
  fileName: string;
  contentType: string;
  byteSize: number | null;
  sha256: string | null;
};

export type FileVersion = StoredFile & {
  id: number;
  uploadedAt: string;
  uploadedBy: string | null;
  replacedAt: string | null;
};

export function describeFile(key: string, fileName: string, contentType: string, body: Uint8Array): StoredFile {
  return {
    key,
    fileName: fileName.slice(0, 255),
    contentType,
    byteSize: body.byteLength,
    sha256: createHash("sha256").update(body).digest("hex"),
  };
}

function versionOf(row: Record<string, unknown>): FileVersion {
  return {
    id: Number(row.id),
    key: row.storage_key as string,
    fileName: row.file_name as string,
    contentType: row.content_type as string,
    byteSize: row.byte_size == null ? null : Number(row.byte_size),
    sha256: (row.sha256 as string | null) ?? null,
    uploadedAt: new Date(row.uploaded_at as string).toISOString(),
    uploadedBy: (row.uploader as string | null) ?? null,
    replacedAt: row.replaced_at ? new Date(row.replaced_at as string).toISOString() : null,
  };
}

function versions(subject: FileSubject, subjectId: string, connection: Db) {
  return connection("file_versions")
    .leftJoin("users", "users.id", "file_versions.uploaded_by")
    .where({ subject, subject_id: subjectId })
    .select("file_versions.*", "users.name as uploader");
}

/**
 * Records `file` as the current version and marks the one before it replaced, inside the caller's
 * transaction. `untracked` names a file that was current before versions were kept (a seeded layer, an
 * older sheet): it is recorded as the replaced version so that it is listed too. Returns the file replaced.
 */
export async function recordNewVersion(
  subject: FileSubject,
  subjectId: string,
  file: StoredFile,
  uploadedBy: number | null,
  trx: Db,
  untracked: (() => Promise<StoredFile | null>) | null = null,
): Promise<StoredFile | null> {
  const current = await trx("file_versions")
    .where({ subject, subject_id: subjectId })
    .whereNull("replaced_at")
    .forUpdate()
    .first();
  let previous: StoredFile | null = current ? versionOf(current) : null;
  if (current) {
    await trx("file_versions")
      .where({ id: current.id })
      .update({ replaced_at: trx.fn.now(3) });
  } else if (untracked) {
    previous = await untracked();
    if (previous) {
      await trx("file_versions").insert({
        subject,
        subject_id: subjectId,
        ...columnsOf(previous),
        uploaded_by: null,
        replaced_at: trx.fn.now(3),
      });
    }
  }
  await trx("file_versions").insert({ subject, subject_id: subjectId, ...columnsOf(file), uploaded_by: uploadedBy });
  return previous;
}

function columnsOf(file: StoredFile) {
  return {
    storage_key: file.key,
    file_name: file.fileName.slice(0, 255),
    content_type: file.contentType,
    byte_size: file.byteSize,
    sha256: file.sha256,
  };
}

/** The replaced versions, newest first. */
export async function earlierVersions(subject: FileSubject, subjectId: string): Promise<FileVersion[]> {
  const rows = await versions(subject, subjectId, db)
    .whereNotNull("file_versions.replaced_at")
    .orderBy("file_versions.id", "desc");
  return rows.map(versionOf);
}

export async function findVersion(subject: FileSubject, subjectId: string, id: number): Promise<FileVersion | null> {
  const row = await versions(subject, subjectId, db).where("file_versions.id", id).first();
  return row ? versionOf(row) : null;
}
