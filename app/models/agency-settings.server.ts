import { createHash } from "node:crypto";
import {
  DEFAULT_ATTACHMENT_MAX_MB,
  DEFAULT_ATTACHMENT_RETENTION_DAYS,
  DEFAULT_ATTACHMENTS_PER_EVENT,
  DEFAULT_CLASS_A_ACCURACY_SHARE,
  DEFAULT_CLASS_B_ATTACK_PERCENT,
  DEFAULT_CLASS_B_ATTACK_SOLUTION_GPM,
  DEFAULT_QUALITY_SAMPLE_INTERVAL_MONTHS,
  DEFAULT_DRAWDOWN_TOLERANCE_SHARE,
  DEFAULT_PFAS_REPORTABLE_LB,
  DEFAULT_WATERWAY_BUFFER_M,
  splitRecipientList,
  type AgencySettings,
} from "~/lib/agency-settings-form";
import { decimalOrNull } from "~/lib/decimal";
import { DEFAULT_EVENT_NUMBER_PREFIX } from "~/lib/foam/event-number";
import { db, type Db } from "~/lib/db.server";
import { DEFAULT_ACCURACY_TEST_INTERVAL_MONTHS, DEFAULT_FLUSH_INTERVAL_DAYS } from "~/lib/foam/system-schedule";
import { parseClosureDays } from "~/lib/records/due-date";
import { VersionedCache } from "~/lib/versioned-cache";

export const DEFAULT_TIME_ZONE = "America/Chicago";
/** The version of settings that were never saved: the first save inserts the row. */
export const UNSAVED_SETTINGS_VERSION = "none";
/** What a generated document names when the agency has not given its name yet. */
const NAME_NOT_SET = "(agency name not set)";

type SettingsRow = Record<string, unknown> | undefined;

// The row as stored, so that any change by anyone (values or updated_at) gives a new version.
function versionOf(row: SettingsRow): string {
  if (!row) return UNSAVED_SETTINGS_VERSION;
  const canonical = Object.keys(row)
    .sort()
    .map((key) => [key, row[key] instanceof Date ? (row[key] as Date).toISOString() : String(row[key])]);
  return createHash("sha256").update(JSON.stringify(canonical)).digest("hex").slice(0, 24);
}

function settingsFrom(row: SettingsRow): AgencySettings {
  const number = (value: unknown, fallback: number) => decimalOrNull(value) ?? fallback;
  return {
    name: typeof row?.name === "string" ? row.name : "",
    timeZone: typeof row?.time_zone === "string" && row.time_zone ? row.time_zone : DEFAULT_TIME_ZONE,
    displayUnits: row?.display_units === "metric" ? "metric" : "us",
    eventNumberPrefix:
      typeof row?.event_number_prefix === "string" && row.event_number_prefix
        ? row.event_number_prefix
        : DEFAULT_EVENT_NUMBER_PREFIX,
    waterwayBufferM: number(row?.waterway_buffer_m, DEFAULT_WATERWAY_BUFFER_M),
    drawdownToleranceShare: number(row?.drawdown_tolerance_share, DEFAULT_DRAWDOWN_TOLERANCE_SHARE),
    pfasReportableLb: number(row?.pfas_reportable_lb, DEFAULT_PFAS_REPORTABLE_LB),
    classAAccuracyShare: number(row?.class_a_accuracy_share, DEFAULT_CLASS_A_ACCURACY_SHARE),
    accuracyTestIntervalMonths: number(row?.accuracy_test_interval_months, DEFAULT_ACCURACY_TEST_INTERVAL_MONTHS),
    flushIntervalDays: number(row?.flush_interval_days, DEFAULT_FLUSH_INTERVAL_DAYS),
    reportRecipients: splitRecipientList(row?.report_recipients as string | undefined),
    releaseAlertRecipients: splitRecipientList(row?.release_alert_recipients as string | undefined),
    releaseAlertsToChief:
      row?.release_alerts_to_chief === undefined ? true : Boolean(Number(row.release_alerts_to_chief)),
    recordsDueRule: typeof row?.records_due_rule === "string" ? row.records_due_rule : "federal",
    recordsOfficeCloses:
      typeof row?.records_office_closes === "string" && /^\d{2}:\d{2}$/.test(row.records_office_closes)
        ? row.records_office_closes
        : "17:00",
    recordsClosureDays: parseClosureDays(row?.records_closure_days as string | undefined),
    recordsWithholdingRule:
      typeof row?.records_withholding_rule === "string" && row.records_withholding_rule
        ? row.records_withholding_rule
        : "the exemptions of the state's public-records law (set the rule's name in the agency settings)",
    attachmentMaxMb: number(row?.attachment_max_mb, DEFAULT_ATTACHMENT_MAX_MB),
    attachmentsPerEvent: number(row?.attachments_per_event, DEFAULT_ATTACHMENTS_PER_EVENT),
    attachmentRetentionDays: number(row?.attachment_retention_days, DEFAULT_ATTACHMENT_RETENTION_DAYS),
    qualitySampleIntervalMonths: number(row?.quality_sample_interval_months, DEFAULT_QUALITY_SAMPLE_INTERVAL_MONTHS),
    classBAttackSolutionGpm: number(row?.class_b_attack_solution_gpm, DEFAULT_CLASS_B_ATTACK_SOLUTION_GPM),
    classBAttackPercent: number(row?.class_b_attack_percent, DEFAULT_CLASS_B_ATTACK_PERCENT),
    updatedAt: row?.updated_at instanceof Date ? row.updated_at.toISOString() : null,
    version: versionOf(row),
  };
}

/**
 * Every agency setting, with the version a save must name: the one reader of `agency_settings`.
 * `forUpdate` locks the row until the caller's transaction ends (for the save).
 */
export async function readAgencySettings(
  connection: Db = db,
  options: { forUpdate?: boolean } = {},
): Promise<AgencySettings> {
  const query = connection("agency_settings").where({ id: 1 });
  if (options.forUpdate) query.forUpdate();
  return settingsFrom(await query.first());
}

const keptSettings = new VersionedCache<AgencySettings>(1);

/**
 * The settings as `readAgencySettings` reads them, kept in this process while the catalogue's
 * version stamp is `catalogueVersion` (every settings save gives it a new one): for read paths that
 * already hold the current stamps, such as the events list.
 */
export function agencySettingsAt(catalogueVersion: string | null): Promise<AgencySettings> {
  return keptSettings.get("settings", catalogueVersion, () => readAgencySettings());
}

/** The agency's name as workbooks and e-mails print it. */
export function agencyNameForDocuments(settings: Pick<AgencySettings, "name">): string {
  return settings.name || NAME_NOT_SET;
}

export type { AgencySettings };
