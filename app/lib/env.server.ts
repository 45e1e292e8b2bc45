import { z } from "zod";

const booleanString = z
  .enum(["true", "false", "1", "0", ""])
  .default("false")
  .transform((value) => value === "true" || value === "1");

export const EnvSchema = z
  .object({
    NODE_ENV: z.enum(["production", "development", "test"]).default("development"),
    APP_URL: z.url().default("http://127.0.0.1:3000"),
    DB_HOST: z.string().min(1).default("127.0.0.1"),
    DB_PORT: z.coerce.number().int().min(1).max(65535).default(3307),
    DB_NAME: z
      .string()
      .regex(/^[A-Za-z0-9_]+$/, "letters, digits and _ only")
      .default("foamtally"),
    DB_USER: z.string().min(1).default("foamtally"),
    DB_PASSWORD: z.string().default(""),
    SESSION_SECRET: z.string().optional(),
    // Unset: secure cookies exactly when APP_URL is https (see parseEnv).
    COOKIE_SECURE: z.enum(["true", "false", "1", "0", ""]).optional(),
    TRUST_PROXY: booleanString,
    DEMO_MODE: booleanString,
    SMTP_URL: z
      .string()
      .regex(/^smtps?:\/\//, "must start with smtp:// or smtps://")
      .default("smtp://127.0.0.1:2525"),
    MAIL_FROM: z.string().min(3).default("Foamtally <foamtally@alderbend.example>"),
    S3_ENDPOINT: z.url().optional(),
    S3_REGION: z.string().default("us-east-1"),
    S3_BUCKET: z.string().default("foamtally"),
    S3_ACCESS_KEY_ID: z.string().default("S3RVER"),
    S3_SECRET_ACCESS_KEY: z.string().default("S3RVER"),
  })
  .superRefine((env, ctx) => {
    const secret = env.SESSION_SECRET ?? "";
    if (env.NODE_ENV === "production" && secret.length < 32) {
      ctx.addIssue({
        code: "custom",
        path: ["SESSION_SECRET"],
        message: "must be set to at least 32 characters in production",
      });
    }
  });

export type Env = Omit<z.infer<typeof EnvSchema>, "COOKIE_SECURE"> & {
  SESSION_SECRET: string;
  COOKIE_SECURE: boolean;
  /** APP_URL is https: cookies are secure by default and browsers are told to keep to HTTPS (HSTS). */
  HTTPS: boolean;
};

export class EnvError extends Error {}

export function parseEnv(source: Record<string, string | undefined>): Env {
  const result = EnvSchema.safeParse(source);
  if (!result.success) {
    const lines = result.error.issues.map((issue) => `  ${issue.path.join(".")}: ${issue.message}`);
    throw new EnvError(`Foamtally cannot start: invalid environment variables\n${lines.join("\n")}`);
  }
  const https = new URL(result.data.APP_URL).protocol === "https:";
  const cookieSecure = result.data.COOKIE_SECURE;
  return {
    ...result.data,
    SESSION_SECRET: result.data.SESSION_SECRET || "development-only-session-secret-not-for-production",
    COOKIE_SECURE:
      cookieSecure === undefined || cookieSecure === "" ? https : cookieSecure === "true" || cookieSecure === "1",
    HTTPS: https,
  };
}

let cached: Env | undefined;

export function env(): Env {
  cached ??= parseEnv(process.env);
  return cached;
}

/** The only configuration the browser may see. */
export function publicEnv() {
  return { DEMO_MODE: env().DEMO_MODE };
}
