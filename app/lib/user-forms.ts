import { z } from "zod";
import { ROLES } from "./access";
import { passwordProblem } from "./password-rules";

const name = z
  .string({ error: "Enter a name." })
  .trim()
  .min(1, "Enter a name.")
  .max(120, "A name has at most 120 characters.");

const email = z
  .string({ error: "Enter an email address." })
  .trim()
  .toLowerCase()
  .max(254, "An email address has at most 254 characters.")
  .pipe(z.email("Enter a valid email address."));

/** A new password, by the rules in `password-rules.ts`; one message at a time, the first that applies. */
const newPassword = z
  .string({ error: "Enter a password." })
  .min(1, "Enter a password.")
  .max(200, "A password has at most 72 bytes.")
  .superRefine((password, ctx) => {
    const problem = passwordProblem(password);
    if (problem) ctx.addIssue({ code: "custom", message: problem });
  });

const stationId = z.preprocess(
  (value) => (value === "" || value == null ? null : value),
  z.coerce.number({ error: "Choose a station from the list." }).int().positive().nullable(),
);

const roles = z.array(z.enum(ROLES), { error: "Choose at least one role." }).min(1, "Choose at least one role.");

export const CreateUserSchema = z.object({
  intent: z.literal("create"),
  name,
  email,
  password: newPassword,
  roles,
  stationId,
});

export const UpdateUserSchema = z.object({
  intent: z.literal("update"),
  userId: z.coerce.number().int().positive(),
  name,
  roles,
  stationId,
  active: z.preprocess((value) => value === "on" || value === "true", z.boolean()),
});

export const ChangePasswordSchema = z
  .object({
    currentPassword: z.string({ error: "Enter your current password." }).min(1, "Enter your current password."),
    newPassword,
    confirmPassword: z.string({ error: "Repeat the new password." }),
  })
  .refine((value) => value.newPassword === value.confirmPassword, {
    path: ["confirmPassword"],
    message: "The two new passwords do not match.",
  });

/** An administrator's "End sessions" on one person. */
export const EndSessionsSchema = z.object({
  intent: z.literal("end-sessions"),
  userId: z.coerce.number().int().positive(),
});

/** "Forgot your password?": the address to send a link to. */
export const RequestPasswordResetSchema = z.object({ email });

/** A new password set through a reset link, by the same rules as every new password. */
export const ResetPasswordSchema = z
  .object({
    newPassword,
    confirmPassword: z.string({ error: "Repeat the new password." }),
  })
  .refine((value) => value.newPassword === value.confirmPassword, {
    path: ["confirmPassword"],
    message: "The two new passwords do not match.",
  });

/** An administrator's "Send reset link" on one person. */
export const SendResetLinkSchema = z.object({
  intent: z.literal("send-reset"),
  userId: z.coerce.number().int().positive(),
});
