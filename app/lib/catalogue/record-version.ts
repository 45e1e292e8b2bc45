/**
 * Optimistic concurrency for catalogue records (foam products, apparatus, stations, foam systems): every edit form
 * carries the `version` it was opened with; the save compares it with the stored row inside its
 * transaction and refuses a stale one instead of overwriting someone else's change.
 */

/** The version an edit form was opened with, or null when it is missing or not a whole number. */
export function submittedVersion(formData: FormData): number | null {
  const value = formData.get("version");
  if (typeof value !== "string" || !/^\d{1,9}$/.test(value.trim())) return null;
  const version = Number(value);
  return version > 0 ? version : null;
}

/** Thrown inside a save transaction when the stored record changed since the form was opened. */
export class StaleRecordError extends Error {
  constructor(
    readonly storedVersion: number,
    readonly submittedVersion: number | null,
  ) {
    super(`stored version ${storedVersion}, form version ${submittedVersion ?? "missing"}`);
  }
}

/** `changedBy`: what else than an edit moves the record's version, said after "someone saved it". */
export function staleRecordMessage(what: string, changedBy?: string): string {
  const who = changedBy
    ? `This ${what} changed after you opened it (someone saved it, or ${changedBy})`
    : `Someone else saved this ${what} after you opened it`;
  return (
    `${who}, so your changes were not saved. ` +
    "What you typed is still below: note what you need, reload the page to see the saved version, then make your changes again."
  );
}

/**
 * The version a form should carry: the one it was first opened with, kept through a refused save
 * (`result` is the action's conform reply, whose `initialValue` holds what was sent).
 */
export function formVersion(result: unknown, loaded: number): string {
  const initialValue = (result as { initialValue?: Record<string, unknown> | null } | null | undefined)?.initialValue;
  const kept = initialValue?.version;
  return typeof kept === "string" && kept !== "" ? kept : String(loaded);
}
