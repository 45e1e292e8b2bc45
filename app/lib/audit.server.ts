import { db, type Db } from "./db.server";

export type AuditEntry = {
  actorUserId?: number | null;
  actorLabel?: string | null;
  action: string;
  entityType: string;
  entityId?: string | number | null;
  summary?: string;
  before?: unknown;
  after?: unknown;
  clientAddress?: string | null;
};

/** Appends one row to the audit log; pass the transaction so the row lands with the change or not at all. */
export async function recordAudit(entry: AuditEntry, connection: Db = db): Promise<void> {
  await connection("audit_events").insert({
    actor_user_id: entry.actorUserId ?? null,
    actor_label: entry.actorLabel ?? null,
    action: entry.action,
    entity_type: entry.entityType,
    entity_id: entry.entityId == null ? null : String(entry.entityId),
    summary: entry.summary ?? null,
    before_json: entry.before === undefined ? null : JSON.stringify(entry.before),
    after_json: entry.after === undefined ? null : JSON.stringify(entry.after),
    client_address: entry.clientAddress ?? null,
  });
}
