import { z } from "zod";
import { RECORDS_REQUEST_STATUSES } from "~/lib/foam/vocabulary";

/** The queue's filters and order, read from the query string (unknown values fall back to defaults). */
export const QueueQuerySchema = z.object({
  status: z.enum([...RECORDS_REQUEST_STATUSES, "open", "all"]).catch("open"),
  assignee: z
    .union([z.literal("none"), z.coerce.number().int().positive()])
    .optional()
    .catch(undefined),
  sort: z.enum(["received", "due", "status", "assignee"]).catch("due"),
  dir: z.enum(["asc", "desc"]).catch("asc"),
});

export function queueQueryOf(url: URL) {
  return QueueQuerySchema.parse({
    status: url.searchParams.get("status") ?? undefined,
    assignee: url.searchParams.get("assignee") || undefined,
    sort: url.searchParams.get("sort") ?? undefined,
    dir: url.searchParams.get("dir") ?? undefined,
  });
}

/** The form a clerk uses to move a request on: one schema per intent. */
export const RequestChangeSchema = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("status"),
    status: z.enum(RECORDS_REQUEST_STATUSES, { error: "Choose a status." }),
    note: z.string().trim().max(1000, "At most 1,000 characters.").optional(),
  }),
  z.object({
    intent: z.literal("assign"),
    assigneeId: z.union([z.literal("none"), z.coerce.number().int().positive()], { error: "Choose a person." }),
  }),
  z.object({
    intent: z.literal("extend"),
    days: z
      .number({ error: "Give the number of days." })
      .int("Whole days.")
      .min(1, "At least 1 day.")
      .max(60, "At most 60 days."),
    reason: z
      .string({ error: "Give the reason for the extension." })
      .trim()
      .min(5, "Give the reason for the extension.")
      .max(1000, "At most 1,000 characters."),
  }),
]);
