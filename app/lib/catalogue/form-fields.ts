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

/** A number field, blank for null; `problem` names what is wrong with a number, or null when it will do. */
const optionalNumberWith = (problem: (number: number) => string | null) =>
  z
    .string()
    .trim()
    .optional()
    .transform((value, ctx) => {
      if (!value) return null;
      const number = Number(value);
      const message = problem(Number.isFinite(number) ? number : Number.NaN);
      if (message) {
        ctx.addIssue({ code: "custom", message });
        return z.NEVER;
      }
      return number;
    });

/** A number of zero or more (above zero with `positive`), at most `max`; blank is null. */
export const optionalNumber = (label: string, { max = 1_000_000, positive = false } = {}) =>
  optionalNumberWith((number) => {
    if (Number.isNaN(number) || number < 0 || (positive && number === 0)) {
      return `${label} must be a number ${positive ? "above zero" : "of zero or more"}.`;
    }
    return number > max ? `${label} is at most ${max.toLocaleString("en-US", { maximumFractionDigits: 6 })}.` : null;
  });

/** A decimal-degree coordinate from -`limit` to `limit`; blank is null. */
export const coordinate = (label: string, limit: number) =>
  optionalNumberWith((number) =>
    Number.isNaN(number) || number < -limit || number > limit
      ? `${label} is a number from -${limit} to ${limit}.`
      : null,
  );
