import { createHash } from "node:crypto";
import { createReadStream, readFileSync } from "node:fs";
import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import nodePath from "node:path";
import type { Knex } from "knex";
import type { Db } from "~/lib/db.server";
import { METRES_PER_FOOT, WATERWAY_BUFFER_BASIS } from "~/lib/agency-settings-form";
import { ASSUMED_CONCENTRATE_KG_PER_L } from "~/lib/foam/pfas";
import { GRAMS_PER_POUND, LITRES_PER_US_GALLON } from "~/lib/foam/units";
import type { ReportPeriod } from "~/lib/reporting/period";
import type { AgencySettings } from "~/models/agency-settings.server";
import type { PfasRow } from "~/models/environmental-report.server";

/**
 * What the quarterly workbook and its CSV tables have in common: the request they are made for,
 * their file name, version and digest, the "Method and cautions" text, the heaviest-24-hours PFAS
 * figure, and the private temporary file each is written to before it is streamed or stored.
 */

export type SubmissionFacts = { submittedAt: Date; submittedBy: string; sha256: string; fileName: string };

export type WorkbookRequest = {
  period: ReportPeriod;
  generatedBy: { name: string; email: string };
  /** The latest submission of this same period, if any: the workbook says so and lists later changes. */
  submission?: SubmissionFacts | null;
  now?: Date;
};

export type WrittenFile = { path: string; sha256: string; byteSize: number };

/** The version in package.json, stated in both files so a reader knows which code made them. */
export function appVersion(): string {
  try {
    return String(JSON.parse(readFileSync("package.json", "utf8")).version ?? "unknown");
  } catch {
    return "unknown";
  }
}

/** The two files the quarterly export is made as: the workbook, or its tables as CSV files in a zip. */
export type ExportFormat = "xlsx" | "zip";

/** The same name for the workbook and the zip of CSV files, e.g. `foam-runoff-summary_2026-Q3.xlsx`. */
export function workbookFileName(period: ReportPeriod, extension: ExportFormat): string {
  const part =
    period.year !== null && period.quarter !== null
      ? `${period.year}-Q${period.quarter}`
      : `${period.from}_${period.to}`;
  return `foam-runoff-summary_${part}.${extension}`;
}

/** SHA-256 and size of a written file, read back from disk in chunks. */
export async function digestOfFile(path: string): Promise<{ sha256: string; byteSize: number }> {
  const hash = createHash("sha256");
  let byteSize = 0;
  for await (const chunk of createReadStream(path)) {
    hash.update(chunk as Buffer);
    byteSize += (chunk as Buffer).length;
  }
  return { sha256: hash.digest("hex"), byteSize };
}

/** The heaviest PFAS mass released in any 24 hours of the period (lb); unknown masses count as 0. */
export function heaviestWindowPounds(pfas: Pick<PfasRow, "windowPounds">[]): number {
  return pfas.reduce((max, row) => Math.max(max, row.windowPounds ?? 0), 0);
}

/**
 * Runs `write` inside one read-only transaction, so every sheet or file comes from one snapshot,
 * then reads the finished file back for its digest.
 */
export async function writeOnOneSnapshot(
  path: string,
  connection: Db,
  write: (trx: Knex.Transaction) => Promise<void>,
): Promise<WrittenFile> {
  await connection.transaction(write, { readOnly: true });
  return { path, ...(await digestOfFile(path)) };
}

/**
 * A path named `fileName` in a fresh private temporary directory; `remove` deletes the directory
 * and whatever was written there.
 */
export async function privateTempFile(fileName: string): Promise<{ path: string; remove: () => Promise<void> }> {
  const directory = await mkdtemp(nodePath.join(tmpdir(), "foamtally-export-"));
  return {
    path: nodePath.join(directory, fileName),
    remove: () => rm(directory, { recursive: true, force: true }),
  };
}

/** The "Method and cautions" sheet of the workbook and `method-and-cautions.txt` of the zip, line by line. */
export function methodLines(agency: AgencySettings): [string, string][] {
  return [
    ["Method and cautions", ""],
    [
      "What is counted",
      "Accepted usage reports whose event started within the period, in the agency's time zone. Reports filed but not yet accepted, and returned reports, are counted on the Summary sheet but not in the totals.",
    ],
    [
      "Who computed the volumes",
      "Foamtally's server computes water, concentrate and foam solution for every discharge when a report is saved, and stores them; this workbook reads the stored figures. Officers enter flow, duration, percentage and flow basis.",
    ],
    [
      "Flow on a water basis",
      "The flow figure is water through a direct-injection proportioner, which injects concentrate at water × p: concentrate = water × p; foam solution = water × (1 + p), with p the percentage ÷ 100 (common practice, no source).",
    ],
    [
      "Flow on a foam-solution basis",
      "The flow figure is foam solution, as nozzle and eductor ratings are stated: concentrate = solution × p; water = solution − concentrate (API RP 2021, 4th ed., Appendix K). Example: 150 gpm × 0.5 % × 20 min = 15 gal concentrate and 2,985 gal water.",
    ],
    [
      "Proportioner limit",
      "Where flow × p exceeds the proportioner's maximum concentrate rate, the set percentage was not reached: the effective percentage is the maximum rate ÷ flow, shown on the Discharges sheet and used in the volumes.",
    ],
    [
      "Mutual aid",
      "A discharge from another agency's unit is marked Mutual aid on the Discharges sheet and named on the Events sheet, as the officer typed it. It counts in every total like our own lines; its foam system is not in our apparatus list, so no proportioner-limit or flow-range check applies to it.",
    ],
    [
      "Incident type and dispatch number",
      "Each event carries the type the officer chose (structure fire, vehicle fire, flammable-liquid spill, wildland fire, hazmat, or the non-incident kind itself) and, where given, the dispatch (CAD) incident number beside Foamtally's own report number. Incidents saved before the type was recorded show Not recorded.",
    ],
    ["Volume", "Duration (min) × flow (gpm). Flows entered in L/min are converted with 1 US gal = 3.785411784 L."],
    [
      "Units",
      `1 US gallon = 231 in³ = ${LITRES_PER_US_GALLON} L exactly; 1 lb = ${GRAMS_PER_POUND} g exactly (NIST Handbook 44, Appendix C). Percentages are by volume.`,
    ],
    [
      "Released volume",
      "For each runoff disposition the officer gives either a volume of foam solution or a share of the event's foam solution; a share is turned into gallons as share ÷ 100 × the event's foam solution. Releases to the environment (soil, a storm drain, surface water, evaporated or unknown, and the sanitary sewer with no notice to the treatment works recorded) are summed apart from runoff held back (contained and collected, or sent to the sewer with a notice); an unknown fate counts as released, the conservative reading (common practice, no source). The Releases sheet marks each line. Where an event's lines add up to less than its foam solution, the rest is shown as unaccounted (Events sheet and Summary) and counts as not contained in the PFAS figures.",
    ],
    [
      "PFAS mass",
      `Estimated PFAS in the concentrate used = concentrate (L) × the product's PFAS content in g per L (contents in mg/L are divided by 1,000; contents in % w/w assume ${ASSUMED_CONCENTRATE_KG_PER_L} kg per L of concentrate). Released mass = that × the share of the event's foam solution not contained and collected. Events without runoff dispositions count as fully released. Each product's content and its source come from the foam-product catalogue.`,
    ],
    [
      "24-hour threshold",
      `The CERCLA reportable quantity is 1 lb in any 24 hours for PFOA and for PFOS, each with its salts and structural isomers (40 CFR 302.4; 89 FR 39124); the agency's threshold is ${agency.pfasReportableLb} lb. Each substance is checked on its own and never added to the other (40 CFR 302.6). The mass compared is gross: all that reached a surface, land included (40 CFR 302.3); the mass not recovered (net) stands beside it. Any span shorter than 24 h is checked, reaching 24 h before and after the period, timed by the discharges where given, and counting filed and returned reports as well as accepted ones. Where a PFAS-containing product has no PFOA or PFOS content recorded, the answer is Unknown: by the mixture rule (40 CFR 302.6(b)(1)(ii)) the whole mixture released is compared with the RQ. Total PFAS is shown as a screening figure only.`,
    ],
    [
      "Waterway buffer",
      `"Within waterway buffer" on the Events sheet means within ${agency.waterwayBufferM} m (${(agency.waterwayBufferM / METRES_PER_FOOT).toFixed(1)} ft) of the nearest mapped waterway, the agency's setting. ${WATERWAY_BUFFER_BASIS}`,
    ],
    [
      "Percentages",
      "Each discharge records whether its percentage is a share of the foam solution (NFPA 11 (2021) §12.6.5) or of the water flow (direct injection, common practice, no source). Class B concentrations are checked on the achieved percentage of foam solution, concentrate ÷ solution.",
    ],
    [
      "Not a notification",
      "This workbook is a record kept after the event. It is not a notification to any authority: a release at or above a reportable quantity must be reported immediately once the person in charge knows of it (CERCLA §103, EPCRA §304; 40 CFR 302.6(a), 355.40), and many states add their own notice, e.g. Colorado within 24 hours to its spill line (C.R.S. 25-5-1303.5).",
    ],
    [
      "Estimates",
      "Every figure here is an estimate from entered flows, durations and percentages, not a measurement. Concentrate tank drawdowns, where recorded, are compared on each report and differences are flagged as warnings. Where a tank drawdown exceeds the computed concentrate, the PFAS sheet counts the larger figure as the conservative one and says so in its “Concentrate figure” column.",
    ],
    [
      "Cautions",
      "Local codes, permits, state and federal reporting law and licensed professionals govern what must be reported, when and to whom; several states require their own reports of PFAS foam releases (Colorado: within 24 hours, C.R.S. 25-5-1303.5). Keep foam concentrate and foam solution out of storm drains and waterways; contain and collect runoff; handle PFAS-containing foam and its runoff as your disposal rules require. Class A concentrates are also harmful to aquatic life.",
    ],
  ];
}
