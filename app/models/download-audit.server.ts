import { createHash } from "node:crypto";
import { recordAudit } from "~/lib/audit.server";
import type { SessionUser } from "~/lib/auth.server";
import { clientAddress } from "~/lib/http.server";

/** What left the building: each kind of export, download or outbox action has its own audit action. */
export type DownloadAction =
  | "quarterly_workbook_downloaded"
  | "quarterly_csv_downloaded"
  | "submission_downloaded"
  | "safety_sheet_downloaded"
  | "attachment_downloaded"
  | "layer_file_downloaded"
  | "events_csv_downloaded"
  | "outbox_mail_retried"
  | "outbox_mail_discarded"
  | "outbox_delivery_run";

export type DownloadRecord = {
  action: DownloadAction;
  entityType: string;
  entityId?: string | number | null;
  summary: string;
  /** What was handed out: period, file name, digest, filters… */
  details?: Record<string, unknown>;
};

/** One audit row for a file or export someone took, or an outbox action someone ran: who, what, and its digest. */
export async function recordDownload(request: Request, user: SessionUser, record: DownloadRecord): Promise<void> {
  await recordAudit({
    actorUserId: user.id,
    actorLabel: user.email,
    action: record.action,
    entityType: record.entityType,
    entityId: record.entityId ?? null,
    summary: record.summary,
    after: record.details,
    clientAddress: clientAddress(request),
  });
}

export function sha256Hex(body: Uint8Array): string {
  return createHash("sha256").update(body).digest("hex");
}
