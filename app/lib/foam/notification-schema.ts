import { z } from "zod";
import { isWallClock } from "../time-zone";
import { NOTIFIED_PARTIES } from "./vocabulary";

/** A notification of a release as recorded on the event page. */
export const ReleaseNotificationSchema = z
  .object({
    party: z.enum(NOTIFIED_PARTIES, { error: "Choose who was notified." }),
    partyDetail: z.string().trim().max(160, "At most 160 characters.").optional(),
    notifiedAt: z
      .string({ error: "Enter when they were notified." })
      .regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/, "Enter the date and time they were notified.")
      .refine(isWallClock, "Enter a real date and time."),
    notifiedBy: z
      .string({ error: "Enter who made the notification." })
      .trim()
      .min(1, "Enter who made the notification.")
      .max(160, "At most 160 characters."),
    caseNumber: z.string().trim().max(80, "A case or report number has at most 80 characters.").optional(),
    notes: z.string().trim().max(2000, "Notes have at most 2,000 characters.").optional(),
  })
  .superRefine((value, ctx) => {
    if (value.party === "other" && !value.partyDetail) {
      ctx.addIssue({ code: "custom", path: ["partyDetail"], message: "Say which authority was notified." });
    }
  });

export type ReleaseNotificationValue = z.infer<typeof ReleaseNotificationSchema>;
