import { z } from "zod";
import { isWallClock } from "../time-zone";
import { AccuracyTestInputSchema, MAX_CALIBRATION_POINTS, type AccuracyTestInput } from "./accuracy-test";
import {
  ACCURACY_TEST_METHODS,
  FLUSH_REASONS,
  FOAM_CLASSES,
  FOAM_SYSTEM_TYPES,
  MAINTENANCE_KINDS,
  PERCENT_OF,
} from "./vocabulary";

/** The forms of a foam system's page: its maintenance records and accuracy tests, and its own figures. */

const localDateTime = (label: string) =>
  z
    .string({ error: `Enter the ${label}.` })
    .regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/, `Enter the ${label} as a date and time.`)
    .refine(isWallClock, `Enter a real date and time for the ${label}.`);

const text = (max: number, label: string) =>
  z.string().trim().max(max, `The ${label} has at most ${max} characters.`).optional();

const amount = (label: string, max: number) =>
  z
    .number({ error: `Enter the ${label} as a number.` })
    .refine(Number.isFinite, `Enter the ${label} as a number.`)
    .refine((value) => value >= 0, `The ${label} cannot be negative.`)
    .refine((value) => value <= max, `The ${label} must be at most ${max.toLocaleString("en-US")}.`)
    .optional();

const id = z.number().int().positive();

export const MaintenanceFormSchema = z
  .object({
    intent: z.literal("maintenance"),
    kind: z.enum(MAINTENANCE_KINDS, { error: "Choose what was done." }),
    flushReason: z.enum(FLUSH_REASONS, { error: "Choose why the system was flushed." }).optional(),
    performedAt: localDateTime("date and time it was done"),
    notes: text(2000, "notes"),
    waterGal: amount("water used (gal)", 100_000),
    concentrateDisposedGal: amount("concentrate sent to disposal (gal)", 10_000),
    eventNumber: text(32, "usage report number"),
    fromProductId: id.optional(),
    toProductId: id.optional(),
    rinseProcedure: text(4000, "rinse procedure"),
    verificationResult: text(200, "verification sample result"),
  })
  .superRefine((value, ctx) => {
    if (value.kind === "flush" && !value.flushReason) {
      ctx.addIssue({ code: "custom", path: ["flushReason"], message: "Choose why the system was flushed." });
    }
    if (value.kind === "changeover" && !value.toProductId) {
      ctx.addIssue({ code: "custom", path: ["toProductId"], message: "Choose the product now loaded." });
    }
  });
export type MaintenanceFormValue = z.infer<typeof MaintenanceFormSchema>;

const optionalReading = (label: string) =>
  z
    .number({ error: `Enter the ${label} as a number.` })
    .refine(Number.isFinite, `Enter the ${label} as a number.`)
    .optional();

/**
 * The test form: every method's fields, of which the chosen method's are checked by the compute
 * API's own schema (`AccuracyTestInputSchema`), so a reading is refused here as it is there.
 */
export const AccuracyTestFormSchema = z
  .object({
    intent: z.literal("test"),
    testedAt: localDateTime("date and time of the test"),
    method: z.enum(ACCURACY_TEST_METHODS, { error: "Choose the method." }),
    foamClass: z.enum(FOAM_CLASSES, { error: "Choose Class A or Class B." }),
    productId: id.optional(),
    ratedPercent: z.number({ error: "Enter the rated percent as a number." }),
    setPercent: amount("set percent", 99),
    waterFlowGpm: amount("water flow (gpm)", 100_000),
    calibration: z
      .array(z.object({ percent: optionalReading("calibration percent"), reading: optionalReading("reading") }))
      .max(MAX_CALIBRATION_POINTS)
      .optional(),
    sampleReading: optionalReading("sample reading"),
    concentrateGal: optionalReading("concentrate drawn (gal)"),
    waterGal: optionalReading("metered water (gal)"),
    notes: text(2000, "notes"),
  })
  .superRefine((value, ctx) => {
    const parsed = AccuracyTestInputSchema.safeParse(accuracyInputCandidate(value));
    if (parsed.success) return;
    for (const issue of parsed.error.issues) {
      ctx.addIssue({ code: "custom", path: issue.path.length ? issue.path : ["method"], message: issue.message });
    }
  });
export type AccuracyTestFormValue = z.infer<typeof AccuracyTestFormSchema>;

function accuracyInputCandidate(value: {
  method: string;
  foamClass: string;
  ratedPercent: number;
  calibration?: Array<{ percent?: number; reading?: number }>;
  sampleReading?: number;
  concentrateGal?: number;
  waterGal?: number;
}): unknown {
  const common = { method: value.method, foamClass: value.foamClass, ratedPercent: value.ratedPercent };
  if (value.method === "flow") return { ...common, concentrateGal: value.concentrateGal, waterGal: value.waterGal };
  return {
    ...common,
    // Rows left blank are not mixes; a half-filled row is sent as it is, to be refused at its field.
    calibration: (value.calibration ?? []).filter((row) => row.percent != null || row.reading != null),
    sampleReading: value.sampleReading,
  };
}

/** The readings of a valid test form, as the computation takes them. */
export function accuracyInputOf(value: AccuracyTestFormValue): AccuracyTestInput {
  return AccuracyTestInputSchema.parse(accuracyInputCandidate(value));
}

const rate = (label: string) => amount(label, 100_000);

export const FoamSystemFormSchema = z
  .object({
    name: z
      .string({ error: "Enter a name for the system." })
      .trim()
      .min(1, "Enter a name for the system.")
      .max(80, "The name has at most 80 characters."),
    systemType: z.enum(FOAM_SYSTEM_TYPES, { error: "Choose the kind of system." }),
    percentOf: z.enum(PERCENT_OF, { error: "Choose what the controller's percentage is a share of." }),
    minConcentrateGpm: rate("minimum concentrate rate"),
    maxConcentrateGpm: rate("maximum concentrate rate"),
    waterFlowMinGpm: rate("lowest water flow"),
    waterFlowMaxGpm: rate("highest water flow"),
    tankName: text(60, "tank name"),
    tankCapacityGal: amount("tank capacity (gal)", 100_000),
    tankProductId: id.optional(),
    outlets: text(600, "outlets served"),
    active: z.boolean().optional(),
  })
  .superRefine((value, ctx) => {
    if (value.minConcentrateGpm != null && value.maxConcentrateGpm != null) {
      if (value.minConcentrateGpm > value.maxConcentrateGpm) {
        ctx.addIssue({ code: "custom", path: ["minConcentrateGpm"], message: "The minimum is above the maximum." });
      }
    }
    if (value.waterFlowMinGpm != null && value.waterFlowMaxGpm != null) {
      if (value.waterFlowMinGpm > value.waterFlowMaxGpm) {
        ctx.addIssue({ code: "custom", path: ["waterFlowMinGpm"], message: "The lowest flow is above the highest." });
      }
    }
  });
export type FoamSystemFormValue = z.infer<typeof FoamSystemFormSchema>;

/** The outlets a system serves, typed as a comma-separated list of the apparatus's outlet names. */
export function splitOutletNames(text: string | undefined): string[] {
  return [
    ...new Set(
      (text ?? "")
        .split(",")
        .map((name) => name.trim())
        .filter(Boolean),
    ),
  ];
}
