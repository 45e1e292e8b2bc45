import { z } from "zod";

/** The sign-in form as the browser checks it; the server re-checks with the same rules. */
export const SignInFormSchema = z.object({
  email: z
    .string({ error: "Enter your email address." })
    .trim()
    .toLowerCase()
    .max(254, "An email address has at most 254 characters.")
    .pipe(z.email("Enter a valid email address.")),
  password: z
    .string({ error: "Enter your password." })
    .min(1, "Enter your password.")
    .max(200, "A password has at most 200 characters."),
  redirectTo: z.string().optional(),
});
