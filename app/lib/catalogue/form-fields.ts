import { z } from "zod";

/** The zod pieces the catalogue forms (products, stations, apparatus) share. */

/** A checkbox: "on" (or "true") when ticked, absent otherwise. */
export const checkbox = z.preprocess((value) => value === "on" || value === "true", z.boolean());

/** Free text of at most `max` characters, trimmed; blank is null. */
export const optionalText = (max: number, label: string) =>
  z
    .string()
    .trim()
    .max(max, `${label} has at most ${max} characters.`)
    .optional()
    .transform((value) => value || null);

/** A number of zero or more (above zero with `positive`), at most `max`; blank is null. */
export const optionalNumber = (label: string, { max = 1_000_000, positive = false } = {}) =>
  z
    .string()
    .trim()
    .optional()
    .transform((value, ctx) => {
      if (!value) return null;
      const number = Number(value);
      if (!Number.isFinite(number) || number < 0 || (positive && number === 0)) {
        ctx.addIssue({
          code: "custom",
          message: `${label} must be a number ${positive ? "above zero" : "of zero or more"}.`,
        });
        return z.NEVER;
      }
      if (number > max) {
        ctx.addIssue({ code: "custom", message: `${label} is at most ${max.toLocaleString("en-US")}.` });
        return z.NEVER;
      }
      return number;
    });
