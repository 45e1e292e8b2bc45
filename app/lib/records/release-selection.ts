import { z } from "zod";
import { EVENT_KINDS, FOAM_CLASSES } from "~/lib/foam/vocabulary";

const optionalDate = z
  .string()
  .trim()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "Give a date as YYYY-MM-DD.")
  .optional();

/** The clerk's choice of records and redactions for a release package (preview and build share it). */
export const ReleaseSelectionSchema = z.object({
  from: optionalDate,
  to: optionalDate,
  kind: z.enum(EVENT_KINDS).optional(),
  station: z.number().int().positive().optional(),
  foamClass: z.enum(FOAM_CLASSES).optional(),
  basin: z.string().trim().max(120).optional(),
  radiusM: z
    .number({ error: "Give the radius in metres." })
    .positive("More than 0 m.")
    .max(50_000, "At most 50,000 m.")
    .optional(),
  // Checkboxes: present means keep the redaction on. The build form sends all three by default.
  redactPersonnel: z.literal("on").optional(),
  redactNotes: z.literal("on").optional(),
  redactLocations: z.literal("on").optional(),
});

export const BuildPackageSchema = ReleaseSelectionSchema.extend({ intent: z.literal("build") });

export const SendPackageSchema = z.object({
  intent: z.literal("send"),
  packageId: z.number().int().positive(),
  status: z.enum(["fulfilled", "partly_withheld"], { error: "Choose how the request closes." }),
});
