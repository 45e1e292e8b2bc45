/**
 * Record ids as they appear in addresses (`/events/12`) and forms: digits only, no sign, no leading
 * zero, no exponent or hex, within the id columns' type. Anything else names no record, so it is a
 * 404 before any query is made.
 */

/** The largest INT UNSIGNED, the type of every `increments` id column (MariaDB numeric types). */
export const MAX_RECORD_ID = 4_294_967_295;

export function recordIdOf(value: unknown): number | null {
  if (typeof value !== "string" || !/^[1-9]\d{0,9}$/.test(value)) return null;
  const id = Number(value);
  return id <= MAX_RECORD_ID ? id : null;
}
