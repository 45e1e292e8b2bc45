import { recordAudit } from "~/lib/audit.server";
import type { SessionUser } from "~/lib/auth.server";
import { decimalOrNull, decimalOrZero } from "~/lib/decimal";
import { db, type Db } from "~/lib/db.server";
import { gramsToPoundsMass, pfasGrams } from "~/lib/foam/pfas";
import type { ReleaseNotificationValue } from "~/lib/foam/notification-schema";
import {
  DISPOSITIONS_TO_WATER,
  isPfasContentUnit,
  NOTIFIED_PARTY_LABELS,
  type Disposition,
  type NotifiedParty,
} from "~/lib/foam/vocabulary";
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

/**
 * Why this filed report's release needs a notification record, or null: runoff to a storm drain or
 * surface water, or PFAS-containing foam whose PFOA or PFOS alone reaches the agency's threshold
 * (default 1 lb, 40 CFR 302.4) or whose content is not known (mixture rule, 40 CFR 302.6(b)(1)(ii)).
 */
export async function notificationReason(eventId: number, connection: Db = db): Promise<string | null> {
  const toWater = await connection("runoff_dispositions")
    .where({ event_id: eventId })
    .whereIn("disposition", DISPOSITIONS_TO_WATER as Disposition[])
    .first("id");
  const pfasLines: Record<string, unknown>[] = await connection("discharges as d")
    .join("foam_products as p", "p.id", "d.product_id")
    .where({ "d.event_id": eventId, "p.pfas_containing": true })
    .groupBy("p.id")
    .select("p.pfoa_content", "p.pfoa_content_unit", "p.pfos_content", "p.pfos_content_unit")
    .sum({ concentrate: "d.concentrate_gal", solution: "d.solution_gal" });
  const { pfasReportableLb } = await readAgencySettings(connection);
  let unknown = false;
  let reached = false;
  for (const substance of ["pfoa", "pfos"] as const) {
    let pounds = 0;
    for (const line of pfasLines) {
      const content = decimalOrNull(line[`${substance}_content`]);
      const unit = line[`${substance}_content_unit`];
      if (content === null || !isPfasContentUnit(unit)) {
        unknown = true;
        continue;
      }
      const volumes = { concentrateGal: decimalOrZero(line.concentrate), solutionGal: decimalOrZero(line.solution) };
      pounds += gramsToPoundsMass(pfasGrams(volumes, content, unit));
    }
    if (pounds >= pfasReportableLb) reached = true;
  }
  const reasons = [
    reached ? "its PFOA or PFOS reaches the reportable quantity" : "",
    !reached && unknown ? "whether its PFOA or PFOS reaches the reportable quantity is unknown" : "",
    toWater ? "runoff reached a storm drain or surface water" : "",
  ].filter(Boolean);
  return reasons.length ? reasons.join(" and ") : null;
}
