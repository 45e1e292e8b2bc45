/**
 * One CSV record (RFC 4180: comma-separated, CRLF, fields with commas, quotes or line breaks quoted).
 * Text that a spreadsheet would run as a formula is prefixed with an apostrophe.
 */
export function csvLine(values: Array<string | number | boolean | null | undefined>): string {
  return values.map(csvField).join(",") + "\r\n";
}

export function csvField(value: string | number | boolean | null | undefined): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  if (typeof value === "boolean") return value ? "true" : "false";
  let text = value;
  if (/^[=+@\t\r]/.test(text) || (/^-/.test(text) && !/^-\d+(\.\d+)?$/.test(text))) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}
