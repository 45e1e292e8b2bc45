import { pruneToShape, shapeOfSchemas } from "../form-data.server";
import { FORM_BODY_MAX_BYTES } from "../request-limits";
import { REPORT_FORM_SCHEMAS } from "./report-schema";

/**
 * A stored draft holds at most what the report form may send: its keys, at most 200 discharges,
 * 12 runoff lines and 20 tank readings, no over-long text. JSON may spell a form's text at up to
 * twice its size (escapes), hence the byte bound.
 */
export const DRAFT_MAX_BYTES = 2 * FORM_BODY_MAX_BYTES;

const draftShape = () => shapeOfSchemas(REPORT_FORM_SCHEMAS);

/** The typed payload cut to the report form's shape, as it is stored. */
export function boundedDraft(payload: unknown): Record<string, unknown> {
  const pruned = pruneToShape(payload, draftShape());
  return pruned && typeof pruned === "object" ? (pruned as Record<string, unknown>) : {};
}

/** A stored draft as the edit page reads it; one past the bounds is read only as far as they allow. */
export function readStoredDraft(
  json: string | null | undefined,
  bytes?: number | null,
): Record<string, unknown> | null {
  if (!json || (bytes ?? json.length) > DRAFT_MAX_BYTES) return null;
  try {
    return boundedDraft(JSON.parse(json));
  } catch {
    return null;
  }
}
