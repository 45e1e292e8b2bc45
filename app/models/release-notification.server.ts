import { recordAudit } from "~/lib/audit.server";
import type { SessionUser } from "~/lib/auth.server";
import { db, type Db } from "~/lib/db.server";
import type { ReleaseNotificationValue } from "~/lib/foam/notification-schema";
import { NOTIFIED_PARTY_LABELS, type NotifiedParty } from "~/lib/foam/vocabulary";
import { instantToWallClock, wallClockToInstant } from "~/lib/time-zone";
import { readAgencySettings } from "./agency-settings.server";

export type ReleaseNotification = {
  id: number;
  party: NotifiedParty;
  partyLabel: string;
  partyDetail: string;
  /** Wall-clock time in the agency's time zone. */
  notifiedAt: string;
  notifiedAtInstant: Date;
  notifiedBy: string;
  caseNumber: string;
  notes: string;
};

/** The notifications recorded for an event, oldest first. */
export async function listReleaseNotifications(eventId: number, connection: Db = db): Promise<ReleaseNotification[]> {
  const { timeZone } = await readAgencySettings(connection);
  const rows = await connection("release_notifications").where({ event_id: eventId }).orderBy(["notified_at", "id"]);
  return rows.map((row) => ({
    id: row.id,
    party: row.party,
    partyLabel: NOTIFIED_PARTY_LABELS[row.party as NotifiedParty] ?? row.party,
    partyDetail: row.party_detail ?? "",
    notifiedAt: instantToWallClock(row.notified_at, timeZone) ?? "",
    notifiedAtInstant: row.notified_at,
    notifiedBy: row.notified_by,
    caseNumber: row.case_number ?? "",
    notes: row.notes ?? "",
  }));
}

/** Records a notification with its audit row in one transaction; returns its id. */
export async function recordReleaseNotification(input: {
  eventId: number;
  value: ReleaseNotificationValue;
  user: SessionUser;
  clientAddress?: string | null;
}): Promise<number> {
  return db.transaction(async (trx) => {
    const { timeZone } = await readAgencySettings(trx);
    const columns = {
      event_id: input.eventId,
      party: input.value.party,
      party_detail: input.value.partyDetail ?? "",
      notified_at: wallClockToInstant(input.value.notifiedAt, timeZone),
      notified_by: input.value.notifiedBy,
      case_number: input.value.caseNumber ?? "",
      notes: input.value.notes || null,
      recorded_by: input.user.id,
    };
    const [id] = await trx("release_notifications").insert(columns);
    await recordAudit(
      {
        actorUserId: input.user.id,
        actorLabel: input.user.email,
        action: "release_notification_recorded",
        entityType: "event",
        entityId: input.eventId,
        summary: `${NOTIFIED_PARTY_LABELS[input.value.party]}${input.value.caseNumber ? `, case ${input.value.caseNumber}` : ""}`,
        after: { ...columns, notified_at: columns.notified_at?.toISOString() ?? null },
        clientAddress: input.clientAddress ?? null,
      },
      trx,
    );
    return id;
  });
}
