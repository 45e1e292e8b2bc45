import { z } from "zod";
import { EVENT_NUMBER_PREFIX_PATTERN, isReservedPrefix } from "./foam/event-number";
import { isDueRuleKey } from "./records/due-rules";

/** 1 ft = 0.3048 m exactly (definition of the international foot). */
export const METRES_PER_FOOT = 0.3048;

/** 300 ft (91.44 m): USDA Forest Service aerial application guide; local rules govern. */
export const DEFAULT_WATERWAY_BUFFER_M = 91.44;
/** What the default buffer is, wherever it is shown: a guideline for aircraft, not a rule for ground use. */
export const WATERWAY_BUFFER_BASIS =
  "300 ft (91.44 m) is the USDA Forest Service guideline for aerial application of retardant or foam near waterways; ground use has no fixed distance, and local rules govern.";
/** 15 %: the product's own starting point for computed against measured drawdown (common practice, no source). */
export const DEFAULT_DRAWDOWN_TOLERANCE_SHARE = 0.15;
/** 1 lb in 24 h: CERCLA reportable quantity for PFOA/PFOS, 40 CFR 302.4 (89 FR 39124). */
export const DEFAULT_PFAS_REPORTABLE_LB = 1;
/**
 * 12 months between quality samples of stored concentrate. NFPA 11 (2021) §13.2.6 calls for samples
 * of concentrate to be tested periodically for quality condition; annually is common practice, no
 * source for the interval itself — the agency sets it.
 */
export const DEFAULT_QUALITY_SAMPLE_INTERVAL_MONTHS = 12;
/** A typical Class B attack line: 95 gpm of foam solution at 3 % (issue 15's example; common practice, no source). */
export const DEFAULT_CLASS_B_ATTACK_SOLUTION_GPM = 95;
export const DEFAULT_CLASS_B_ATTACK_PERCENT = 3;
/** 30 %: from memory, low confidence — no published figure for Class A apparatus systems was found. */
export const DEFAULT_CLASS_A_ACCURACY_SHARE = 0.3;

/** 25 MB per attached file: room for a phone photo or a scanned manifest (common practice, no source). */
export const DEFAULT_ATTACHMENT_MAX_MB = 25;
/** The largest per-file limit the settings accept; the server's body ceiling for uploads follows it. */
export const ATTACHMENT_MAX_MB_CEILING = 100;
/** 40 files on one event (common practice, no source). */
export const DEFAULT_ATTACHMENTS_PER_EVENT = 40;
/**
 * 1,095 days (3 years) before a removed attachment's file may be deleted from the store: a common
 * records-retention floor (common practice, no source); set it to the agency's retention schedule.
 */
export const DEFAULT_ATTACHMENT_RETENTION_DAYS = 1095;

export const DISPLAY_UNITS = ["us", "metric"] as const;
export const DISPLAY_UNIT_LABELS: Record<(typeof DISPLAY_UNITS)[number], string> = {
  us: "US customary (gallons, feet) first",
  metric: "Metric (litres, metres) first",
};

export const MAX_RECIPIENTS = 50;

/** Splits a typed list of addresses on commas, semicolons, spaces or new lines. */
export function splitRecipientList(text: string | null | undefined): string[] {
  return (text ?? "")
    .split(/[,;\s]+/)
    .map((address) => address.trim())
    .filter((address) => address.length > 0);
}

const EmailAddress = z.email();

function recipientList(label: string) {
  return z
    .string()
    .max(20_000, `The ${label} list is too long.`)
    .optional()
    .transform((text) => text ?? "")
    .superRefine((text, context) => {
      const addresses = splitRecipientList(text);
      for (const address of addresses) {
        if (address.length > 254 || !EmailAddress.safeParse(address).success) {
          context.addIssue({ code: "custom", message: `“${address}” is not an e-mail address.` });
        }
      }
      if (addresses.length > MAX_RECIPIENTS) {
        context.addIssue({ code: "custom", message: `At most ${MAX_RECIPIENTS} addresses.` });
      }
    })
    .transform((text) => [...new Set(splitRecipientList(text).map((address) => address.toLowerCase()))]);
}

/** Whether a name is an IANA time zone this runtime knows (the same list in the browser and on the server). */
export function isKnownTimeZone(name: string): boolean {
  if (name === "UTC") return true;
  return Intl.supportedValuesOf("timeZone").includes(name);
}

/** At most `places` decimals, so what is stored is exactly what was typed. */
const decimals = (value: number, places: number) =>
  Math.abs(value * 10 ** places - Math.round(value * 10 ** places)) < 1e-6;

export const MAX_CLOSURE_DAYS = 366;

/** Splits the typed closure days on commas, semicolons, spaces or new lines. */
export function splitClosureDays(text: string | null | undefined): string[] {
  return (text ?? "")
    .split(/[,;\s]+/)
    .map((part) => part.trim())
    .filter((part) => part.length > 0);
}

/** Whether `text` is a real calendar date written YYYY-MM-DD. */
export function isIsoDate(text: string): boolean {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(text)) return false;
  const date = new Date(`${text}T00:00:00Z`);
  return !Number.isNaN(date.getTime()) && date.toISOString().slice(0, 10) === text;
}

// An empty box means the office keeps no closure days of its own.
const closureDayList = z
  .string()
  .max(10_000, "The list of closure days is too long.")
  .optional()
  .transform((text) => text ?? "")
  .superRefine((text, context) => {
    const days = splitClosureDays(text);
    for (const day of days) {
      if (!isIsoDate(day)) context.addIssue({ code: "custom", message: `“${day}” is not a date written YYYY-MM-DD.` });
    }
    if (days.length > MAX_CLOSURE_DAYS)
      context.addIssue({ code: "custom", message: `At most ${MAX_CLOSURE_DAYS} days.` });
  })
  .transform((text) => [...new Set(splitClosureDays(text))].sort());

export const AgencySettingsSchema = z.object({
  version: z.string({ error: "Reload the page and try again." }).min(1, "Reload the page and try again.").max(100),
  name: z
    .string({ error: "Give the agency's name." })
    .trim()
    .min(1, "Give the agency's name.")
    .max(200, "At most 200 characters."),
  timeZone: z
    .string({ error: "Choose the agency's time zone." })
    .trim()
    .refine(isKnownTimeZone, "Not a known time zone. Use an IANA name such as America/Chicago."),
  displayUnits: z.enum(DISPLAY_UNITS, { error: "Choose which units are shown first." }),
  // Optional so that a form from before the field existed keeps the stored prefix.
  eventNumberPrefix: z
    .string()
    .trim()
    .toUpperCase()
    .regex(EVENT_NUMBER_PREFIX_PATTERN, "One letter, then up to five letters or digits, e.g. AB.")
    .refine((value) => !isReservedPrefix(value), "TR, PT and FL number training, tests and flushes; choose another.")
    .optional(),
  waterwayBufferM: z
    .number({ error: "Give the buffer in metres, as a number." })
    .gt(0, "The buffer must be more than 0 m.")
    .max(5000, "At most 5,000 m.")
    .refine((value) => decimals(value, 2), "At most two decimals (centimetres)."),
  drawdownTolerancePercent: z
    .number({ error: "Give the tolerance as a percent, as a number." })
    .gt(0, "The tolerance must be more than 0 %.")
    .max(100, "At most 100 %.")
    .refine((value) => decimals(value, 2), "At most two decimals."),
  pfasReportableLb: z
    .number({ error: "Give the threshold in pounds, as a number." })
    .gt(0, "The threshold must be more than 0 lb.")
    .max(1_000_000, "At most 1,000,000 lb.")
    .refine((value) => decimals(value, 4), "At most four decimals."),
  classAAccuracyPercent: z
    .number({ error: "Give the accuracy band as a percent, as a number." })
    .gt(0, "The band must be more than 0 %.")
    .max(100, "At most 100 %.")
    .refine((value) => decimals(value, 2), "At most two decimals."),
  // Optional, like the prefix: a form without the attachment fields keeps the stored limits.
  attachmentMaxMb: z
    .number({ error: "Give the largest file in MB, as a whole number." })
    .int("A whole number of MB.")
    .min(1, "At least 1 MB.")
    .max(ATTACHMENT_MAX_MB_CEILING, `At most ${ATTACHMENT_MAX_MB_CEILING} MB.`)
    .optional(),
  attachmentsPerEvent: z
    .number({ error: "Give the most files on one event, as a whole number." })
    .int("A whole number.")
    .min(1, "At least 1.")
    .max(500, "At most 500.")
    .optional(),
  attachmentRetentionDays: z
    .number({ error: "Give the days a removed file is kept, as a whole number." })
    .int("A whole number of days.")
    .min(0, "At least 0 days.")
    .max(36_500, "At most 36,500 days (100 years).")
    .optional(),
  reportRecipients: recipientList("report recipients"),
  releaseAlertRecipients: recipientList("release alert recipients"),
  recordsDueRule: z
    .string({ error: "Choose the rule that sets when answers are due." })
    .refine(isDueRuleKey, "Choose one of the rules listed."),
  recordsOfficeCloses: z
    .string({ error: "Give the time the office closes, HH:MM." })
    .trim()
    .regex(/^([01]\d|2[0-3]):[0-5]\d$/, "Give the closing time as HH:MM on a 24-hour clock, e.g. 17:00."),
  recordsClosureDays: closureDayList,
  recordsWithholdingRule: z
    .string({ error: "Name the law whose exemptions the cover letter cites." })
    .trim()
    .min(1, "Name the law whose exemptions the cover letter cites.")
    .max(300, "At most 300 characters."),
  // Optional so that a form from before the fields existed keeps the stored intervals.
  accuracyTestIntervalMonths: z
    .number({ error: "Give the interval in whole months." })
    .int("Give the interval in whole months.")
    .min(1, "At least 1 month.")
    .max(60, "At most 60 months.")
    .optional(),
  flushIntervalDays: z
    .number({ error: "Give the interval in whole days." })
    .int("Give the interval in whole days.")
    .min(1, "At least 1 day.")
    .max(730, "At most 730 days.")
    .optional(),
  // Optional so that a form from before the stock settings existed keeps the stored values.
  qualitySampleIntervalMonths: z
    .number({ error: "Give the interval in whole months, as a number." })
    .int("Give the interval in whole months.")
    .min(1, "At least 1 month.")
    .max(60, "At most 60 months.")
    .optional(),
  classBAttackSolutionGpm: z
    .number({ error: "Give the attack flow in gpm, as a number." })
    .gt(0, "The flow must be more than 0 gpm.")
    .max(5000, "At most 5,000 gpm.")
    .refine((value) => decimals(value, 2), "At most two decimals.")
    .optional(),
  classBAttackPercent: z
    .number({ error: "Give the percentage as a number." })
    .gt(0, "The percentage must be more than 0 %.")
    .max(10, "At most 10 %.")
    .refine((value) => decimals(value, 2), "At most two decimals.")
    .optional(),
  /** A checkbox: present ("on") when ticked, absent when not. */
  releaseAlertsToChief: z.preprocess((value) => value === "on" || value === true || value === "true", z.boolean()),
});

export type AgencySettingsInput = z.infer<typeof AgencySettingsSchema>;

export const feetFromMetres = (metres: number) => metres / METRES_PER_FOOT;

/** The agency settings as stored and shown. */
export type AgencySettings = {
  name: string;
  timeZone: string;
  displayUnits: "us" | "metric";
  /** The prefix of generated incident numbers (AB-2026-0042). */
  eventNumberPrefix: string;
  waterwayBufferM: number;
  drawdownToleranceShare: number;
  pfasReportableLb: number;
  classAAccuracyShare: number;
  /** Foam systems: months between accuracy tests, days between scheduled flushes. */
  accuracyTestIntervalMonths: number;
  flushIntervalDays: number;
  reportRecipients: string[];
  releaseAlertRecipients: string[];
  /** Whether release alerts also go to every active chief. */
  releaseAlertsToChief: boolean;
  /** Public-records requests: the due-date rule (a key of RECORDS_DUE_RULES), office closing time, closure days. */
  recordsDueRule: string;
  recordsOfficeCloses: string;
  recordsClosureDays: string[];
  /** The rule the cover letter of a release package names for what is withheld. */
  recordsWithholdingRule: string;
  /** Attachments: the largest file, the most files on one event, and days a removed file is kept. */
  attachmentMaxMb: number;
  attachmentsPerEvent: number;
  attachmentRetentionDays: number;
  /** Months between quality samples of a lot in stock (NFPA 11 §13.2.6 periodic samples). */
  qualitySampleIntervalMonths: number;
  /** The typical Class B attack readiness is measured in: foam-solution flow and percentage. */
  classBAttackSolutionGpm: number;
  classBAttackPercent: number;
  updatedAt: string | null;
  /** A fingerprint of the stored row: a save names the version it started from. */
  version: string;
};
