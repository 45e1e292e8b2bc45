import { describe, expect, it } from "vitest";
import { EnvError, parseEnv } from "./env.server";

const secret = "x".repeat(32);

describe("parseEnv", () => {
  it("accepts a complete production environment and coerces types", () => {
    const env = parseEnv({ NODE_ENV: "production", SESSION_SECRET: secret, DB_PORT: "3310", COOKIE_SECURE: "true" });
    expect(env.DB_PORT).toBe(3310);
    expect(env.COOKIE_SECURE).toBe(true);
    expect(env.SESSION_SECRET).toBe(secret);
  });

  it("refuses to run production without a session secret, naming the variable", () => {
    expect(() => parseEnv({ NODE_ENV: "production" })).toThrow(EnvError);
    expect(() => parseEnv({ NODE_ENV: "production", SESSION_SECRET: "short" })).toThrow(/SESSION_SECRET/);
  });

  it("names a malformed variable", () => {
    expect(() => parseEnv({ NODE_ENV: "test", DB_PORT: "not-a-port" })).toThrow(/DB_PORT/);
    expect(() => parseEnv({ NODE_ENV: "test", SMTP_URL: "http://mail" })).toThrow(/SMTP_URL/);
    expect(() => parseEnv({ NODE_ENV: "staging" })).toThrow(/NODE_ENV/);
    expect(() => parseEnv({ NODE_ENV: "test", DB_NAME: "x; DROP" })).toThrow(/DB_NAME/);
  });

  it("gives development a stand-in secret so a contributor can start without one", () => {
    expect(parseEnv({ NODE_ENV: "development" }).SESSION_SECRET.length).toBeGreaterThanOrEqual(32);
  });
});
