import { z } from "zod";
import { isCalendarDay } from "../time-zone";

/** The longest description a request may carry. */
export const DESCRIPTION_MAX = 4_000;

const optionalText = (max: number, label: string) =>
  z
    .string()
    .trim()
    .max(max, `${label}: at most ${max} characters.`)
    .optional()
    .transform((text) => (text ? text : undefined));

const isoDate = (label: string) =>
  z
    .string()
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}$/, `${label}: give a date as YYYY-MM-DD.`)
    .refine(isCalendarDay, `${label}: not a real date.`)
    .optional();

const coordinate = (min: number, max: number, label: string) =>
  z
    .number({ error: `${label}: give a number.` })
    .min(min, `${label}: between ${min} and ${max}.`)
    .max(max, `${label}: between ${min} and ${max}.`)
    .optional();

/** The public request form: the browser (conform) and the server (parseWithZod) share it. */
export const RecordsRequestSchema = z
  .object({
    name: z.string({ error: "Give your name." }).trim().min(1, "Give your name.").max(200, "At most 200 characters."),
    email: z
      .string({ error: "Give an e-mail address for the answer." })
      .trim()
      .max(254, "At most 254 characters.")
      .pipe(z.email("Not an e-mail address.")),
    phone: optionalText(40, "Phone"),
    organisation: optionalText(200, "Organisation"),
    description: z
      .string({ error: "Say which records you ask for." })
      .trim()
      .min(10, "Say which records you ask for (at least 10 characters).")
      .max(DESCRIPTION_MAX, `At most ${DESCRIPTION_MAX.toLocaleString("en-US")} characters.`),
    from: isoDate("From"),
    to: isoDate("To"),
    address: optionalText(300, "Address"),
    lat: coordinate(-90, 90, "Latitude"),
    lon: coordinate(-180, 180, "Longitude"),
    // Left empty by people; filled by form-filling robots (hidden from view and from screen readers).
    website: z.string().max(200).optional(),
  })
  .superRefine((value, context) => {
    if (value.from && value.to && value.from > value.to) {
      context.addIssue({ code: "custom", path: ["to"], message: "The end of the range is before its start." });
    }
    if ((value.lat === undefined) !== (value.lon === undefined)) {
      context.addIssue({ code: "custom", path: ["lon"], message: "Give both latitude and longitude, or neither." });
    }
  });

export type RecordsRequestInput = z.infer<typeof RecordsRequestSchema>;
