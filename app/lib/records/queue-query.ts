import { z } from "zod";
import { RECORDS_REQUEST_STATUSES } from "~/lib/foam/vocabulary";
import { queryReader, type QueryProblems } from "~/lib/query-params";

const QUEUE_STATUSES = [...RECORDS_REQUEST_STATUSES, "open", "all"] as const;
const QUEUE_SORTS = ["received", "due", "status", "assignee"] as const;

export type QueueQuery = {
  status: (typeof QUEUE_STATUSES)[number];
  assignee?: number | "none";
  sort: (typeof QUEUE_SORTS)[number];
  dir: "asc" | "desc";
};

/**
 * The queue's filters and order from the query string (`queryReader`): what cannot be used falls
 * back to its default and is named in `problems` (the page says so, the API answers 400).
 */
export function queueQueryOf(url: URL): { query: QueueQuery; problems: QueryProblems } {
  const reader = queryReader(url.searchParams);
  const assignee =
    url.searchParams.get("assignee") === "none" ? ("none" as const) : reader.recordId("assignee", "a person");
  const query: QueueQuery = {
    status: reader.choice("status", QUEUE_STATUSES) ?? "open",
    assignee,
    sort: reader.choice("sort", QUEUE_SORTS) ?? "due",
    dir: reader.choice("dir", ["asc", "desc"] as const) ?? "asc",
  };
  return { query, problems: reader.problems };
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
