import { z } from "zod";
import { isWallClock, wallClockToInstant } from "../time-zone";
import { FLOW_UNITS } from "./units";
import {
  APPLICATION_METHODS,
  DISPOSITIONS,
  EVENT_KIND_LABELS,
  EVENT_KINDS,
  FLOW_BASES,
  INCIDENT_TYPE_LABELS,
  INCIDENT_TYPES,
  INCIDENT_TYPES_BY_KIND,
  PERCENT_OF,
} from "./vocabulary";

export const MAX_DISCHARGE_MINUTES = 24 * 60;
export const MAX_LINES = 200;
export const MAX_RUNOFF_LINES = 12;
export const MAX_TANK_READINGS = 20;

const positiveNumber = (label: string, max: number) =>
  z
    .number({ error: `Enter the ${label} as a number.` })
    .refine(Number.isFinite, `Enter the ${label} as a number.`)
    .refine((value) => value > 0, `The ${label} must be more than 0.`)
    .refine((value) => value <= max, `The ${label} must be at most ${max.toLocaleString("en-US")}.`);

const optionalNonNegative = (label: string, max: number) =>
  z
    .number({ error: `Enter the ${label} as a number.` })
    .refine((value) => value >= 0, `The ${label} cannot be negative.`)
    .refine((value) => value <= max, `The ${label} must be at most ${max.toLocaleString("en-US")}.`)
    .optional();

const percent = z
  .number({ error: "Enter the percent as a number." })
  .refine((value) => value > 0, "The percent must be more than 0.")
  .refine((value) => value < 100, "The percent must be less than 100.");

const flowUnit = z.enum(FLOW_UNITS, { error: "Choose gpm or L/min." });
const flowBasis = z.enum(FLOW_BASES, { error: "Choose whether the flow is water or foam solution." });
const percentOf = z.enum(PERCENT_OF, { error: "Choose whether the percent is of the foam solution or of the water." });
const id = z.number().int().positive();

/**
 * Cross-field checks run even when a field of the line or report has already failed, so that the
 * first filing attempt names every problem at once. Their values may then be partly unparsed: each
 * check looks only at values of the type it needs.
 */
const everyCheck = { when: () => true };
/**
 * A line's own checks run even when its fields failed (`everyCheck`), so through the JSON API they
 * may be handed a line that is null; the object check has refused it at the line already.
 */
const isMissing = (line: unknown): line is null | undefined => line == null;
const isNumber = (value: unknown): value is number => typeof value === "number" && Number.isFinite(value);

/** One discharge as the totals API takes it. */
export const TotalsDischargeSchema = z.object({
  flow: positiveNumber("flow", 100_000),
  flowUnit,
  basis: flowBasis,
  percent: percent.nullable().optional(),
  /** Absent: a share of water on a water basis, of solution on a solution basis. */
  percentOf: percentOf.optional(),
  minutes: positiveNumber("duration in minutes", MAX_DISCHARGE_MINUTES),
  productId: id.nullable().optional(),
  apparatusId: id.nullable().optional(),
  /** The outlet names the apparatus's foam system, whose limits the warnings use. */
  outlet: z.string().trim().max(60, "The outlet name has at most 60 characters.").optional(),
});

export const TotalsRequestSchema = z.object({
  discharges: z
    .array(TotalsDischargeSchema, { error: "Send a list of discharges." })
    .min(1, "Send at least one discharge.")
    .max(MAX_LINES, `Send at most ${MAX_LINES} discharges.`),
});

/** `discharges.0.percent`-style keys, as the API reports field errors. */
export function fieldErrors(error: z.ZodError): Record<string, string[]> {
  const errors: Record<string, string[]> = {};
  for (const issue of error.issues) {
    const key = issue.path.join(".") || "_";
    (errors[key] ??= []).push(issue.message);
  }
  return errors;
}

const text = (max: number, label: string) =>
  z.string().trim().max(max, `The ${label} has at most ${max} characters.`).optional();

const localDateTime = (label: string) =>
  z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/, `Enter the ${label} as a date and time.`)
    .refine(isWallClock, `Enter a real date and time for the ${label}.`)
    .optional();

/**
 * Minutes between two local date-times typed in the form, or null. With the agency's time zone they
 * are turned into instants first, so a span across a daylight-saving change is what the clock on the
 * wall did not show: 01:30 → 03:10 on 8 March 2026 in America/Chicago is 40 minutes, as clocks jumped
 * from 02:00 CST to 03:00 CDT (the IANA time-zone database's rule for America/Chicago, 15 U.S.C. 260a).
 * Without a zone the two are read as UTC, which is right everywhere but across such a change.
 */
export function minutesBetween(start?: string, end?: string, timeZone?: string): number | null {
  if (!start || !end) return null;
  if (timeZone) {
    const from = wallClockToInstant(start, timeZone);
    const to = wallClockToInstant(end, timeZone);
    if (from && to) return (to.getTime() - from.getTime()) / 60_000;
  }
  return (Date.parse(`${end}Z`) - Date.parse(`${start}Z`)) / 60_000;
}

/**
 * A line comes from one of our apparatus or from another agency's unit, named by both its agency and
 * its unit id; never both, since the other agency's foam system is not ours to check.
 */
export function mutualAidIssues(line: {
  apparatusId?: number;
  mutualAidAgency?: string;
  mutualAidUnit?: string;
}): Array<{ path: string[]; message: string }> {
  const agency = Boolean(line.mutualAidAgency);
  const unit = Boolean(line.mutualAidUnit);
  if (!agency && !unit) return [];
  const issues: Array<{ path: string[]; message: string }> = [];
  if (line.apparatusId) {
    issues.push({
      path: ["apparatusId"],
      message: "Choose one of our apparatus or name another agency's unit, not both.",
    });
  }
  if (!agency) issues.push({ path: ["mutualAidAgency"], message: "Name the agency the mutual-aid unit came from." });
  if (!unit) issues.push({ path: ["mutualAidUnit"], message: "Give the mutual-aid unit's id, e.g. E41." });
  return issues;
}

export const DischargeLineSchema = z
  .object({
    apparatusId: id.optional(),
    outlet: text(60, "outlet name"),
    productId: id.optional(),
    percent: percent.optional(),
    percentOf: percentOf.optional(),
    flow: positiveNumber("flow", 100_000),
    flowUnit,
    basis: flowBasis,
    startedAt: localDateTime("start time"),
    endedAt: localDateTime("end time"),
    minutes: positiveNumber("duration in minutes", MAX_DISCHARGE_MINUTES).optional(),
    method: z.enum(APPLICATION_METHODS, { error: "Choose an application method from the list." }).optional(),
    airFlowCfm: optionalNonNegative("air flow", 10_000),
    /** Another agency's unit (mutual aid): its name and unit id as typed; no apparatus of ours. */
    mutualAidAgency: text(120, "mutual-aid agency name"),
    mutualAidUnit: text(24, "mutual-aid unit id"),
    // Why a product held for disposal was used all the same (required then; checked when filed).
    heldUseReason: text(500, "reason for using foam held for disposal"),
  })
  .superRefine((line, ctx) => {
    if (isMissing(line)) return;
    mutualAidIssues(line).forEach((issue) => ctx.addIssue({ code: "custom", ...issue }));
    if (line.productId && line.percent == null) {
      ctx.addIssue({ code: "custom", path: ["percent"], message: "Enter the percent for a foam line." });
    }
    const timed = minutesBetween(line.startedAt, line.endedAt);
    if (line.minutes == null && timed == null) {
      ctx.addIssue({ code: "custom", path: ["minutes"], message: "Enter a duration, or a start and end time." });
    }
    if (timed != null && line.minutes == null) {
      if (timed <= 0) ctx.addIssue({ code: "custom", path: ["endedAt"], message: "The end must be after the start." });
      else if (timed > MAX_DISCHARGE_MINUTES) {
        ctx.addIssue({ code: "custom", path: ["endedAt"], message: "A discharge cannot last more than 24 hours." });
      }
    }
  }, everyCheck);

export type DischargeLine = z.infer<typeof DischargeLineSchema>;

/** The duration of a line: minutes as typed, or the span of its start and end times in `timeZone`. */
export function lineMinutes(line: Pick<DischargeLine, "minutes" | "startedAt" | "endedAt">, timeZone?: string): number {
  return line.minutes ?? minutesBetween(line.startedAt, line.endedAt, timeZone) ?? 0;
}

export const DispositionLineSchema = z
  .object({
    disposition: z.enum(DISPOSITIONS, { error: "Choose where this runoff went." }),
    sharePercent: z
      .number({ error: "Enter the share as a number." })
      .refine((value) => value > 0 && value <= 100, "A share is more than 0 and at most 100 %.")
      .optional(),
    volumeGal: optionalNonNegative("volume", 10_000_000),
    receivingWater: text(120, "receiving water"),
    disposalReference: text(160, "disposal reference"),
    sewerNotice: text(200, "treatment-works notice"),
  })
  .superRefine((line, ctx) => {
    if (isMissing(line)) return;
    if (line.sharePercent == null && line.volumeGal == null) {
      ctx.addIssue({ code: "custom", path: ["sharePercent"], message: "Enter a share in % or a volume in gallons." });
    }
    if (line.sharePercent != null && line.volumeGal != null) {
      ctx.addIssue({ code: "custom", path: ["volumeGal"], message: "Enter a share or a volume, not both." });
    }
    if (line.disposition === "contained" && !line.disposalReference) {
      ctx.addIssue({
        code: "custom",
        path: ["disposalReference"],
        message: "Give the disposal record (manifest, ticket or drum number) for contained runoff.",
      });
    }
    if (line.disposition === "surface_water" && !line.receivingWater) {
      ctx.addIssue({
        code: "custom",
        path: ["receivingWater"],
        message: "Name the creek, pond or river the runoff reached.",
      });
    }
    if (line.disposition === "sanitary_sewer" && !line.sewerNotice) {
      ctx.addIssue({
        code: "custom",
        path: ["sewerNotice"],
        message: "Say who at the treatment works was told, and when.",
      });
    }
  }, everyCheck);

export const TankReadingLineSchema = z
  .object({
    apparatusId: id.optional(),
    productId: id.optional(),
    refillGal: optionalNonNegative("refill amount", 100_000),
    levelBeforeGal: optionalNonNegative("level before", 100_000),
    levelAfterGal: optionalNonNegative("level after", 100_000),
  })
  .superRefine((line, ctx) => {
    if (isMissing(line)) return;
    const levels = isNumber(line.levelBeforeGal) && isNumber(line.levelAfterGal);
    if (line.refillGal == null && !levels) {
      ctx.addIssue({ code: "custom", path: ["refillGal"], message: "Enter the refill amount, or both tank levels." });
    }
    if (levels && line.levelAfterGal! > line.levelBeforeGal!) {
      ctx.addIssue({
        code: "custom",
        path: ["levelAfterGal"],
        message: "The level after use cannot be above the level before.",
      });
    }
  }, everyCheck);

/** The report as filed: every rule applies. Drafts are kept as typed (see `DraftReportSchema`). */
export const FiledReportSchema = z
  .object({
    // Blank: the next number of the kind's series is given when the report is saved.
    number: z
      .string()
      .trim()
      .max(32, "An event number has at most 32 characters.")
      .regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, "Use letters, digits, and . _ / - only.")
      .optional(),
    kind: z.enum(EVENT_KINDS, { error: "Choose what kind of event this was." }),
    // Blank: a training, test or flush takes the kind's own type; an incident's stays not recorded.
    incidentType: z.enum(INCIDENT_TYPES, { error: "Choose the incident type from the list." }).optional(),
    dispatchNumber: z
      .string()
      .trim()
      .max(32, "A dispatch number has at most 32 characters.")
      .regex(/^[A-Za-z0-9][A-Za-z0-9 ._/:-]*$/, "Use letters, digits, spaces and . _ / : - only.")
      .optional(),
    startedAt: z.string({ error: "Enter when the event started." }).pipe(localDateTime("start time").unwrap()),
    clearedAt: localDateTime("clear time"),
    address: z
      .string({ error: "Enter the address or location." })
      .trim()
      .min(1, "Enter the address or location.")
      .max(200, "An address has at most 200 characters."),
    latitude: z
      .number({ error: "Place the event on the map, or enter its latitude." })
      .refine((value) => value >= -90 && value <= 90, "Latitude is between -90 and 90."),
    longitude: z
      .number({ error: "Place the event on the map, or enter its longitude." })
      .refine((value) => value >= -180 && value <= 180, "Longitude is between -180 and 180."),
    stationId: z.number({ error: "Choose the station." }).int().positive(),
    narrative: text(10_000, "narrative"),
    discharges: z
      .array(DischargeLineSchema, { error: "Add at least one discharge." })
      .min(1, "Add at least one discharge.")
      .max(MAX_LINES, `A report has at most ${MAX_LINES} discharges.`),
    dispositions: z
      .array(DispositionLineSchema, { error: "Say where the runoff went." })
      .min(1, "Say where the runoff went.")
      .max(MAX_RUNOFF_LINES, `At most ${MAX_RUNOFF_LINES} runoff lines.`),
    tankReadings: z
      .array(TankReadingLineSchema)
      .max(MAX_TANK_READINGS, `At most ${MAX_TANK_READINGS} tank readings.`)
      .optional(),
  })
  .superRefine((report, ctx) => {
    // Every check runs even when a field failed: a kind or type that failed its own check is skipped.
    const allowed = Object.hasOwn(INCIDENT_TYPES_BY_KIND, report.kind) ? INCIDENT_TYPES_BY_KIND[report.kind] : null;
    const type = report.incidentType;
    if (allowed && type && Object.hasOwn(INCIDENT_TYPE_LABELS, type) && !allowed.includes(type)) {
      ctx.addIssue({
        code: "custom",
        path: ["incidentType"],
        message: `${INCIDENT_TYPE_LABELS[type]} is not a type of ${EVENT_KIND_LABELS[report.kind].toLowerCase()}; choose ${allowed.map((type) => INCIDENT_TYPE_LABELS[type]).join(" or ")}, or change the kind.`,
      });
    }
    const window = minutesBetween(report.startedAt, report.clearedAt);
    if (window != null && window < 0) {
      ctx.addIssue({ code: "custom", path: ["clearedAt"], message: "The clear time must be after the start." });
    }
    const dispositions = Array.isArray(report.dispositions) ? report.dispositions.filter(Boolean) : [];
    const shares = dispositions.filter((line) => line.sharePercent != null);
    const volumes = dispositions.filter((line) => line.volumeGal != null);
    if (shares.length && volumes.length) {
      ctx.addIssue({
        code: "custom",
        path: ["dispositions"],
        message: "Give every runoff line as a share, or every line as a volume — not a mix.",
      });
    } else if (shares.length && shares.every((line) => isNumber(line.sharePercent))) {
      const sum = shares.reduce((total, line) => total + line.sharePercent!, 0);
      if (Math.abs(sum - 100) > 0.01) {
        ctx.addIssue({
          code: "custom",
          path: ["dispositions"],
          message: `The runoff shares add up to ${Number(sum.toFixed(2))} %; they must add up to 100 %.`,
        });
      }
    }
  }, everyCheck);

export type FiledReport = z.infer<typeof FiledReportSchema>;

/** A draft is kept exactly as typed: nothing in it is refused. */
export const DraftPayloadSchema = z.looseObject({});

/** Which form action was asked for. Revisions of accepted reports need a reason. */
export const ReportIntentSchema = z.object({
  intent: z.enum(["save-draft", "file"], { error: "Choose to save a draft or to file." }),
  version: z.number().int().positive().optional(),
  submissionKey: z.string().regex(/^[A-Za-z0-9-]{8,64}$/, "The form is out of date; reload it."),
  revisionReason: z.string().trim().max(500, "A reason has at most 500 characters.").optional(),
});

/** Every key the report form sends, as typed or filed: what a stored draft may hold. */
export const REPORT_FORM_SCHEMAS = [FiledReportSchema, ReportIntentSchema];

export const ReviewSchema = z
  .object({
    decision: z.enum(["accept", "return"], { error: "Choose to accept or return the report." }),
    version: z.number({ error: "The page is out of date; reload it." }).int().positive(),
    comment: z.string().trim().max(2000, "A comment has at most 2,000 characters.").optional(),
  })
  .superRefine((review, ctx) => {
    if (review.decision === "return" && !review.comment) {
      ctx.addIssue({ code: "custom", path: ["comment"], message: "Say what the officer should fix." });
    }
  });
