import { z } from "zod";
import { decimalColumnMax } from "../column-bounds";
import { FOAM_CLASSES, FOAM_TYPES, PFAS_CONTENT_UNITS } from "../foam/vocabulary";
import { checkbox, optionalNumber, optionalText } from "./form-fields";

/** Largest safety sheet accepted, in bytes. */
export const SAFETY_SHEET_MAX_BYTES = 10 * 1024 * 1024;

/** "3, 6" → [3, 6]; null when any part is not a percentage between 0 and 100 (exclusive). */
export function parseNominalPercents(text: string): number[] | null {
  const parts = text
    .split(/[,;\s]+/)
    .map((part) => part.replace(/%$/, "").trim())
    .filter(Boolean);
  const values = parts.map(Number);
  if (values.some((value) => !Number.isFinite(value) || value <= 0 || value >= 100)) return null;
  return [...new Set(values)].sort((a, b) => a - b);
}

export const ProductFormSchema = z
  .object({
    name: z
      .string({ error: "Enter the product's name." })
      .trim()
      .min(1, "Enter the product's name.")
      .max(120, "A name has at most 120 characters."),
    maker: optionalText(120, "The maker"),
    foamClass: z.enum(FOAM_CLASSES, { error: "Choose Class A or Class B." }),
    foamType: z.enum(FOAM_TYPES, { error: "Choose the foam type." }),
    nominalPercents: z
      .string({ error: "Enter at least one nominal percentage, e.g. 3 or 3, 6." })
      .trim()
      .transform((value, ctx) => {
        const parsed = parseNominalPercents(value);
        if (!parsed || parsed.length === 0) {
          ctx.addIssue({
            code: "custom",
            message: "Enter percentages above 0 and below 100, separated by commas, e.g. 3, 6.",
          });
          return z.NEVER;
        }
        return parsed;
      }),
    pfasContaining: checkbox,
    pfasContent: optionalNumber("The PFAS content", { max: decimalColumnMax("foam_products.pfas_content") }),
    pfasContentUnit: z.enum(PFAS_CONTENT_UNITS, { error: "Choose a unit for the PFAS content." }).optional(),
    pfoaContent: optionalNumber("The PFOA content", { max: Infinity }),
    pfoaContentUnit: z.enum(PFAS_CONTENT_UNITS, { error: "Choose a unit for the PFOA content." }).optional(),
    pfosContent: optionalNumber("The PFOS content", { max: Infinity }),
    pfosContentUnit: z.enum(PFAS_CONTENT_UNITS, { error: "Choose a unit for the PFOS content." }).optional(),
    pfasContentBasis: optionalText(2000, "The basis"),
    pfasContentSource: optionalText(2000, "The source"),
    unitCostPerGal: optionalNumber("The unit cost", { max: decimalColumnMax("foam_products.unit_cost_per_gal") }),
    active: checkbox,
    // Legacy foam waiting for a hauler: in stock it only goes to disposal; a report says why it was used.
    heldForDisposal: checkbox,
    shelfLifeMonths: optionalNumber("The shelf life in months", { max: 600, positive: true }).refine(
      (value) => value == null || Number.isInteger(value),
      "Give the shelf life in whole months.",
    ),
    notes: optionalText(4000, "The notes"),
    safetySheet: z
      .file({ error: "Choose a PDF file." })
      .max(SAFETY_SHEET_MAX_BYTES, `A safety sheet is at most ${SAFETY_SHEET_MAX_BYTES / 1024 / 1024} MB.`)
      .mime(["application/pdf"], "A safety sheet must be a PDF file.")
      .optional(),
  })
  .superRefine((value, ctx) => {
    if (value.foamClass === "A" && value.foamType !== "class-a" && value.foamType !== "other") {
      ctx.addIssue({ code: "custom", path: ["foamType"], message: "A Class A product has type Class A or Other." });
    }
    if (value.foamClass === "B" && value.foamType === "class-a") {
      ctx.addIssue({ code: "custom", path: ["foamType"], message: "Choose a Class B type for a Class B product." });
    }
    if (value.pfasContent != null && !value.pfasContentUnit) {
      ctx.addIssue({ code: "custom", path: ["pfasContentUnit"], message: "Choose a unit for the PFAS content." });
    }
    if (value.pfasContent != null && !value.pfasContentSource) {
      ctx.addIssue({
        code: "custom",
        path: ["pfasContentSource"],
        message: "Name where the PFAS figure comes from (safety sheet, lab report, estimate).",
      });
    }
    if (value.pfasContent != null && value.pfasContent > 0 && !value.pfasContaining) {
      ctx.addIssue({
        code: "custom",
        path: ["pfasContaining"],
        message: "A product with a PFAS content above zero is PFAS-containing.",
      });
    }
    for (const substance of ["pfoa", "pfos"] as const) {
      const content = value[`${substance}Content`];
      const label = substance.toUpperCase();
      if (content == null) continue;
      if (!value[`${substance}ContentUnit`]) {
        ctx.addIssue({
          code: "custom",
          path: [`${substance}ContentUnit`],
          message: `Choose a unit for the ${label} content.`,
        });
      }
      if (!value.pfasContentSource) {
        ctx.addIssue({
          code: "custom",
          path: ["pfasContentSource"],
          message: `Name where the ${label} figure comes from (safety sheet, lab report, estimate).`,
        });
      }
      if (content > 0 && !value.pfasContaining) {
        ctx.addIssue({
          code: "custom",
          path: ["pfasContaining"],
          message: `A product with ${label} above zero is PFAS-containing.`,
        });
      }
    }
    if (value.pfasContentUnit === "percent_w_w" && value.pfasContent != null && value.pfasContent > 100) {
      ctx.addIssue({ code: "custom", path: ["pfasContent"], message: "A share by weight is at most 100 %." });
    }
  });

export type ProductFormValue = z.infer<typeof ProductFormSchema>;
