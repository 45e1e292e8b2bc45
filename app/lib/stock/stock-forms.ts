// The stock book's forms and API queries: one zod schema each, for conform in the browser and for
// `parseWithZod` / the bounded reader on the server.
import { z } from "zod";
import { STOCK_CONTAINERS, STOCK_LOCATION_KINDS, STOCK_MOVEMENT_KINDS } from "../foam/vocabulary";
import { MAX_RECORD_ID, recordIdOf } from "../record-id";
import { isCalendarDay, isWallClock } from "../time-zone";
import { MAX_MOVEMENT_GAL } from "./ledger";

const id = (what: string) =>
  z
    .number({ error: `Choose ${what} from the list.` })
    .int(`Choose ${what} from the list.`)
    .positive(`Choose ${what} from the list.`)
    .max(MAX_RECORD_ID, `Choose ${what} from the list.`);

const gallons = (what: string) =>
  z
    .number({ error: `Enter the ${what} in gallons as a number.` })
    .gt(0, `Enter ${what === "quantity" ? "a quantity" : `the ${what}`} of more than 0 gallons.`)
    .max(MAX_MOVEMENT_GAL, `At most ${MAX_MOVEMENT_GAL.toLocaleString("en-US")} gallons.`);

const text = (max: number, label: string) =>
  z.string().trim().max(max, `The ${label} has at most ${max} characters.`).optional().default("");

const isoDay = (label: string) =>
  z
    .string({ error: `Enter the ${label} as a date.` })
    .regex(/^\d{4}-\d{2}-\d{2}$/, `Enter the ${label} as a date (YYYY-MM-DD).`)
    .refine(isCalendarDay, `Enter a real date for the ${label}.`);

const wallClock = (label: string) =>
  z
    .string({ error: `Enter the ${label} as a date and time.` })
    .regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/, `Enter the ${label} as a date and time.`)
    .refine(isWallClock, `Enter a real date and time for the ${label}.`);

/** The version of the location the form was opened with (a stale one is refused). */
const version = z.number({ error: "Reload the page and try again." }).int().positive().max(MAX_RECORD_ID);

export const ReceiveFormSchema = z.object({
  intent: z.literal("receive"),
  locationId: id("the location"),
  // Receiving adds to what is there, so it is never stale; a version sent is checked all the same.
  version: version.optional(),
  productId: id("a product"),
  lotNumber: z
    .string({ error: "Enter the lot number from the container." })
    .trim()
    .min(1, "Enter the lot number from the container.")
    .max(60, "A lot number has at most 60 characters."),
  manufacturedOn: isoDay("manufacture date").optional(),
  container: z.enum(STOCK_CONTAINERS, { error: "Choose the kind of container." }),
  containerGal: gallons("container size"),
  containerCount: z
    .number({ error: "Enter how many containers, as a whole number." })
    .int("Enter how many containers, as a whole number.")
    .min(1, "At least one container.")
    .max(10_000, "At most 10,000 containers."),
  supplier: text(120, "supplier"),
  deliveryReference: text(120, "delivery reference"),
  receivedOn: isoDay("date received"),
});

export const LocationFormSchema = z
  .object({
    intent: z.literal("add-location"),
    kind: z.enum(STOCK_LOCATION_KINDS, { error: "Choose the kind of location." }),
    name: z
      .string({ error: "Give the location a name." })
      .trim()
      .min(1, "Give the location a name.")
      .max(120, "At most 120 characters."),
    stationId: id("a station").optional(),
    apparatusId: id("an apparatus").optional(),
  })
  .superRefine((value, ctx) => {
    if (value.kind === "apparatus_tank" && !value.apparatusId) {
      ctx.addIssue({ code: "custom", path: ["apparatusId"], message: "Choose the apparatus whose tank this is." });
    }
  });

export const ReorderFormSchema = z.object({
  intent: z.literal("reorder"),
  locationId: id("the location"),
  productId: id("a product"),
  // Blank: no reorder point.
  reorderGal: z
    .number({ error: "Enter the reorder point in gallons as a number." })
    .min(0, "A reorder point cannot be below 0 gallons.")
    .max(MAX_MOVEMENT_GAL, "That is more than any store holds.")
    .optional(),
});

export const STOCK_PAGE_SCHEMAS = [ReceiveFormSchema, LocationFormSchema, ReorderFormSchema] as const;

export const MOVE_KINDS = ["transferred", "sampled", "disposed"] as const;

export const MoveFormSchema = z
  .object({
    kind: z.enum(MOVE_KINDS, { error: "Choose what is done with the concentrate." }),
    locationId: id("the location it comes from"),
    version,
    toLocationId: id("the location it goes to").optional(),
    productId: id("a product"),
    lotId: id("a lot").optional(),
    gal: gallons("quantity"),
    at: wallClock("time"),
    reason: text(500, "reason"),
    // A hauler's manifest number for disposal, a lab's sample number for a sample.
    reference: text(160, "reference"),
  })
  .superRefine((value, ctx) => {
    if (value.kind === "transferred" && !value.toLocationId) {
      ctx.addIssue({ code: "custom", path: ["toLocationId"], message: "Choose the location it goes to." });
    }
    if (value.kind === "disposed" && !value.reference) {
      ctx.addIssue({ code: "custom", path: ["reference"], message: "Give the hauler's manifest or shipping number." });
    }
  });

export const MAX_COUNT_LINES = 200;

export const CountFormSchema = z.object({
  locationId: id("the location"),
  version,
  countedAt: wallClock("time of the count"),
  reason: text(500, "reason"),
  lines: z
    .array(
      z.object({
        productId: id("a product"),
        lotId: id("a lot").optional(),
        countedGal: z
          .number({ error: "Enter what was found, in gallons, as a number." })
          .min(0, "A count cannot be below 0 gallons.")
          .max(MAX_MOVEMENT_GAL, "That is more than any store holds."),
      }),
    )
    .min(1, "Count at least one product.")
    .max(MAX_COUNT_LINES, `At most ${MAX_COUNT_LINES} lines.`),
});

// ---------------------------------------------------------------------------------------------
// API queries

const queryId = (what: string) =>
  z
    .string()
    .optional()
    .transform((value, ctx) => {
      if (value === undefined || value === "") return undefined;
      const parsed = recordIdOf(value);
      if (parsed === null) {
        ctx.addIssue({ code: "custom", message: `Give ${what} as a record id (a whole number).` });
        return z.NEVER;
      }
      return parsed;
    });

export const StockQuerySchema = z.object({ location: queryId("the location"), product: queryId("the product") });

export const MovementQuerySchema = StockQuerySchema.extend({
  kind: z.enum(STOCK_MOVEMENT_KINDS, { error: `Give kind as one of ${STOCK_MOVEMENT_KINDS.join(", ")}.` }).optional(),
  event: queryId("the event"),
  from: isoDay("start date").optional(),
  to: isoDay("end date").optional(),
});

/** The query string's parameters the schema knows, as strings. */
export function queryParams(url: URL, keys: readonly string[]): Record<string, string> {
  const params: Record<string, string> = {};
  for (const key of keys) {
    const value = url.searchParams.get(key);
    if (value !== null) params[key] = value;
  }
  return params;
}
