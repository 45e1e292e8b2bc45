/**
 * MariaDB hands DECIMAL columns (and SUMs of them) to Node as strings. Every stored quantity is
 * read back through these two, so that a missing value and a zero are told apart in one place.
 */
export function decimalOrNull(value: unknown): number | null {
  if (value === null || value === undefined || value === "") return null;
  const number = Number(value);
  return Number.isFinite(number) ? number : null;
}

/** A stored quantity, or 0 where there is none (an empty SUM, a line without a volume). */
export function decimalOrZero(value: unknown): number {
  return decimalOrNull(value) ?? 0;
}
