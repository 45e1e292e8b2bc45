/**
 * How large a request body may be, by route. The production server (`scripts/serve.js`) refuses a
 * larger declared body with 413 before the app reads a byte; the app's body readers
 * (`form-data.server.ts`) count what they read against the same numbers.
 */

import { ATTACHMENT_MAX_MB_CEILING } from "./agency-settings-form";

const MEGABYTE = 1024 * 1024;

/** A form without files: the largest valid usage report (200 discharges) is about 60 kB. */
export const FORM_BODY_MAX_BYTES = 1 * MEGABYTE;

/** A JSON body for `/api/*`. */
export const JSON_BODY_MAX_BYTES = 1 * MEGABYTE;

/** A safety-sheet PDF (`SAFETY_SHEET_MAX_BYTES`) or a GeoJSON layer (`MAX_LAYER_BYTES`). */
export const UPLOAD_FILE_MAX_BYTES = 10 * MEGABYTE;

/** An upload form: its file plus the form's other fields and the multipart framing. */
export const UPLOAD_BODY_MAX_BYTES = UPLOAD_FILE_MAX_BYTES + 256 * 1024;

/**
 * An attachment upload (`POST /api/events/:id/attachments`, `/api/records-requests/:id/attachments`,
 * `/api/foam-tests/:testId/attachments`, `/api/stock/movements/:movementId/attachments`): the largest file the agency settings
 * can allow plus framing. The route itself refuses a body past the agency's own setting before it
 * reads it, and counts the file's bytes against that setting while it streams.
 */
export const ATTACHMENT_BODY_CEILING_BYTES = ATTACHMENT_MAX_MB_CEILING * MEGABYTE + 256 * 1024;
const ATTACHMENT_PATH = /^\/api\/(events|records-requests|foam-tests|stock\/movements)\/[^/]+\/attachments\/?$/;

/**
 * The pages whose forms carry a file, as the browser posts them (`/geography`, or `/geography.data`
 * when React Router submits in the page); every other route takes at most `FORM_BODY_MAX_BYTES`.
 */
const UPLOAD_PATHS = [/^\/products\/[^/.]+(\.data)?\/?$/, /^\/geography(\.data)?\/?$/];

/** The largest body the server accepts for a path. */
export function requestBodyLimit(pathname: string): number {
  if (ATTACHMENT_PATH.test(pathname)) return ATTACHMENT_BODY_CEILING_BYTES;
  if (UPLOAD_PATHS.some((pattern) => pattern.test(pathname))) return UPLOAD_BODY_MAX_BYTES;
  if (pathname.startsWith("/api/")) return JSON_BODY_MAX_BYTES;
  return FORM_BODY_MAX_BYTES;
}
