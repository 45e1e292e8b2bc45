import type { Knex } from "knex";
import { rolesFor } from "~/lib/access";
import { recordAudit } from "~/lib/audit.server";
import { env } from "~/lib/env.server";
import { decimalOrNull, decimalOrZero } from "~/lib/decimal";
import { gramsToPoundsMass, pfasGrams } from "~/lib/foam/pfas";
import {
  containedGallons,
  releasedGallons,
  shareNotContained,
  unaccountedGallons,
  type RunoffLine,
} from "~/lib/foam/released-volume";
import { gallonsToLitres } from "~/lib/foam/units";
import {
  DISPOSITION_LABELS,
  UNACCOUNTED_LABEL,
  DISPOSITIONS_TO_WATER,
  EVENT_KIND_LABELS,
  isPfasContentUnit,
  type Disposition,
  type EventKind,
} from "~/lib/foam/vocabulary";
import { XLSX_TYPE } from "~/lib/reporting/files";
import { localDateTime } from "~/lib/time-zone";
import { agencyNameForDocuments, readAgencySettings } from "./agency-settings.server";
import { queueMail } from "./mail-outbox.server";

const gal = (value: number) => `${value.toLocaleString("en-US", { maximumFractionDigits: 2 })} US gal`;
const galAndLitres = (value: number) =>
  `${gal(value)} (${gallonsToLitres(value).toLocaleString("en-US", { maximumFractionDigits: 1 })} L)`;

export function eventLink(eventId: number): string {
  return `${env().APP_URL.replace(/\/$/, "")}/events/${eventId}`;
}

async function environmentalOfficerEmails(trx: Knex.Transaction): Promise<string[]> {
  return trx("users")
    .join("user_roles", "user_roles.user_id", "users.id")
    .whereIn("user_roles.role", rolesFor("alerts.release"))
    .where({ "users.active": true })
    .pluck("users.email");
}

/** Every active chief, for release alerts when the agency's setting says so. */
async function chiefEmails(trx: Knex.Transaction): Promise<string[]> {
  return trx("users")
    .join("user_roles", "user_roles.user_id", "users.id")
    .where({ "user_roles.role": "chief", "users.active": true })
    .pluck("users.email");
}

/**
 * Queues a release alert when a filed report used PFAS-containing foam or sent runoff to a storm
 * drain or surface water. Call it inside the filing transaction; `deliverPendingMail` sends after commit.
 */
export async function queueFiledReportAlerts(eventId: number, trx: Knex.Transaction): Promise<void> {
  const event = await trx("events as e")
    .leftJoin("stations as s", "s.id", "e.station_id")
    .where("e.id", eventId)
    .select("e.*", "s.code as station_code", "s.name as station_name")
    .first();
  if (!event) return;
  const pfasLines: {
    name: string;
    pfas_content: string | null;
    pfas_content_unit: string | null;
    pfas_content_source: string | null;
    concentrate: string;
    solution: string;
  }[] = await trx("discharges as d")
    .join("foam_products as p", "p.id", "d.product_id")
    .where({ "d.event_id": eventId, "p.pfas_containing": true })
    .groupBy("p.id")
    .select("p.name", "p.pfas_content", "p.pfas_content_unit", "p.pfas_content_source")
    .sum({ concentrate: "d.concentrate_gal", solution: "d.solution_gal" });
  const dispositions: (RunoffLine & { receivingWater: string; disposalReference: string; sewerNotice: string })[] = (
    await trx("runoff_dispositions").where({ event_id: eventId }).orderBy("id")
  ).map((row) => ({
    disposition: row.disposition as Disposition,
    sharePercent: decimalOrNull(row.share_percent),
    volumeGal: decimalOrNull(row.volume_gal),
    receivingWater: row.receiving_water ?? "",
    disposalReference: row.disposal_reference ?? "",
    sewerNotice: row.sewer_notice ?? "",
  }));
  const solution = decimalOrZero(event.solution_gal);
  const toWater = dispositions.filter((row) => DISPOSITIONS_TO_WATER.includes(row.disposition));
  if (pfasLines.length === 0 && toWater.length === 0) return;

  const agency = await readAgencySettings(trx);
  const recipients = [
    ...new Set([
      ...agency.releaseAlertRecipients,
      ...(await environmentalOfficerEmails(trx)),
      ...(agency.releaseAlertsToChief ? await chiefEmails(trx) : []),
    ]),
  ];
  const notContained = shareNotContained(containedGallons(dispositions, solution), solution);

  const lines: string[] = [
    `Report ${event.number} (${EVENT_KIND_LABELS[event.kind as EventKind]}) was filed and needs your attention.`,
    "",
    `Open it: ${eventLink(eventId)}`,
    "",
    `Started: ${event.started_at ? `${localDateTime(event.started_at, agency.timeZone)} (${agency.timeZone})` : "not given"}`,
    `Where: ${event.address || "no address"}${event.station_code ? ` — station ${event.station_code} ${event.station_name}` : ""}`,
    `Drainage basin: ${event.drainage_basin || "not placed"}; nearest waterway: ${
      event.nearest_waterway
        ? `${event.nearest_waterway}${event.nearest_waterway_m !== null ? ` at ${Math.round(decimalOrZero(event.nearest_waterway_m))} m` : ""}`
        : "not placed"
    }`,
    "",
    `Water: ${galAndLitres(decimalOrZero(event.water_gal))}`,
    `Concentrate: ${galAndLitres(decimalOrZero(event.concentrate_gal))}`,
    `Foam solution: ${galAndLitres(solution)}`,
  ];
  if (pfasLines.length > 0) {
    lines.push("", "PFAS-containing foam used:");
    let pounds = 0;
    let unknown = false;
    for (const line of pfasLines) {
      const concentrate = decimalOrZero(line.concentrate);
      const content = decimalOrNull(line.pfas_content);
      if (content === null || !isPfasContentUnit(line.pfas_content_unit)) {
        unknown = true;
        lines.push(
          `- ${line.name}: ${galAndLitres(concentrate)} of concentrate; PFAS content not recorded: whether the reportable quantity is reached is UNKNOWN (mixture rule, 40 CFR 302.6(b)(1)(ii)), not "no"`,
        );
        continue;
      }
      const grams =
        pfasGrams(
          { concentrateGal: concentrate, solutionGal: decimalOrZero(line.solution) },
          content,
          line.pfas_content_unit,
        ) * notContained;
      pounds += gramsToPoundsMass(grams);
      lines.push(
        `- ${line.name}: ${galAndLitres(concentrate)} of concentrate; estimated PFAS released ${grams.toLocaleString(
          "en-US",
          {
            maximumFractionDigits: 1,
          },
        )} g (${gramsToPoundsMass(grams).toLocaleString("en-US", { maximumFractionDigits: 3 })} lb), content source: ${
          line.pfas_content_source || "not stated"
        }`,
      );
    }
    lines.push(
      `Share of the foam solution not contained: ${(notContained * 100).toFixed(1)} %${dispositions.length === 0 ? " (no runoff recorded: all counted as released)" : ""}`,
      `Estimated PFAS released by this report: ${pounds.toLocaleString("en-US", { maximumFractionDigits: 3 })} lb` +
        `${unknown ? " plus products with no content recorded" : ""}; the agency's threshold is ${agency.pfasReportableLb} lb in any 24 hours ` +
        `(default 1 lb: the CERCLA reportable quantity for PFOA and for PFOS each, 40 CFR 302.4). ${
          pounds >= agency.pfasReportableLb
            ? "This report alone reaches it."
            : unknown
              ? "Reportable quantity reached: UNKNOWN, because a product's content is not recorded."
              : "Other releases within 24 hours add to it."
        }`,
    );
  }
  if (dispositions.length > 0) {
    lines.push("", "Where the runoff went:");
    for (const row of dispositions) {
      lines.push(
        `- ${DISPOSITION_LABELS[row.disposition]}: ${galAndLitres(releasedGallons(row, solution))}` +
          `${row.receivingWater ? ` to ${row.receivingWater}` : ""}${row.disposalReference ? `; disposal ${row.disposalReference}` : ""}` +
          `${row.sewerNotice ? `; notice ${row.sewerNotice}` : ""}`,
      );
    }
  }
  const unaccounted = unaccountedGallons(dispositions, solution);
  if (unaccounted > 0) {
    if (dispositions.length > 0) lines.push(`- ${UNACCOUNTED_LABEL}: ${galAndLitres(unaccounted)}`);
    else lines.push("", `${UNACCOUNTED_LABEL}: ${galAndLitres(unaccounted)}`);
  }
  lines.push(
    "",
    "This alert and the report it describes are not a notification to any authority. A release at or above a reportable quantity must be reported immediately once the person in charge knows of it (CERCLA §103, EPCRA §304; 40 CFR 302.6(a), 355.40); many states add their own notice, e.g. Colorado within 24 hours to its spill line (C.R.S. 25-5-1303.5). These figures are estimates from the report as filed. Contain and collect what remains and keep it out of drains and waterways.",
  );
  const reasons = [
    pfasLines.length > 0 ? "PFAS-containing foam" : "",
    toWater.length > 0 ? "runoff to a drain or water" : "",
  ]
    .filter(Boolean)
    .join(" and ");
  await queueMail(
    {
      kind: "release_alert",
      to: recipients,
      subject: `Release alert: report ${event.number} — ${reasons}`,
      text: lines.join("\n"),
      eventId,
    },
    trx,
  );
}

/** Queues the reviewer's comment to the officer who wrote the returned report. */
export async function queueReturnedReportNotice(
  eventId: number,
  comment: string,
  trx: Knex.Transaction,
): Promise<void> {
  const event = await trx("events as e")
    .join("users as u", "u.id", "e.created_by")
    .where("e.id", eventId)
    .select("e.number", "e.kind", "u.email", "u.name")
    .first();
  if (!event) return;
  await queueMail(
    {
      kind: "returned_report",
      to: [event.email],
      subject: `Report ${event.number} was returned for changes`,
      text: [
        `${event.name}, your usage report ${event.number} (${EVENT_KIND_LABELS[event.kind as EventKind]}) was returned with this comment:`,
        "",
        comment,
        "",
        `Open it to make the changes and file it again: ${eventLink(eventId)}`,
      ].join("\n"),
      eventId,
    },
    trx,
  );
}

export class NoRecipientsError extends Error {}

/**
 * Queues the period's workbook, as an attachment, to the agency's report recipients. Throws
 * NoRecipientsError when none are set, so the page can say where to set them.
 */
export async function queueQuarterlyWorkbookMail(
  mail: {
    periodLabel: string;
    fileName: string;
    content: Buffer;
    sha256: string;
    submissionId?: number | null;
    sentBy: { id: number; name: string; email: string };
    clientAddress?: string | null;
  },
  trx: Knex.Transaction,
): Promise<number> {
  const settings = await readAgencySettings(trx);
  const agency = { ...settings, name: agencyNameForDocuments(settings) };
  if (agency.reportRecipients.length === 0) {
    throw new NoRecipientsError("No report recipients are set in the agency settings.");
  }
  const id = await queueMail(
    {
      kind: "quarterly_workbook",
      to: agency.reportRecipients,
      subject: `${agency.name}: foam use and runoff summary, ${mail.periodLabel}`,
      text: [
        `Attached is the foam use and runoff summary of ${agency.name} for ${mail.periodLabel}, sent by ${mail.sentBy.name} <${mail.sentBy.email}>.`,
        "",
        `File: ${mail.fileName}`,
        `SHA-256: ${mail.sha256}`,
        mail.submissionId
          ? "This is the file recorded as submitted for the period."
          : "This period has not been marked as submitted; the file is a current copy.",
        "",
        "The figures are estimates computed from the officers' reports; the workbook's Method and cautions sheet explains how.",
      ].join("\n"),
      attachment: { filename: mail.fileName, contentType: XLSX_TYPE, content: mail.content },
      submissionId: mail.submissionId ?? null,
    },
    trx,
  );
  await recordAudit(
    {
      actorUserId: mail.sentBy.id,
      actorLabel: mail.sentBy.email,
      action: "quarterly_workbook_queued",
      entityType: "mail_outbox",
      entityId: id,
      summary: `${mail.periodLabel} to ${agency.reportRecipients.join(", ")}`,
      clientAddress: mail.clientAddress ?? null,
    },
    trx,
  );
  return id ?? 0;
}
