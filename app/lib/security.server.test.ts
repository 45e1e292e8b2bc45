import { describe, expect, it } from "vitest";
import {
  contentSecurityPolicy,
  HSTS_VALUE,
  isForeignOrigin,
  securityHeaderRecord,
  securityMiddleware,
} from "./security.server";

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

describe("security headers and caching", () => {
  it("send HSTS only when the app is served over https", () => {
    expect(securityHeaderRecord(true)["Strict-Transport-Security"]).toBe(HSTS_VALUE);
    expect(securityHeaderRecord(false)).not.toHaveProperty("Strict-Transport-Security");
  });

  const run = (response: Response) =>
    (securityMiddleware as unknown as (args: { request: Request }, next: () => Promise<Response>) => Promise<Response>)(
      { request: new Request("http://127.0.0.1:3000/events") },
      async () => response,
    );

  it("mark every answer that names no caching no-store", async () => {
    const page = await run(new Response("<p>report</p>", { headers: { "Content-Type": "text/html" } }));
    expect(page.headers.get("Cache-Control")).toBe("no-store");
    const json = await run(Response.json({ id: 1 }));
    expect(json.headers.get("Cache-Control")).toBe("no-store");
  });

  it("leave an answer's own caching alone (map tiles)", async () => {
    const tile = await run(new Response("tile", { headers: { "Cache-Control": "private, max-age=86400" } }));
    expect(tile.headers.get("Cache-Control")).toBe("private, max-age=86400");
  });
});
