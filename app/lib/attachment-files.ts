/**
 * Which files may be attached, told by their content (the bytes), never by their name, and how a
 * stored file's name is given back in a download. Pure and browser-safe.
 */

/** The types an attachment may be, as `file-type` names them, with the extension the stored object gets. */
export const ATTACHMENT_TYPES = {
  "image/jpeg": { extension: "jpg", image: true, label: "JPEG photo" },
  "image/png": { extension: "png", image: true, label: "PNG image" },
  "image/webp": { extension: "webp", image: true, label: "WebP image" },
  "image/heic": { extension: "heic", image: true, label: "HEIC photo" },
  "application/pdf": { extension: "pdf", image: false, label: "PDF document" },
} as const;

export type AttachmentType = keyof typeof ATTACHMENT_TYPES;

export function isAttachmentType(value: string | undefined | null): value is AttachmentType {
  return typeof value === "string" && Object.hasOwn(ATTACHMENT_TYPES, value);
}

/** What the upload field's `accept` lists; the server decides by content all the same. */
export const ATTACHMENT_ACCEPT =
  ".jpg,.jpeg,.png,.webp,.heic,.pdf,image/jpeg,image/png,image/webp,image/heic,application/pdf";

export const ATTACHMENT_TYPES_SENTENCE = "JPEG, PNG, WebP or HEIC photos and PDF documents";

/** The refusal for a file whose content is none of the allowed types, whatever its name says. */
export function refusedTypeMessage(detected: string | null): string {
  const what = detected ? `${detected}, which Foamtally does not keep` : "of no type Foamtally keeps";
  return `This file's content is ${what}, whatever its name says. Attach ${ATTACHMENT_TYPES_SENTENCE}.`;
}

/**
 * A file name fit to show and to offer back: no path, no control characters, at most 255 characters;
 * a name that is left empty becomes `fallback`.
 */
export function displayFileName(name: string, fallback: string): string {
  const base = name.split(/[\\/]/).pop() ?? "";
  // eslint-disable-next-line no-control-regex
  const cleaned = base.replace(/[\u0000-\u001f\u007f"]/g, "").trim();
  return (cleaned || fallback).slice(0, 255);
}

/**
 * A Content-Disposition that a file name cannot abuse (RFC 6266 with RFC 8187's `filename*`): an
 * ASCII fallback of letters, digits, dot, dash and underscore, and the name itself percent-encoded.
 */
export function contentDisposition(disposition: "inline" | "attachment", fileName: string): string {
  const ascii = fileName.replace(/[^A-Za-z0-9._-]+/g, "_").replace(/^\.+/, "_") || "file";
  const encoded = encodeURIComponent(fileName).replace(
    /['()*]/g,
    (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`,
  );
  return `${disposition}; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}

const MEGABYTE = 1024 * 1024;

/** The byte limit of a setting in MB (1 MB = 1,048,576 bytes, as the server's body limits count). */
export function megabytes(mb: number): number {
  return mb * MEGABYTE;
}

/** Bytes as people read them: 512 B, 14.2 kB, 3.4 MB (1 kB = 1,024 bytes, as the limits count). */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < MEGABYTE) return `${(bytes / 1024).toFixed(1)} kB`;
  return `${(bytes / MEGABYTE).toFixed(1)} MB`;
}
