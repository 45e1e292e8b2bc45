/**
 * The unsaved copy of a usage report kept in the browser, so that typing survives a dropped
 * connection, a reload or Back. The copy is the form serialized as it stands (every named field,
 * whatever fields the form has), kept in localStorage under the signed-in person's id and the
 * report's id ("new" for a report not yet saved). Pure apart from the `Storage` it is handed.
 */
import { z } from "zod";

/** Every key of a copy starts with this; sign-out removes every key that does. */
export const UNSAVED_COPY_PREFIX = "foamtally:report-copy:v1:";

/** Announced on `window` when someone signs out: forms stop keeping copies until typed in again. */
export const SIGNING_OUT_EVENT = "foamtally:signing-out";

/** Fields the server sets for each page load: never restored from a copy. */
const NOT_KEPT = new Set(["submissionKey", "version", "intent", "__intent__"]);

/** A copy older than this is no longer offered (a shift and a few days off, common practice, no source). */
export const UNSAVED_COPY_MAX_AGE_MS = 14 * 24 * 60 * 60 * 1000;

export type FieldEntries = Array<[name: string, value: string]>;

export type UnsavedCopy = {
  /** When the copy was last written, as an ISO instant. */
  savedAt: string;
  /** The report's version the typing started from, when it had one. */
  baseVersion: number | null;
  entries: FieldEntries;
};

const UnsavedCopySchema = z.object({
  savedAt: z.iso.datetime(),
  baseVersion: z.number().int().positive().nullable(),
  entries: z.array(z.tuple([z.string().max(200), z.string().max(20_000)])).max(5_000),
});

/** The storage key of one person's copy of one report. */
export function unsavedCopyKey(userId: number, reportId: number | "new"): string {
  return `${UNSAVED_COPY_PREFIX}${userId}:${reportId}`;
}

/** The form's named fields as name/value pairs, without what the server sets per page and without files. */
export function fieldEntriesOf(formData: Iterable<[string, FormDataEntryValue]>): FieldEntries {
  const entries: FieldEntries = [];
  for (const [name, value] of formData) {
    if (typeof value !== "string" || NOT_KEPT.has(name)) continue;
    entries.push([name, value]);
  }
  return entries;
}

/** Whether two serializations hold the same values, field by field, in any order. */
export function sameEntries(a: FieldEntries, b: FieldEntries): boolean {
  if (a.length !== b.length) return false;
  const key = (entries: FieldEntries) =>
    entries
      .map(([name, value]) => JSON.stringify([name, value]))
      .sort()
      .join("\n");
  return key(a) === key(b);
}

/** The copy under `key`, or null when there is none, it cannot be read, or it is too old. */
export function readUnsavedCopy(storage: Storage, key: string, now = new Date()): UnsavedCopy | null {
  let raw: string | null;
  try {
    raw = storage.getItem(key);
  } catch {
    return null;
  }
  if (!raw) return null;
  let parsed: unknown;
  try {
    parsed = JSON.parse(raw);
  } catch {
    return null;
  }
  const copy = UnsavedCopySchema.safeParse(parsed);
  if (!copy.success) return null;
  if (now.getTime() - Date.parse(copy.data.savedAt) > UNSAVED_COPY_MAX_AGE_MS) return null;
  return copy.data as UnsavedCopy;
}

/** Keeps the copy; false when the browser refuses (storage full or turned off). */
export function writeUnsavedCopy(storage: Storage, key: string, copy: UnsavedCopy): boolean {
  try {
    storage.setItem(key, JSON.stringify(copy));
    return true;
  } catch {
    return false;
  }
}

export function clearUnsavedCopy(storage: Storage, key: string): void {
  try {
    storage.removeItem(key);
  } catch {
    // Storage turned off: there is nothing to remove.
  }
}

/** Removes every report copy on this browser, whoever kept it (on sign-out). */
export function clearAllUnsavedCopies(storage: Storage): void {
  try {
    const keys: string[] = [];
    for (let index = 0; index < storage.length; index += 1) {
      const key = storage.key(index);
      if (key?.startsWith(UNSAVED_COPY_PREFIX)) keys.push(key);
    }
    for (const key of keys) storage.removeItem(key);
  } catch {
    // Storage turned off: there is nothing to remove.
  }
}
