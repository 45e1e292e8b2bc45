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

  it("makes cookies secure by default exactly when APP_URL is https, unless COOKIE_SECURE says otherwise", () => {
    const https = parseEnv({ NODE_ENV: "test", APP_URL: "https://foam.alderbend.example" });
    expect(https.COOKIE_SECURE).toBe(true);
    expect(https.HTTPS).toBe(true);
    const http = parseEnv({ NODE_ENV: "test", APP_URL: "http://127.0.0.1:3000" });
    expect(http.COOKIE_SECURE).toBe(false);
    expect(http.HTTPS).toBe(false);
    expect(parseEnv({ NODE_ENV: "test", APP_URL: "https://a.example", COOKIE_SECURE: "false" }).COOKIE_SECURE).toBe(
      false,
    );
    expect(parseEnv({ NODE_ENV: "test", APP_URL: "http://a.example", COOKIE_SECURE: "true" }).COOKIE_SECURE).toBe(true);
    expect(() => parseEnv({ NODE_ENV: "test", COOKIE_SECURE: "yes" })).toThrow(/COOKIE_SECURE/);
  });
});
