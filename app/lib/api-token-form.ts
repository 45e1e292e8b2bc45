import { z } from "zod";

export const CreateApiTokenSchema = z.object({
  intent: z.literal("create-token"),
  name: z
    .string({ error: "Name the token after what will use it, e.g. station dashboard." })
    .trim()
    .min(1, "Name the token after what will use it, e.g. station dashboard.")
    .max(80, "A token name has at most 80 characters."),
});

export const RevokeApiTokenSchema = z.object({
  intent: z.literal("revoke-token"),
  tokenId: z.coerce.number().int().positive(),
});

/** Active tokens one person may hold at a time. */
export const MAX_ACTIVE_TOKENS = 20;
