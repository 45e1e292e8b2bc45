import type { Knex } from "knex";
import type { AgencySettings, AgencySettingsInput } from "~/lib/agency-settings-form";
import { recordAudit } from "~/lib/audit.server";
import { db } from "~/lib/db.server";
import { readAgencySettings, UNSAVED_SETTINGS_VERSION } from "./agency-settings.server";
import { recomputeAllEventGeography } from "./geography.server";
import { bumpDataVersion } from "./data-version.server";

type AuditedSettings = Omit<AgencySettings, "updatedAt" | "version">;

/** What the audit log keeps of the settings: the values, not the bookkeeping. */
function auditedValues(settings: AuditedSettings): AuditedSettings {
  return {
    name: settings.name,
    timeZone: settings.timeZone,
    displayUnits: settings.displayUnits,
    eventNumberPrefix: settings.eventNumberPrefix,
    waterwayBufferM: settings.waterwayBufferM,
    drawdownToleranceShare: settings.drawdownToleranceShare,
    pfasReportableLb: settings.pfasReportableLb,
    classAAccuracyShare: settings.classAAccuracyShare,
    accuracyTestIntervalMonths: settings.accuracyTestIntervalMonths,
    flushIntervalDays: settings.flushIntervalDays,
    reportRecipients: settings.reportRecipients,
    releaseAlertRecipients: settings.releaseAlertRecipients,
    recordsDueRule: settings.recordsDueRule,
    recordsOfficeCloses: settings.recordsOfficeCloses,
    recordsClosureDays: settings.recordsClosureDays,
    recordsWithholdingRule: settings.recordsWithholdingRule,
    releaseAlertsToChief: settings.releaseAlertsToChief,
    attachmentMaxMb: settings.attachmentMaxMb,
    attachmentsPerEvent: settings.attachmentsPerEvent,
    attachmentRetentionDays: settings.attachmentRetentionDays,
    qualitySampleIntervalMonths: settings.qualitySampleIntervalMonths,
    classBAttackSolutionGpm: settings.classBAttackSolutionGpm,
    classBAttackPercent: settings.classBAttackPercent,
  };
}

export type SaveAgencySettingsResult =
  { ok: true; changed: string[]; eventsRechecked: number | null } | { ok: false; conflict: AgencySettings };

/**
 * Saves the settings in one transaction with their audit row, unless someone else saved since
 * `input.version` was read (then nothing is written and the current settings come back). A new
 * waterway buffer rechecks every event's stored geography in the same transaction. A new
 * public-records rule, closing time or closure days apply to requests received from then on; the
 * due dates of requests already received keep their value (the page says so).
 */
export async function saveAgencySettings(
  input: AgencySettingsInput,
  actor: { id: number },
  clientAddress: string | null = null,
  connection: Knex = db,
): Promise<SaveAgencySettingsResult> {
  return connection.transaction(async (trx) => {
    const before = await readAgencySettings(trx, { forUpdate: true });
    if (before.version !== input.version) return { ok: false, conflict: before };
    const stored = before.version !== UNSAVED_SETTINGS_VERSION;

    const values = {
      name: input.name,
      time_zone: input.timeZone,
      display_units: input.displayUnits,
      event_number_prefix: input.eventNumberPrefix ?? before.eventNumberPrefix,
      waterway_buffer_m: input.waterwayBufferM,
      drawdown_tolerance_share: Number((input.drawdownTolerancePercent / 100).toFixed(4)),
      pfas_reportable_lb: input.pfasReportableLb,
      class_a_accuracy_share: Number((input.classAAccuracyPercent / 100).toFixed(4)),
      accuracy_test_interval_months: input.accuracyTestIntervalMonths ?? before.accuracyTestIntervalMonths,
      flush_interval_days: input.flushIntervalDays ?? before.flushIntervalDays,
      report_recipients: input.reportRecipients.join(", "),
      release_alert_recipients: input.releaseAlertRecipients.join(", "),
      records_due_rule: input.recordsDueRule,
      records_office_closes: input.recordsOfficeCloses,
      records_closure_days: input.recordsClosureDays.join("\n"),
      records_withholding_rule: input.recordsWithholdingRule,
      release_alerts_to_chief: input.releaseAlertsToChief,
      attachment_max_mb: input.attachmentMaxMb ?? before.attachmentMaxMb,
      attachments_per_event: input.attachmentsPerEvent ?? before.attachmentsPerEvent,
      attachment_retention_days: input.attachmentRetentionDays ?? before.attachmentRetentionDays,
      quality_sample_interval_months: input.qualitySampleIntervalMonths ?? before.qualitySampleIntervalMonths,
      class_b_attack_solution_gpm: input.classBAttackSolutionGpm ?? before.classBAttackSolutionGpm,
      class_b_attack_percent: input.classBAttackPercent ?? before.classBAttackPercent,
    };
    const afterValues = auditedValues({
      ...input,
      attachmentMaxMb: values.attachment_max_mb,
      attachmentsPerEvent: values.attachments_per_event,
      attachmentRetentionDays: values.attachment_retention_days,
      eventNumberPrefix: values.event_number_prefix,
      drawdownToleranceShare: values.drawdown_tolerance_share,
      classAAccuracyShare: values.class_a_accuracy_share,
      accuracyTestIntervalMonths: values.accuracy_test_interval_months,
      flushIntervalDays: values.flush_interval_days,
      qualitySampleIntervalMonths: values.quality_sample_interval_months,
      classBAttackSolutionGpm: values.class_b_attack_solution_gpm,
      classBAttackPercent: values.class_b_attack_percent,
    });
    const beforeValues = auditedValues(before);
    const changed = (Object.keys(afterValues) as (keyof typeof afterValues)[]).filter(
      (key) => JSON.stringify(afterValues[key]) !== JSON.stringify(beforeValues[key]),
    );
    if (stored && changed.length === 0) return { ok: true, changed, eventsRechecked: null };

    if (stored)
      await trx("agency_settings")
        .where({ id: 1 })
        .update({ ...values, updated_at: trx.fn.now() });
    else await trx("agency_settings").insert({ id: 1, ...values });
    await bumpDataVersion(trx, "catalogue");
    const eventsRechecked = changed.includes("waterwayBufferM") ? await recomputeAllEventGeography(trx) : null;
    await recordAudit(
      {
        actorUserId: actor.id,
        action: "agency_settings_updated",
        entityType: "agency_settings",
        entityId: 1,
        summary:
          `Changed ${changed.join(", ")}` + (eventsRechecked === null ? "" : `; rechecked ${eventsRechecked} events`),
        before: stored ? beforeValues : null,
        after: afterValues,
        clientAddress,
      },
      trx,
    );
    return { ok: true, changed, eventsRechecked };
  });
}
