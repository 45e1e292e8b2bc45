import { describe, expect, it } from "vitest";
import { contentSecurityPolicy, isForeignOrigin } from "./security.server";

const url = "http://127.0.0.1:3000/events/new";

describe("isForeignOrigin", () => {
  it("never blocks reads", () => {
    expect(isForeignOrigin("GET", url, { origin: "http://evil.example" })).toBe(false);
  });

  it("blocks a write whose Origin is another site", () => {
    expect(isForeignOrigin("POST", url, { origin: "http://evil.example" })).toBe(true);
    expect(isForeignOrigin("DELETE", url, { origin: "http://127.0.0.1:4000" })).toBe(true);
    expect(isForeignOrigin("POST", url, { origin: "null" })).toBe(true);
  });

  it("falls back to the Referer and accepts our own origin", () => {
    expect(isForeignOrigin("POST", url, { origin: "http://127.0.0.1:3000" })).toBe(false);
    expect(isForeignOrigin("POST", url, { referer: "http://evil.example/page" })).toBe(true);
    expect(isForeignOrigin("POST", url, { referer: "http://127.0.0.1:3000/events" })).toBe(false);
  });

  it("lets scripts without browser headers through (they need a token instead)", () => {
    expect(isForeignOrigin("POST", url, {})).toBe(false);
  });
});

describe("contentSecurityPolicy", () => {
  it("allows only this origin, plus blob: workers, and the page's nonce", () => {
    const policy = contentSecurityPolicy("abc");
    expect(policy).toContain("default-src 'self'");
    expect(policy).toContain("script-src 'self' 'nonce-abc'");
    expect(policy).toContain("worker-src 'self' blob:");
    expect(policy).not.toMatch(/https?:\/\//);
  });
});
