import { createHash } from "node:crypto";
import type { Knex } from "knex";
import {
  DEFAULT_CLASS_A_ACCURACY_SHARE,
  DEFAULT_DRAWDOWN_TOLERANCE_SHARE,
  DEFAULT_PFAS_REPORTABLE_LB,
  DEFAULT_WATERWAY_BUFFER_M,
  splitRecipientList,
  type AgencySettings,
  type AgencySettingsInput,
} from "~/lib/agency-settings-form";
import { recordAudit } from "~/lib/audit.server";
import { db, type Db } from "~/lib/db.server";
import { recomputeAllEventGeography } from "./geography.server";

export const DEFAULT_TIME_ZONE = "America/Chicago";

/** The agency's time zone, in which people type and read times. */
export async function agencyTimeZone(connection: Db = db): Promise<string> {
  const row = await connection("agency_settings").where({ id: 1 }).first("time_zone");
  return row?.time_zone || DEFAULT_TIME_ZONE;
}

type SettingsRow = Record<string, unknown> | undefined;

// The row as stored, so that any change by anyone (values or updated_at) gives a new version.
function versionOf(row: SettingsRow): string {
  if (!row) return "none";
  const canonical = Object.keys(row)
    .sort()
    .map((key) => [key, row[key] instanceof Date ? (row[key] as Date).toISOString() : String(row[key])]);
  return createHash("sha256").update(JSON.stringify(canonical)).digest("hex").slice(0, 24);
}

function settingsFrom(row: SettingsRow): AgencySettings {
  const number = (value: unknown, fallback: number) => {
    const parsed = Number(value);
    return value === null || value === undefined || !Number.isFinite(parsed) ? fallback : parsed;
  };
  return {
    name: typeof row?.name === "string" ? row.name : "",
    timeZone: typeof row?.time_zone === "string" && row.time_zone ? row.time_zone : DEFAULT_TIME_ZONE,
    displayUnits: row?.display_units === "metric" ? "metric" : "us",
    waterwayBufferM: number(row?.waterway_buffer_m, DEFAULT_WATERWAY_BUFFER_M),
    drawdownToleranceShare: number(row?.drawdown_tolerance_share, DEFAULT_DRAWDOWN_TOLERANCE_SHARE),
    pfasReportableLb: number(row?.pfas_reportable_lb, DEFAULT_PFAS_REPORTABLE_LB),
    classAAccuracyShare: number(row?.class_a_accuracy_share, DEFAULT_CLASS_A_ACCURACY_SHARE),
    reportRecipients: splitRecipientList(row?.report_recipients as string | undefined),
    releaseAlertRecipients: splitRecipientList(row?.release_alert_recipients as string | undefined),
    updatedAt: row?.updated_at instanceof Date ? row.updated_at.toISOString() : null,
    version: versionOf(row),
  };
}

/** Every agency setting, with the version a save must name. */
export async function readAgencySettings(connection: Db = db): Promise<AgencySettings> {
  return settingsFrom(await connection("agency_settings").where({ id: 1 }).first());
}

/** What the audit log keeps of the settings: the values, not the bookkeeping. */
function auditedValues(settings: AgencySettings) {
  return {
    name: settings.name,
    timeZone: settings.timeZone,
    displayUnits: settings.displayUnits,
    waterwayBufferM: settings.waterwayBufferM,
    drawdownToleranceShare: settings.drawdownToleranceShare,
    pfasReportableLb: settings.pfasReportableLb,
    classAAccuracyShare: settings.classAAccuracyShare,
    reportRecipients: settings.reportRecipients,
    releaseAlertRecipients: settings.releaseAlertRecipients,
  };
}

export type SaveAgencySettingsResult =
  { ok: true; changed: string[]; eventsRechecked: number | null } | { ok: false; conflict: AgencySettings };

/**
 * Saves the settings in one transaction with their audit row, unless someone else saved since
 * `input.version` was read (then nothing is written and the current settings come back). A new
 * waterway buffer rechecks every event's stored geography in the same transaction.
 */
export async function saveAgencySettings(
  input: AgencySettingsInput,
  actor: { id: number },
  clientAddress: string | null = null,
  connection: Knex = db,
): Promise<SaveAgencySettingsResult> {
  return connection.transaction(async (trx) => {
    const row = await trx("agency_settings").where({ id: 1 }).forUpdate().first();
    const before = settingsFrom(row);
    if (before.version !== input.version) return { ok: false, conflict: before };

    const values = {
      name: input.name,
      time_zone: input.timeZone,
      display_units: input.displayUnits,
      waterway_buffer_m: input.waterwayBufferM,
      drawdown_tolerance_share: Number((input.drawdownTolerancePercent / 100).toFixed(4)),
      pfas_reportable_lb: input.pfasReportableLb,
      class_a_accuracy_share: Number((input.classAAccuracyPercent / 100).toFixed(4)),
      report_recipients: input.reportRecipients.join(", "),
      release_alert_recipients: input.releaseAlertRecipients.join(", "),
    };
    const afterValues = auditedValues(settingsFrom({ ...row, ...values }));
    const beforeValues = auditedValues(before);
    const changed = (Object.keys(afterValues) as (keyof typeof afterValues)[]).filter(
      (key) => JSON.stringify(afterValues[key]) !== JSON.stringify(beforeValues[key]),
    );
    if (row && changed.length === 0) return { ok: true, changed, eventsRechecked: null };

    if (row)
      await trx("agency_settings")
        .where({ id: 1 })
        .update({ ...values, updated_at: trx.fn.now() });
    else await trx("agency_settings").insert({ id: 1, ...values });
    const eventsRechecked = changed.includes("waterwayBufferM") ? await recomputeAllEventGeography(trx) : null;
    await recordAudit(
      {
        actorUserId: actor.id,
        action: "agency_settings_updated",
        entityType: "agency_settings",
        entityId: 1,
        summary:
          `Changed ${changed.join(", ")}` + (eventsRechecked === null ? "" : `; rechecked ${eventsRechecked} events`),
        before: row ? beforeValues : null,
        after: afterValues,
        clientAddress,
      },
      trx,
    );
    return { ok: true, changed, eventsRechecked };
  });
}

export type { AgencySettings };
